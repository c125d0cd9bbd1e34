/**
 * PROTOCOL.md is the firmware writer's reference; its worked example is re-computed here from the values the
 * document states, so the page cannot drift from the code.
 */
import { readFileSync } from 'node:fs';
import { crc32 as nodeCrc32 } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { timedFiring, timedWidthUs } from '../../../app/bench/timedFiring';
import type { TimedEdge } from '../../../app/capture/samples';
import { createLoggerDecoder } from '../../../app/logger/decoder';
import { encodeBlock, encodeCommand, encodeEdges, encodeGreeting, encodeReply, encodeStatus, parseCommand, parseEdgesBody } from '../../../app/logger/encode';
import { parseGreetingBody } from '../../../app/logger/greeting';
import { TimedEdgeBook } from '../../../app/signal/timedEdges';

const documentText = readFileSync(new URL('../../../app/logger/PROTOCOL.md', import.meta.url), 'utf8');

function example(name: string): string[] {
  const match = new RegExp('```text ' + name + '\\n([\\s\\S]*?)```').exec(documentText);
  if (!match) throw new Error(`PROTOCOL.md has no "${name}" block`);
  return match[1].trim().split('\n');
}

describe('PROTOCOL.md worked example', () => {
  const [greetingLine] = example('greeting-example');
  const [dataLine] = example('data-example');
  const codes = Int16Array.from(example('codes-example').flatMap((row) => row.trim().split(/\s+/).map(Number)));
  const bytes = example('bytes-example')[0].split(' ').map((pair) => parseInt(pair, 16));

  it('greeting re-encodes to the same line', () => {
    const body = greetingLine.slice(0, greetingLine.lastIndexOf('*'));
    const parsed = parseGreetingBody(body);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(encodeGreeting(parsed.greeting)).toBe(greetingLine);
    // zlib as an independent CRC-32/ISO-HDLC.
    expect(greetingLine.slice(-8)).toBe(nodeCrc32(Buffer.from(body, 'latin1')).toString(16).toUpperCase().padStart(8, '0'));
  });

  it('the stated bytes are the stated codes as little-endian int16, and their base64 is in the line', () => {
    const expected = Buffer.alloc(codes.length * 2);
    codes.forEach((code, index) => expected.writeInt16LE(code, index * 2));
    expect(bytes).toEqual([...expected]);
    expect(dataLine).toContain(` ${expected.toString('base64')}*`);
  });

  it('data line re-encodes from block 42 and the stated codes, with the stated CRC', () => {
    expect(encodeBlock({ sequence: 0x2a, codes })).toBe(dataLine);
    const body = dataLine.slice(0, dataLine.lastIndexOf('*'));
    expect(dataLine.slice(-8)).toBe(nodeCrc32(Buffer.from(body, 'latin1')).toString(16).toUpperCase().padStart(8, '0'));
  });

  it('decodes to the volts of the document table', () => {
    const decoder = createLoggerDecoder();
    decoder.pushLine(greetingLine);
    const block = decoder.pushLine(dataLine).find((event) => event.kind === 'block');
    expect(block?.kind).toBe('block');
    if (block?.kind !== 'block') return;
    // Table in PROTOCOL.md; 1e-9 V covers floating-point rounding of offset + gain x code.
    const table = { sync: [5.0, 5.52, 6.02], ramp: [0, 0.4, 0.8], gate: [0, 0, 10], control: [4, 4, 4] };
    for (const role of ['sync', 'ramp', 'gate', 'control'] as const) {
      [...(block.block[role] ?? [])].forEach((volts, index) => expect(volts).toBeCloseTo(table[role][index], 9));
    }
    expect(block.sequence).toBe(42);
  });

  it('status, command and reply lines re-encode', () => {
    expect(encodeStatus({ nextSequence: 0x2b, overruns: 0 })).toBe(example('status-example')[0]);
    const [command, reply] = example('command-example');
    expect(encodeCommand({ command: 'start' })).toBe(command);
    expect(encodeReply({ ok: true, command: 'start', detail: '' })).toBe(reply);
  });

  it('link budget table matches the arithmetic for 4 channels at 25 kS/s, block 120', () => {
    const line = encodeBlock({ sequence: 0, codes: new Int16Array(4 * 120) });
    const lineBytes = line.length + 1; // plus LF
    expect(lineBytes).toBe(1301);
    const dataBytesPerS = Math.round((lineBytes * 25_000) / 120);
    expect(documentText).toContain(`**${dataBytesPerS.toLocaleString('en-US').replace(/,/g, ' ')}**`);
    const statusBytes = encodeStatus({ nextSequence: 0x2b, overruns: 0 }).length + 1;
    expect(documentText).toContain(`**${(dataBytesPerS + statusBytes).toLocaleString('en-US').replace(/,/g, ' ')}**`);
  });
});

