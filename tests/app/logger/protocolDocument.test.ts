/**
 * PROTOCOL.md is the firmware writer's reference; its worked example is re-computed here from the values the
 * document states, so the page cannot drift from the code.
 */
import { readFileSync } from 'node:fs';
import { crc32 as nodeCrc32 } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { createLoggerDecoder } from '../../../app/logger/decoder';
import { encodeBlock, encodeCommand, encodeGreeting, encodeReply, encodeStatus } from '../../../app/logger/encode';
import { parseGreetingBody } from '../../../app/logger/greeting';

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
