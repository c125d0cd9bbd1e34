import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CycleFolder, timeToDegrees } from '../../../renderer/shaping/foldCycles';

const rateHz = 10_000;
const mainsHz = 50;

/** A sine sync sampled at `rateHz`, starting at phase zero at t = 0.013 s. Rising crossings at 0.013 + n / 50. */
function syncSamples(seconds: number): Float64Array {
  const count = Math.round(seconds * rateHz);
  return Float64Array.from({ length: count }, (_, index) => Math.sin(2 * Math.PI * mainsHz * (index / rateHz - 0.013)));
}

function crossings(seconds: number): number[] {
  const list: number[] = [];
  for (let timeS = 0.013; timeS < seconds; timeS += 1 / mainsHz) list.push(timeS);
  return list;
}

describe('timeToDegrees', () => {
  it('maps a quarter period to 90 degrees', () => {
    expect(timeToDegrees(0.015, 0.01, 0.02)).toBeCloseTo(90, 12);
  });
});

describe('CycleFolder', () => {
  it('folds a sine so every cycle reads sin(degrees)', () => {
    const folder = new CycleFolder({ sampleRateHz: rateHz, keepCycles: 20, maxPeriodS: 0.03 });
    folder.pushBlock(0, syncSamples(0.2), crossings(0.2));
    const cycles = folder.folded();
    // Crossings at 0.013 + n/50 below 0.2 s: 10 of them, so 9 complete cycles.
    expect(cycles.length).toBe(9);
    for (const cycle of cycles) {
      expect(cycle.periodS).toBeCloseTo(0.02, 12);
      // 200 samples per cycle at 10 kS/s and 50 Hz; the crossing falls between samples.
      expect(cycle.values.length).toBe(200);
      expect(cycle.degrees[0]).toBeGreaterThanOrEqual(0);
      expect(cycle.degrees[cycle.degrees.length - 1]).toBeLessThan(360);
      for (let k = 0; k < cycle.values.length; k++) {
        // Exact sine: only float rounding separates the folded value from sin(degrees).
        expect(cycle.values[k]).toBeCloseTo(Math.sin((cycle.degrees[k] * Math.PI) / 180), 9);
      }
    }
  });

  it('keeps only the most recent cycles', () => {
    const folder = new CycleFolder({ sampleRateHz: rateHz, keepCycles: 3, maxPeriodS: 0.03 });
    folder.pushBlock(0, syncSamples(0.2), crossings(0.2));
    expect(folder.folded().map((cycle) => cycle.startS)).toEqual(crossings(0.2).slice(-4, -1));
  });

  it('gives the same fold however the stream is split into blocks (property)', () => {
    const samples = syncSamples(0.12);
    const allCrossings = crossings(0.12);
    const whole = new CycleFolder({ sampleRateHz: rateHz, keepCycles: 20, maxPeriodS: 0.03 });
    whole.pushBlock(0, samples, allCrossings);

    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: 400 }), { minLength: 1, maxLength: 40 }), (sizes) => {
        const split = new CycleFolder({ sampleRateHz: rateHz, keepCycles: 20, maxPeriodS: 0.03 });
        let offset = 0;
        let next = 0;
        let size = 0;
        while (offset < samples.length) {
          const length = sizes[size++ % sizes.length];
          const startIndex = offset;
          offset = Math.min(samples.length, offset + length);
          // Each block carries the crossings the analyser found inside it.
          const found: number[] = [];
          while (next < allCrossings.length && allCrossings[next] < offset / rateHz) found.push(allCrossings[next++]);
          split.pushBlock(startIndex / rateHz, samples.subarray(startIndex, offset), found);
        }
        expect(split.folded().length).toBe(whole.folded().length);
        split.folded().forEach((cycle, index) => {
          expect(Array.from(cycle.values)).toEqual(Array.from(whole.folded()[index].values));
        });
      }),
      { numRuns: 60 },
    );
  });

  it('never joins two stretches across a gap in the samples', () => {
    const folder = new CycleFolder({ sampleRateHz: rateHz, keepCycles: 20, maxPeriodS: 0.03 });
    const samples = syncSamples(0.2);
    folder.pushBlock(0, samples.subarray(0, 500), crossings(0.05));
    // 0.05-0.1 s lost; the stream resumes at 0.1 s.
    folder.pushBlock(0.1, samples.subarray(1000), crossings(0.2).filter((timeS) => timeS >= 0.1));
    for (const cycle of folder.folded()) {
      expect(cycle.startS < 0.05 && cycle.startS + cycle.periodS > 0.05).toBe(false);
      expect(cycle.values.length).toBe(200);
    }
    // Before the gap: crossings 0.013, 0.033 make one cycle; after: 0.113 ... 0.193 make four.
    expect(folder.folded().length).toBe(5);
  });

  it('holds bounded memory on a long stream', () => {
    const folder = new CycleFolder({ sampleRateHz: rateHz, keepCycles: 20, maxPeriodS: 0.03 });
    const block = syncSamples(1);
    for (let second = 0; second < 30; second++) {
      folder.pushBlock(second, block, crossings(1).map((crossingS) => second + crossingS));
    }
    expect(folder.folded().length).toBe(20);
    // The internal buffer holds at most one cycle plus one block; observed through the public API only via length.
    expect((folder as unknown as { buffer: number[] }).buffer.length).toBeLessThanOrEqual(rateHz + 300);
  });
});
