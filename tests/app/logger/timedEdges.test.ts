/**
 * The protocol's timed edges and scan skew (PROTOCOL.md "Timed edges", greeting `skew=`): greeting keys, edge lines,
 * the `edges` command, and the decoder putting edges and skewed channels on the samples' time axis.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createLoggerDecoder, type DecodedEvent } from '../../../app/logger/decoder';
import { edgeRequestAfter } from '../../../app/logger/edgeRequest';
import { encodeBlock, encodeEdges, encodeGreeting, encodeStatus, parseCommand, parseEdgesBody } from '../../../app/logger/encode';
import { frameLine } from '../../../app/logger/frame';
import { parseGreetingBody } from '../../../app/logger/greeting';
import type { LoggerEdge, LoggerGreeting } from '../../../app/logger/protocol';
import { alignToFrame } from '../../../app/logger/scanSkew';
import { createVirtualLogger } from '../../../app/sim/virtualLogger';
import { halfWaveBoard } from '../sim/simFixtures';
import { benchGreeting } from './decoderFixtures';

const timedGreeting = (overrides: Partial<LoggerGreeting> = {}): LoggerGreeting =>
  benchGreeting({ edgeTiming: { roles: ['sync', 'gate'], clockHz: 1_000_000 }, ...overrides });
const zeros = (greeting: LoggerGreeting): Int16Array => new Int16Array(greeting.channels.length * greeting.blockSamples);
const bodyOf = (line: string): string => line.slice(0, line.lastIndexOf('*'));

function blocks(events: DecodedEvent[]) {
  return events.flatMap((event) => (event.kind === 'block' ? [event.block] : []));
}

describe('greeting keys for timed edges and scan skew', () => {
  it('reads edges=, clock= and skew= and writes them back the same', () => {
    const greeting = timedGreeting({ scanSkew: [0, 0.25, 0.5, 0.75] });
    const line = encodeGreeting(greeting);
    expect(line).toContain(' skew=0,0.25,0.5,0.75 edges=sync,gate clock=1000000*');
    const parsed = parseGreetingBody(bodyOf(line));
    expect(parsed).toEqual({ ok: true, greeting });
  });

  it.each([
    ['edges=sync', /clock= must be the edge timer's rate in Hz/],
    ['clock=16000000', /edges= lists the timed inputs, each once, from sync, gate/],
    ['edges=sync,ramp clock=16000000', /edges= lists the timed inputs/],
    ['edges=gate,gate clock=16000000', /edges= lists the timed inputs/],
    ['edges=sync clock=16.5', /clock= must be/],
    ['skew=0,0.25,0.5', /skew= needs 4 fractions of the sample period from 0 to below 1/],
    ['skew=0,0.25,0.5,1', /skew= needs 4 fractions/],
  ])('refuses "%s" with a reason', (extra, reason) => {
    const parsed = parseGreetingBody(`${encodeGreeting(benchGreeting()).slice(0, -9)} ${extra}`);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.reason).toMatch(reason);
  });
});

describe('edge lines', () => {
  const edgeArbitrary = fc.record({
    role: fc.constantFrom<LoggerEdge['role']>('sync', 'gate'),
    direction: fc.constantFrom<LoggerEdge['direction']>('rising', 'falling'),
    ticks: fc.integer({ min: 0, max: 2 ** 32 - 1 }),
  });

  it('encode and parse back any edges', () => {
    fc.assert(fc.property(fc.array(edgeArbitrary, { minLength: 1, maxLength: 40 }), (edges) => {
      expect(parseEdgesBody(bodyOf(encodeEdges(edges)))).toEqual(edges);
    }));
  });

  it.each(['T', 'T S+1234', 'T X+00001234', 'T S*00001234', 'T S+0000123G', 'T  S+00001234', 'D S+00001234'])('refuses the malformed body "%s"', (body) => {
    expect(parseEdgesBody(body)).toBeNull();
  });
});

describe('the edges command', () => {
  it('reads edges on and edges off, and refuses anything else with a reason', () => {
    expect(parseCommand(frameLine('edges on'))).toEqual({ ok: true, command: { command: 'edges', on: true } });
    expect(parseCommand(frameLine('edges off'))).toEqual({ ok: true, command: { command: 'edges', on: false } });
    expect(parseCommand(frameLine('edges'))).toEqual({ ok: false, reply: { ok: false, command: 'edges', detail: 'edges needs on or off' } });
  });

  it('the virtual logger, which times no edges, refuses it', () => {
    const logger = createVirtualLogger(halfWaveBoard(), { autostart: false });
    expect(logger.handleCommandLine(frameLine('edges on'))).toEqual([expect.stringMatching(/^E edges this logger has no timed edge inputs\*/)]);
  });

  it('a host asks for edges after a greeting that offers them, and only then', () => {
    expect(edgeRequestAfter(encodeGreeting(timedGreeting()))).toBe(frameLine('edges on'));
    expect(edgeRequestAfter(`${encodeGreeting(timedGreeting())}\r`)).toBe(frameLine('edges on'));
    expect(edgeRequestAfter(encodeGreeting(benchGreeting()))).toBeNull();
    expect(edgeRequestAfter(encodeGreeting(timedGreeting()).replace('TESTLOG-3', 'TESTLOG-4'))).toBeNull(); // CRC no longer matches
    expect(edgeRequestAfter(encodeBlock({ sequence: 0, codes: zeros(benchGreeting()) }))).toBeNull();
  });
});

