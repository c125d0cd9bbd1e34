import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createLoggerDecoder } from '../../../app/logger/decoder';
import { encodeBlock, encodeGreeting } from '../../../app/logger/encode';
import type { ChannelRole, LoggerGreeting } from '../../../app/logger/protocol';

const roleOrders: ChannelRole[][] = [
  ['sync', 'ramp', 'gate', 'control'],
  ['control', 'gate', 'ramp', 'sync'],
  ['sync', 'ramp', 'gate'],
  ['ramp', 'unused', 'sync', 'gate', 'control'],
];

const greetingArbitrary: fc.Arbitrary<LoggerGreeting> = fc
  .record({
    roles: fc.constantFrom(...roleOrders),
    sampleRateHz: fc.integer({ min: 1000, max: 200_000 }),
    adcBits: fc.integer({ min: 8, max: 16 }),
    blockSamples: fc.integer({ min: 1, max: 40 }),
    gains: fc.array(fc.double({ min: 1e-5, max: 0.1, noNaN: true }), { minLength: 5, maxLength: 5 }),
    offsets: fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: 5, maxLength: 5 }),
  })
  .map(({ roles, sampleRateHz, adcBits, blockSamples, gains, offsets }) => ({
    version: 1,
    loggerId: 'PROPLOG-1',
    sampleRateHz,
    adcBits,
    blockSamples,
    // -0 and 0 are the same offset on the wire (decimal text), so the arbitrary uses 0.
    channels: roles.map((role, index) => ({ role, gainV: gains[index], offsetV: offsets[index] + 0 })),
  }));

function codesFor(greeting: LoggerGreeting, seed: number): Int16Array {
  const codes = new Int16Array(greeting.channels.length * greeting.blockSamples);
  let state = seed >>> 0 || 1;
  for (let index = 0; index < codes.length; index++) {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    codes[index] = (state >>> 16) - 32768;
  }
  return codes;
}

/** The volts a block must carry: offset + gain x code per channel (PROTOCOL.md), taken from the codes sent. */
function checkBlockSamples(greeting: LoggerGreeting, codes: Int16Array, block: Record<string, Float64Array | null>): void {
  greeting.channels.forEach((scale, channel) => {
    if (scale.role === 'unused') return;
    const volts = block[scale.role];
    expect(volts).not.toBeNull();
    for (let sample = 0; sample < greeting.blockSamples; sample++) {
      expect(volts![sample]).toBe(scale.offsetV + scale.gainV * codes[sample * greeting.channels.length + channel]);
    }
  });
  if (!greeting.channels.some((scale) => scale.role === 'control')) expect(block.control).toBeNull();
}

describe('logger decoder properties (fast-check)', () => {
  it('encode then decode gives back every block, every sample, in order, with times from the sequence', () => {
    fc.assert(
      fc.property(greetingArbitrary, fc.integer({ min: 1, max: 12 }), fc.nat(), fc.integer({ min: 0, max: 0xffffffff }), (greeting, count, seed, firstSequence) => {
        const decoder = createLoggerDecoder();
        const greetingEvents = decoder.pushLine(encodeGreeting(greeting));
        expect(greetingEvents[0]).toEqual({ kind: 'greeting', greeting });
        for (let index = 0; index < count; index++) {
          const codes = codesFor(greeting, seed + index);
          const events = decoder.pushLine(encodeBlock({ sequence: firstSequence + index, codes }));
          expect(events).toHaveLength(1);
          const event = events[0];
          if (event.kind !== 'block') throw new Error('expected a block');
          expect(event.block.afterGap).toBe(false);
          // Relative 1e-12: startS is k x block / rate computed in doubles.
          expect(event.block.startS).toBeCloseTo((index * greeting.blockSamples) / greeting.sampleRateHz, 12);
          checkBlockSamples(greeting, codes, event.block as unknown as Record<string, Float64Array | null>);
        }
        expect(decoder.health().blocks).toBe(count);
      }),
      { numRuns: 150 },
    );
  });

  it('garbage lines and damaged lines never crash it and never yield a block with wrong samples', () => {
    const garbage = fc.oneof(
      fc.string({ unit: 'binary', maxLength: 300 }),
      fc.string({ unit: fc.constantFrom('D', 'H', 'S', 'A', 'E', ' ', '*', '0', 'F', 'A', '=', '+', '\r'), maxLength: 200 }),
      fc.constant('D 00000001 *00000000'),
    );
    fc.assert(
      fc.property(
        greetingArbitrary,
        fc.array(fc.record({ damage: fc.constantFrom('none', 'none', 'garbage-before', 'flip', 'truncate', 'glue'), at: fc.nat(), noise: garbage }), {
          minLength: 1,
          maxLength: 20,
        }),
        (greeting, plan) => {
          const decoder = createLoggerDecoder({ maxLineChars: 4096 });
          const sent = new Map<number, Int16Array>();
          const lines: string[] = [encodeGreeting(greeting)];
          plan.forEach((step, sequence) => {
            const codes = codesFor(greeting, sequence * 7919);
            sent.set(sequence, codes);
            const line = encodeBlock({ sequence, codes });
            const at = step.at % line.length;
            if (step.damage === 'none') lines.push(line);
            else if (step.damage === 'garbage-before') lines.push(...step.noise.split('\n'), line);
            else if (step.damage === 'flip') lines.push(line.slice(0, at) + String.fromCharCode(line.charCodeAt(at) ^ (1 << (step.at % 7))) + line.slice(at + 1));
            else if (step.damage === 'truncate') lines.push(line.slice(0, at));
            else lines.push(step.noise.replace(/\n/g, '') + line);
          });
          let delivered = 0;
          for (const line of lines) {
            for (const event of decoder.pushLine(line)) {
              if (event.kind !== 'block') continue;
              delivered++;
              const codes = sent.get(event.sequence);
              expect(codes).toBeDefined();
              checkBlockSamples(greeting, codes!, event.block as unknown as Record<string, Float64Array | null>);
            }
          }
          // Every undamaged line is read: the damage before it never costs it.
          const intact = plan.filter((step) => step.damage === 'none' || step.damage === 'garbage-before' || step.damage === 'glue').length;
          expect(delivered).toBeGreaterThanOrEqual(intact);
        },
      ),
      { numRuns: 150 },
    );
  });

  it('a dropped line always marks the next block afterGap with the right number of lost samples', () => {
    fc.assert(
      fc.property(greetingArbitrary, fc.array(fc.boolean(), { minLength: 2, maxLength: 40 }), fc.integer({ min: 0, max: 0xffffffff }), (greeting, keep, firstSequence) => {
        keep[0] = true;
        const decoder = createLoggerDecoder();
        decoder.pushLine(encodeGreeting(greeting));
        let droppedRun = 0;
        let totalLost = 0;
        keep.forEach((kept, index) => {
          const line = encodeBlock({ sequence: firstSequence + index, codes: codesFor(greeting, index) });
          if (!kept) {
            droppedRun++;
            return;
          }
          const [event] = decoder.pushLine(line).filter((each) => each.kind === 'block');
          if (event?.kind !== 'block') throw new Error('expected a block');
          expect(event.block.afterGap).toBe(droppedRun > 0);
          expect(event.samplesLost).toBe(droppedRun * greeting.blockSamples);
          expect(event.block.startS).toBeCloseTo((index * greeting.blockSamples) / greeting.sampleRateHz, 12);
          totalLost += droppedRun * greeting.blockSamples;
          droppedRun = 0;
        });
        expect(decoder.health().samplesLost).toBe(totalLost);
      }),
      { numRuns: 200 },
    );
  });
});
