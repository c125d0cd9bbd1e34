import { describe, expect, it } from 'vitest';
import { createLoggerDecoder, type DecodedEvent } from '../../../app/logger/decoder';
import { encodeBlock, encodeGreeting, encodeReply, encodeStatus } from '../../../app/logger/encode';
import { frameLine } from '../../../app/logger/frame';
import { benchGreeting, expectedVolts, knownCodes, streamLines } from './decoderFixtures';

function blocksOf(events: DecodedEvent[]) {
  return events.flatMap((event) => (event.kind === 'block' ? [event] : []));
}

function decodeAll(lines: string[]) {
  const decoder = createLoggerDecoder();
  const events = lines.flatMap((line) => decoder.pushLine(line));
  return { decoder, events, blocks: blocksOf(events) };
}

describe('logger decoder', () => {
  it('turns a greeting and data lines into sample blocks in volts, timed from the sequence numbers', () => {
    const greeting = benchGreeting();
    const { blocks, decoder } = decodeAll(streamLines(greeting, 4));
    expect(blocks).toHaveLength(4);
    blocks.forEach((event, index) => {
      // Block k starts at k x block / rate seconds (PROTOCOL.md, Data): 6 / 20000 = 0.3 ms per block.
      expect(event.block.startS).toBeCloseTo(index * 0.0003, 12);
      expect(event.block.sampleRateHz).toBe(20_000);
      expect(event.block.afterGap).toBe(false);
      expect([...event.block.ramp]).toEqual(expectedVolts(greeting, knownCodes(greeting, index), 'ramp'));
      expect([...(event.block.control ?? [])]).toEqual(expectedVolts(greeting, knownCodes(greeting, index), 'control'));
    });
    expect(decoder.health().blocks).toBe(4);
    expect(decoder.health().samples).toBe(24);
  });

  it('leaves control null when the logger has no control channel, and skips unused channels', () => {
    const greeting = benchGreeting({
      channels: [
        { role: 'gate', gainV: 0.01, offsetV: 0 },
        { role: 'unused', gainV: 1, offsetV: 0 },
        { role: 'sync', gainV: 0.02, offsetV: -40 },
        { role: 'ramp', gainV: 0.004, offsetV: 0 },
      ],
    });
    const { blocks } = decodeAll(streamLines(greeting, 1));
    expect(blocks[0].block.control).toBeNull();
    expect([...blocks[0].block.sync]).toEqual(expectedVolts(greeting, knownCodes(greeting, 0), 'sync'));
    expect([...blocks[0].block.gate]).toEqual(expectedVolts(greeting, knownCodes(greeting, 0), 'gate'));
  });

  it('marks the block after a dropped line and says how many samples were lost', () => {
    const lines = streamLines(benchGreeting(), 10);
    lines.splice(4, 2); // blocks 3 and 4 never arrive
    const { blocks, decoder, events } = decodeAll(lines);
    const afterGap = blocks.find((event) => event.sequence === 5);
    expect(afterGap?.block.afterGap).toBe(true);
    expect(afterGap?.samplesLost).toBe(12);
    expect(afterGap?.block.startS).toBeCloseTo(5 * 0.0003, 12);
    expect(blocks.filter((event) => event.block.afterGap)).toHaveLength(1);
    const health = decoder.health();
    expect([health.sequenceGaps, health.blocksLost, health.samplesLost]).toEqual([1, 2, 12]);
    const problem = events.find((event) => event.kind === 'problem');
    expect(problem?.kind === 'problem' && problem.problem.message).toMatch(/2 data lines lost.*12 samples per channel/);
  });

  it('counts a line with a bad CRC and drops its samples', () => {
    const lines = streamLines(benchGreeting(), 3);
    const damaged = lines[2].slice(0, 20) + (lines[2][20] === 'A' ? 'B' : 'A') + lines[2].slice(21);
    const { blocks, decoder } = decodeAll([lines[0], lines[1], damaged, lines[3]]);
    expect(blocks.map((event) => event.sequence)).toEqual([0, 2]);
    expect(decoder.health().crcFailures).toBe(1);
    expect(blocks[1].block.afterGap).toBe(true);
    expect(decoder.health().lastProblem?.code).toBe('sequence-gap');
  });

  it('wraps the sequence from FFFFFFFF to 00000000 without a gap', () => {
    const greeting = benchGreeting();
    const lines = [encodeGreeting(greeting), ...[0xfffffffe, 0xffffffff, 0, 1].map((sequence) => encodeBlock({ sequence, codes: knownCodes(greeting, 1) }))];
    const { blocks, decoder } = decodeAll(lines);
    expect(blocks.map((event) => event.block.afterGap)).toEqual([false, false, false, false]);
    expect(blocks[3].block.startS).toBeCloseTo(3 * 0.0003, 12);
    expect(decoder.health().sequenceGaps).toBe(0);
  });

  it('keeps one stretch across an identify greeting, starts a new one after start (sequence back to 0)', () => {
    const greeting = benchGreeting();
    const lines = streamLines(greeting, 3);
    const identify = [encodeReply({ ok: true, command: 'identify', detail: '' }), encodeGreeting(greeting), encodeBlock({ sequence: 3, codes: knownCodes(greeting, 3) })];
    const restart = [encodeReply({ ok: true, command: 'start', detail: '' }), encodeGreeting(greeting), encodeBlock({ sequence: 0, codes: knownCodes(greeting, 0) })];
    const { blocks, decoder } = decodeAll([...lines, ...identify, ...restart]);
    expect(blocks.map((event) => event.block.afterGap)).toEqual([false, false, false, false, true]);
    // The restarted stretch continues the time line where the last block ended (4 blocks of 0.3 ms).
    expect(blocks[4].block.startS).toBeCloseTo(4 * 0.0003, 12);
    expect(decoder.health().sequenceRestarts).toBe(0);
  });

  it('reports a sequence that goes backwards without a greeting as a logger restart', () => {
    const greeting = benchGreeting();
    const lines = [...streamLines(greeting, 5), encodeBlock({ sequence: 1, codes: knownCodes(greeting, 1) })];
    const { blocks, decoder } = decodeAll(lines);
    expect(blocks.at(-1)?.block.afterGap).toBe(true);
    expect(decoder.health().sequenceRestarts).toBe(1);
  });

  it('drops a block that arrives twice', () => {
    const lines = streamLines(benchGreeting(), 3);
    const { blocks, decoder } = decodeAll([...lines.slice(0, 3), lines[2], lines[3]]);
    expect(blocks.map((event) => event.sequence)).toEqual([0, 1, 2]);
    expect(blocks.every((event) => !event.block.afterGap)).toBe(true);
    expect(decoder.health().duplicateBlocks).toBe(1);
  });

  it('ignores data from a logger of an unknown protocol version until it greets with version 1', () => {
    const greeting = benchGreeting();
    const lines = streamLines(greeting, 2);
    const newer = frameLine('H RWLOG/2 id=TESTLOG-3 rate=20000 bits=12 block=6 ch=sync,ramp,gate gain=1,1,1 offset=0,0,0');
    const { blocks, decoder, events } = decodeAll([newer, lines[1], ...lines]);
    expect(decoder.health().unknownVersions).toBe(1);
    expect(decoder.health().dataBeforeGreeting).toBe(1);
    expect(blocks.map((event) => event.sequence)).toEqual([0, 1]);
    const message = events.find((event) => event.kind === 'problem' && event.problem.code === 'unknown-version');
    expect(message?.kind === 'problem' && message.problem.message).toMatch(/version 2.*version 1/);
  });

  it('reports waiting for a greeting once, however many data lines arrive meanwhile', () => {
    const lines = streamLines(benchGreeting(), 6);
    const { decoder, events } = decodeAll([...lines.slice(1), lines[0], lines[1]]);
    expect(decoder.health().dataBeforeGreeting).toBe(6);
    expect(events.filter((event) => event.kind === 'problem')).toHaveLength(1);
    expect(events.filter((event) => event.kind === 'block')).toHaveLength(1);
  });

  it('counts malformed greetings and names the field', () => {
    const { decoder, events } = decodeAll([frameLine('H RWLOG/1 id=X rate=20000 bits=12 block=6 ch=sync,ramp gain=1,1 offset=0,0')]);
    expect(decoder.health().badGreetings).toBe(1);
    expect(events[0].kind === 'problem' && events[0].problem.message).toMatch(/no gate channel/);
  });

  it('counts oversize lines without reading them', () => {
    const decoder = createLoggerDecoder({ maxLineChars: 200 });
    decoder.pushLine(encodeGreeting(benchGreeting()));
    const events = decoder.pushLine('D '.padEnd(500, 'A'));
    expect(decoder.health().oversizeLines).toBe(1);
    expect(events[0].kind === 'problem' && events[0].problem.message).toMatch(/500 characters.*200 allowed/);
  });

  it('reads a logger line glued behind noise (a lost line end) and counts the noise', () => {
    const lines = streamLines(benchGreeting(), 3);
    const { blocks, decoder } = decodeAll([lines[0], lines[1], `#~noise D 1234${lines[2]}`, `zz${encodeStatus({ nextSequence: 2, overruns: 0 })}`, lines[3]]);
    expect(blocks.map((event) => event.sequence)).toEqual([0, 1, 2]);
    expect(decoder.health().garbageLines).toBe(2);
    expect(decoder.health().crcFailures).toBe(0);
  });

  it('adds up logger overruns from cumulative status counts', () => {
    const { decoder, events } = decodeAll([
      encodeGreeting(benchGreeting()),
      encodeStatus({ nextSequence: 10, overruns: 0 }),
      encodeStatus({ nextSequence: 20, overruns: 3 }),
      encodeStatus({ nextSequence: 30, overruns: 3 }),
      encodeStatus({ nextSequence: 40, overruns: 5 }),
    ]);
    expect(decoder.health().loggerOverruns).toBe(5);
    expect(events.filter((event) => event.kind === 'status').map((event) => event.kind === 'status' && event.status.nextSequence)).toEqual([10, 20, 30, 40]);
  });

  it('reports a refused command with the logger\'s reason', () => {
    const { decoder, events } = decodeAll([encodeReply({ ok: false, command: 'rate', detail: 'rate 900000 Hz is above this logger\'s 50000 Hz' })]);
    expect(decoder.health().loggerRefusals).toBe(1);
    expect(events.some((event) => event.kind === 'problem' && /refused "rate": rate 900000 Hz/.test(event.problem.message))).toBe(true);
  });

  it('pushText splits raw chunks anywhere and gives what pushLine gives; CR LF is accepted', () => {
    const lines = streamLines(benchGreeting(), 5);
    const text = lines.map((line) => `${line}\r\n`).join('');
    const byLine = decodeAll(lines).blocks;
    for (const chunkSize of [1, 7, 64, 1000]) {
      const decoder = createLoggerDecoder();
      const events: DecodedEvent[] = [];
      for (let at = 0; at < text.length; at += chunkSize) events.push(...decoder.pushText(text.slice(at, at + chunkSize)));
      const blocks = blocksOf(events);
      expect(blocks.map((event) => [...event.block.sync])).toEqual(byLine.map((event) => [...event.block.sync]));
      expect(decoder.health().garbageLines + decoder.health().crcFailures).toBe(0);
    }
  });

  it('pushText caps a line that never ends and reads on after its end', () => {
    const lines = streamLines(benchGreeting(), 2);
    const decoder = createLoggerDecoder({ maxLineChars: 300 });
    const events = [lines[0], '\n', 'x'.repeat(250), 'x'.repeat(250), 'x'.repeat(5000), '\n', lines[1], '\n', lines[2], '\n'].flatMap((chunk) => decoder.pushText(chunk));
    expect(decoder.health().oversizeLines).toBe(1);
    expect(blocksOf(events).map((event) => event.sequence)).toEqual([0, 1]);
  });
});