describe('decoder with timed edges', () => {
  it('attaches the edges to the next data line, in seconds on the blocks\' time axis', () => {
    const greeting = timedGreeting();
    const decoder = createLoggerDecoder({ timeOriginS: 10 });
    decoder.pushLine(encodeGreeting(greeting));
    decoder.pushLine(encodeBlock({ sequence: 0, codes: zeros(greeting) }));
    // Block 1 covers 0.3-0.6 ms after the first sample (6 samples at 20 kS/s); 1 MHz ticks.
    decoder.pushLine(encodeEdges([{ role: 'sync', direction: 'rising', ticks: 310 }, { role: 'gate', direction: 'falling', ticks: 555 }]));
    const [block] = blocks(decoder.pushLine(encodeBlock({ sequence: 1, codes: zeros(greeting) })));
    expect(block.edges).toEqual([
      { role: 'sync', direction: 'rising', timeS: expect.closeTo(10.00031, 12) },
      { role: 'gate', direction: 'falling', timeS: expect.closeTo(10.000555, 12) },
    ]);
    expect(decoder.health().edges).toBe(2);
    expect(blocks(decoder.pushLine(encodeBlock({ sequence: 2, codes: zeros(greeting) })))[0].edges).toBeUndefined();
  });

  it('unwraps edge ticks past 2^32 to the turn nearest their block', () => {
    const greeting = timedGreeting({ edgeTiming: { roles: ['sync', 'gate'], clockHz: 16_000_000 }, blockSamples: 300, sampleRateHz: 5000 });
    const decoder = createLoggerDecoder();
    decoder.pushLine(encodeGreeting(greeting));
    // Block 4500 starts at 270 s after the first sample: 4 320 000 000 ticks at 16 MHz, past 2^32 = 4 294 967 296.
    const ticksAt = (seconds: number): number => (seconds * 16e6) % 2 ** 32;
    decoder.pushLine(encodeBlock({ sequence: 4499, codes: zeros(greeting) }));
    decoder.pushLine(encodeEdges([{ role: 'sync', direction: 'rising', ticks: ticksAt(269.9) }, { role: 'sync', direction: 'falling', ticks: ticksAt(270.1) }]));
    const [block] = blocks(decoder.pushLine(encodeBlock({ sequence: 4500, codes: zeros(greeting) })));
    // The decoder's axis starts at the first block it received (4499); block 4500 starts 60 ms after it.
    expect(block.startS).toBeCloseTo(0.06, 12);
    expect(block.edges?.map((edge) => edge.timeS - block.startS)).toEqual([expect.closeTo(-0.1, 9), expect.closeTo(0.1, 9)]);
  });

  it('forgets edges sent before a greeting (they belong to the run before it)', () => {
    const greeting = timedGreeting();
    const decoder = createLoggerDecoder();
    decoder.pushLine(encodeGreeting(greeting));
    decoder.pushLine(encodeEdges([{ role: 'sync', direction: 'rising', ticks: 5 }]));
    decoder.pushLine(encodeGreeting(greeting));
    expect(blocks(decoder.pushLine(encodeBlock({ sequence: 0, codes: zeros(greeting) })))[0].edges).toBeUndefined();
  });

  it('counts an edge line from a logger that announced no edges, and a malformed one, and reads on', () => {
    const decoder = createLoggerDecoder();
    decoder.pushLine(encodeGreeting(benchGreeting()));
    const events = [...decoder.pushLine(encodeEdges([{ role: 'gate', direction: 'rising', ticks: 1 }])), ...decoder.pushLine(frameLine('T G+12'))];
    expect(events.map((event) => (event.kind === 'problem' ? event.problem.code : event.kind))).toEqual(['bad-edges', 'bad-edges']);
    expect(decoder.health().badEdgeLines).toBe(2);
    expect(blocks(decoder.pushLine(encodeBlock({ sequence: 0, codes: zeros(benchGreeting()) })))).toHaveLength(1);
  });

  it('counts the edges the logger reports dropping, once each, from its running total', () => {
    const decoder = createLoggerDecoder();
    decoder.pushLine(encodeGreeting(timedGreeting()));
    decoder.pushLine(encodeStatus({ nextSequence: 1, overruns: 0, edgesLost: 3 }));
    const second = decoder.pushLine(encodeStatus({ nextSequence: 2, overruns: 0, edgesLost: 5 }));
    expect(second.some((event) => event.kind === 'problem' && event.problem.code === 'logger-edges-lost' && /dropped 2 timed edges/.test(event.problem.message))).toBe(true);
    expect(decoder.health().loggerEdgesLost).toBe(5);
    // A status line without the word (an older logger) changes nothing.
    decoder.pushLine(encodeStatus({ nextSequence: 3, overruns: 0 }));
    expect(decoder.health().loggerEdgesLost).toBe(5);
  });
});

