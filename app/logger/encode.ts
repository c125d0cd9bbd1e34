/**
 * Encoders for every line of the protocol (used by the virtual board, tests and anyone writing a logger in
 * TypeScript) and the parser of host commands (the logger side). Returned lines carry no terminator: the
 * writer appends LF.
 */
import { encodeBase64 } from './base64';
import { frameLine, parseHex32, unframeLine } from './frame';
import { encodeGreetingBody } from './greeting';
import { sequenceModulus, type HostCommand, type LoggerBlock, type LoggerGreeting, type LoggerReply, type LoggerStatus } from './protocol';

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

/** `S <next sequence, 8 hex> overruns=<blocks discarded by the logger since start>*CRC`. */
export function encodeStatus(status: LoggerStatus): string {
  return frameLine(`S ${sequenceHex(status.nextSequence)} overruns=${Math.max(0, Math.floor(status.overruns))}`);
}

/** `A <command>[ <detail>]*CRC` or `E <command> <reason>*CRC`. */
export function encodeReply(reply: LoggerReply): string {
  const detail = reply.detail.replace(/[\r\n]/g, ' ');
  return frameLine(`${reply.ok ? 'A' : 'E'} ${reply.command}${detail ? ` ${detail}` : ''}`);
}

export function encodeCommand(command: HostCommand): string {
  return frameLine(command.command === 'rate' ? `rate ${command.sampleRateHz}` : command.command);
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
  const safeWord = /^[a-z]{1,16}$/.test(word) ? word : '?';
  return { ok: false, reply: { ok: false, command: safeWord, detail: 'unknown command (start, stop, rate <Hz>, identify)' } };
}

/** Parses the sequence field of a status body `S XXXXXXXX overruns=N`; null when malformed. */
export function parseStatusBody(body: string): LoggerStatus | null {
  const match = /^S ([0-9A-Fa-f]{8}) overruns=(\d{1,10})(?: .*)?$/.exec(body);
  if (!match) return null;
  return { nextSequence: parseHex32(match[1], 0), overruns: Number(match[2]) };
}

/** Parses an `A`/`E` body; null when malformed. */
export function parseReplyBody(body: string): LoggerReply | null {
  const match = /^([AE]) (\S+)(?: (.*))?$/.exec(body);
  if (!match) return null;
  return { ok: match[1] === 'A', command: match[2], detail: match[3] ?? '' };
}