describe('PROTOCOL.md worked example: timed edges', () => {
  const [greetingLine] = example('edges-greeting-example');
  const [commandLine, replyLine] = example('edges-command-example');
  const edgeLines = example('edges-lines-example');
  const zlibCrc = (line: string): string => nodeCrc32(Buffer.from(line.slice(0, line.lastIndexOf('*')), 'latin1')).toString(16).toUpperCase().padStart(8, '0');
  /** The table rows: ticks as written in hex and decimal, and microseconds. */
  const rows = [...documentText.matchAll(/^\| (sync|gate) (rising|falling) \| 0x([0-9A-F]{8}) = ([\d ]+) \| ([\d .]+) us \|$/gm)].map((match) => ({
    hex: parseInt(match[3], 16),
    decimal: Number(match[4].replace(/ /g, '')),
    us: Number(match[5].replace(/ /g, '')),
  }));

  it('greeting announces sync and gate timed at 16 MHz, and re-encodes to the same line (zlib CRC)', () => {
    const parsed = parseGreetingBody(greetingLine.slice(0, greetingLine.lastIndexOf('*')));
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.greeting.edgeTiming).toEqual({ roles: ['sync', 'gate'], clockHz: 16_000_000 });
    expect(encodeGreeting(parsed.greeting)).toBe(greetingLine);
    expect(greetingLine.slice(-8)).toBe(zlibCrc(greetingLine));
  });

  it('the request and its acknowledgement re-encode', () => {
    expect(encodeCommand({ command: 'edges', on: true })).toBe(commandLine);
    expect(parseCommand(commandLine)).toEqual({ ok: true, command: { command: 'edges', on: true } });
    expect(encodeReply({ ok: true, command: 'edges', detail: 'on' })).toBe(replyLine);
  });

  it('edge lines re-encode with their CRC, and the table holds their ticks and microseconds', () => {
    const edges = edgeLines.flatMap((line) => {
      expect(line.slice(-8)).toBe(zlibCrc(line));
      const parsed = parseEdgesBody(line.slice(0, line.lastIndexOf('*')));
      expect(parsed).not.toBeNull();
      expect(encodeEdges(parsed ?? [])).toBe(line);
      return parsed ?? [];
    });
    expect(rows).toHaveLength(edges.length);
    edges.forEach((edge, index) => {
      expect(rows[index].hex).toBe(edge.ticks);
      expect(rows[index].decimal).toBe(edge.ticks);
      expect(rows[index].us).toBeCloseTo(edge.ticks / 16, 9);
    });
  });

  it('decodes onto the data time axis and gives the stated alpha, pulse width and period', () => {
    const decoder = createLoggerDecoder();
    decoder.pushLine(greetingLine);
    const zeros = new Int16Array(4 * 30);
    const placed: TimedEdge[] = [];
    // Each edge line just before the data line of the block its edges fall in (6 ms blocks): blocks 0, 2, 3 and 5.
    const blockOfLine = [0, 2, 3, 5];
    for (let sequence = 0; sequence <= 5; sequence++) {
      const lineIndex = blockOfLine.indexOf(sequence);
      if (lineIndex >= 0) decoder.pushLine(edgeLines[lineIndex]);
      for (const event of decoder.pushLine(encodeBlock({ sequence, codes: zeros }))) if (event.kind === 'block') placed.push(...(event.block.edges ?? []));
    }
    expect(placed.map((edge) => edge.timeS * 1e6)).toEqual(rows.map((row) => expect.closeTo(row.us, 6)));
    const book = new TimedEdgeBook();
    book.add(placed);
    const firing = timedFiring(book, { rectifier: 'half-wave', direction: 'rising', startS: 0.0126, endS: 0.0326, priorS: Number.NaN, riseS: 0.0171, syncPhaseDeg: 0, toleranceS: 1e-4 });
    expect(firing?.periodS).toBeCloseTo(0.02, 12);
    expect(firing?.alphaDeg).toBeCloseTo(81, 9);
    expect(timedWidthUs(book, 0.0171, 0.01725, 1e-4)).toBeCloseTo(150, 6);
  });

  it('status line with edgeslost re-encodes', () => {
    const [statusLine] = example('edges-status-example');
    expect(encodeStatus({ nextSequence: 0xa7, overruns: 0, edgesLost: 0 })).toBe(statusLine);
    expect(statusLine.slice(-8)).toBe(zlibCrc(statusLine));
  });
});
