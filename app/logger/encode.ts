/**
 * Encoders for every line of the protocol (used by the virtual board, tests and anyone writing a logger in
 * TypeScript) and the parser of host commands (the logger side). Returned lines carry no terminator: the
 * writer appends LF.
 */
import { encodeBase64 } from './base64';
import { frameLine, parseHex32, unframeLine } from './frame';
import { encodeGreetingBody } from './greeting';
import { sequenceModulus, type HostCommand, type LoggerBlock, type LoggerEdge, type LoggerGreeting, type LoggerReply, type LoggerStatus } from './protocol';

function sequenceHex(sequence: number): string {
  const wrapped = ((sequence % sequenceModulus) + sequenceModulus) % sequenceModulus;
  return wrapped.toString(16).toUpperCase().padStart(8, '0');
}

export function encodeGreeting(greeting: LoggerGreeting): string {
  return frameLine(encodeGreetingBody(greeting));
}

/** `D <sequence, 8 hex> <base64 of little-endian int16 codes, interleaved>*CRC`. */
export function encodeBlock(block: LoggerBlock): string {
  const bytes = new Uint8Array(block.codes.length * 2);
  const view = new DataView(bytes.buffer);
  for (let index = 0; index < block.codes.length; index++) view.setInt16(index * 2, block.codes[index], true);
  return frameLine(`D ${sequenceHex(block.sequence)} ${encodeBase64(bytes)}`);
}

/** `S <next sequence, 8 hex> overruns=<blocks discarded by the logger since start>[ edgeslost=<n>]*CRC`. */
export function encodeStatus(status: LoggerStatus): string {
  const edgesLost = status.edgesLost === undefined ? '' : ` edgeslost=${Math.max(0, Math.floor(status.edgesLost))}`;
  return frameLine(`S ${sequenceHex(status.nextSequence)} overruns=${Math.max(0, Math.floor(status.overruns))}${edgesLost}`);
}

/** `T <edge> ...*CRC`, each edge `S` or `G` (sync, gate), `+` or `-` (rising, falling) and 8 hex digits of clock ticks. */
export function encodeEdges(edges: readonly LoggerEdge[]): string {
  const words = edges.map((edge) => `${edge.role === 'sync' ? 'S' : 'G'}${edge.direction === 'rising' ? '+' : '-'}${sequenceHex(edge.ticks)}`);
  return frameLine(['T', ...words].join(' '));
}

const edgeWordPattern = /^([SG])([+-])([0-9A-Fa-f]{8})$/;

/** Parses an edge line body `T <edge> ...`; null when malformed (a line with no edge is malformed too). */
export function parseEdgesBody(body: string): LoggerEdge[] | null {
  const words = body.split(' ');
  if (words[0] !== 'T' || words.length < 2) return null;
  const edges: LoggerEdge[] = [];
  for (let index = 1; index < words.length; index++) {
    const match = edgeWordPattern.exec(words[index]);
    if (!match) return null;
    edges.push({ role: match[1] === 'S' ? 'sync' : 'gate', direction: match[2] === '+' ? 'rising' : 'falling', ticks: parseHex32(match[3], 0) });
  }
  return edges;
}

/** `A <command>[ <detail>]*CRC` or `E <command> <reason>*CRC`. */
export function encodeReply(reply: LoggerReply): string {
  const detail = reply.detail.replace(/[\r\n]/g, ' ');
  return frameLine(`${reply.ok ? 'A' : 'E'} ${reply.command}${detail ? ` ${detail}` : ''}`);
}

export function encodeCommand(command: HostCommand): string {
  if (command.command === 'rate') return frameLine(`rate ${command.sampleRateHz}`);
  if (command.command === 'edges') return frameLine(`edges ${command.on ? 'on' : 'off'}`);
  return frameLine(command.command);
}

export type CommandParse = { ok: true; command: HostCommand } | { ok: false; reply: LoggerReply };

/** The logger side: reads a host command line (terminator removed). Never throws; a refusal carries the `E` reply to send. */
export function parseCommand(line: string): CommandParse {
  const trimmed = line.endsWith('\r') ? line.slice(0, -1) : line;
  const frame = unframeLine(trimmed);
  if (!frame.ok) {
    return { ok: false, reply: { ok: false, command: '?', detail: frame.reason === 'crc' ? 'command failed its CRC check' : 'command has no *CRC' } };
  }
  const words = trimmed.slice(0, frame.bodyEnd).split(' ');
  const word = words[0];
  if ((word === 'start' || word === 'stop' || word === 'identify') && words.length === 1) return { ok: true, command: { command: word } };
  if (word === 'rate') {
    const rate = words.length === 2 && /^\d{1,9}$/.test(words[1]) ? Number(words[1]) : Number.NaN;
    if (rate > 0) return { ok: true, command: { command: 'rate', sampleRateHz: rate } };
    return { ok: false, reply: { ok: false, command: 'rate', detail: 'rate needs one whole number of samples per second' } };
  }
  if (word === 'edges') {
    if (words.length === 2 && (words[1] === 'on' || words[1] === 'off')) return { ok: true, command: { command: 'edges', on: words[1] === 'on' } };
    return { ok: false, reply: { ok: false, command: 'edges', detail: 'edges needs on or off' } };
  }
  const safeWord = /^[a-z]{1,16}$/.test(word) ? word : '?';
  return { ok: false, reply: { ok: false, command: safeWord, detail: 'unknown command (start, stop, rate <Hz>, identify, edges on|off)' } };
}

/** Parses the sequence field of a status body `S XXXXXXXX overruns=N`; null when malformed. */
export function parseStatusBody(body: string): LoggerStatus | null {
  const match = /^S ([0-9A-Fa-f]{8}) overruns=(\d{1,10})(?: (.*))?$/.exec(body);
  if (!match) return null;
  const status: LoggerStatus = { nextSequence: parseHex32(match[1], 0), overruns: Number(match[2]) };
  const edgesLost = /(?:^| )edgeslost=(\d{1,10})(?: |$)/.exec(match[3] ?? '');
  if (edgesLost) status.edgesLost = Number(edgesLost[1]);
  return status;
}

/** Parses an `A`/`E` body; null when malformed. */
export function parseReplyBody(body: string): LoggerReply | null {
  const match = /^([AE]) (\S+)(?: (.*))?$/.exec(body);
  if (!match) return null;
  return { ok: match[1] === 'A', command: match[2], detail: match[3] ?? '' };
}