describe('scan skew', () => {
  it('puts a straight line sampled late back on the frame instants exactly', () => {
    // A ramp of 0.1 V per sample period; the channel is sampled 0.75 of a period after the frame's instant.
    const sampled = Float64Array.from({ length: 8 }, (_, n) => 0.1 * (n + 0.75));
    alignToFrame(sampled, 0.75, null);
    sampled.forEach((value, n) => expect(value).toBeCloseTo(0.1 * n, 12));
    const next = Float64Array.from({ length: 8 }, (_, n) => 0.1 * (n + 8 + 0.75));
    alignToFrame(next, 0.75, 0.1 * (7 + 0.75));
    next.forEach((value, n) => expect(value).toBeCloseTo(0.1 * (n + 8), 12));
  });

  it('leaves a channel with no skew untouched', () => {
    const values = Float64Array.from([1, 5, 2]);
    alignToFrame(values, 0, 9);
    expect([...values]).toEqual([1, 5, 2]);
  });

  it('the decoder applies the greeting\'s skew per channel, carrying the last value across blocks', () => {
    const greeting = benchGreeting({ scanSkew: [0, 0.5, 0.5, 0.5] });
    const decoder = createLoggerDecoder();
    decoder.pushLine(encodeGreeting(greeting));
    // Ramp codes rise by 10 per sample: at half a period late, the frame value is 5 codes lower.
    const codesFor = (sequence: number): Int16Array => {
      const codes = zeros(greeting);
      for (let sample = 0; sample < greeting.blockSamples; sample++) codes[sample * 4 + 1] = 100 + 10 * (sequence * greeting.blockSamples + sample);
      return codes;
    };
    const [first] = blocks(decoder.pushLine(encodeBlock({ sequence: 0, codes: codesFor(0) })));
    const [second] = blocks(decoder.pushLine(encodeBlock({ sequence: 1, codes: codesFor(1) })));
    const expected = (sample: number): number => -0.5 + 0.005 * (95 + 10 * sample);
    [...first.ramp, ...second.ramp].forEach((volts, sample) => expect(volts).toBeCloseTo(expected(sample), 12));
  });
});
