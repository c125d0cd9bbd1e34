import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { estimateSyncLevels, ZeroCrossingTracker } from '../../../app/signal/zeroCrossings';
import { normalSource, quantise } from '../bench/syntheticBoard';

/** A sine sampled at `sampleRateHz`; its zero crossings are at (k/2 - phase) / f exactly. */
function sine(options: { frequencyHz: number; sampleRateHz: number; samples: number; amplitudeV: number; offsetV?: number; phaseCycles?: number; noiseV?: number; bits?: number; seed?: number }): Float64Array {
  const noise = normalSource(options.seed ?? 3);
  return Float64Array.from({ length: options.samples }, (_, i) =>
    quantise(
      (options.offsetV ?? 0) + options.amplitudeV * Math.sin(2 * Math.PI * (options.phaseCycles ?? 0) + (2 * Math.PI * options.frequencyHz * i) / options.sampleRateHz) + (options.noiseV ?? 0) * noise(),
      options.bits,
    ),
  );
}

describe('ZeroCrossingTracker', () => {
  it('finds both directions at the analytic instants of a clean sine, to a tiny fraction of a sample', () => {
    const frequencyHz = 50.3;
    const sampleRateHz = 10000;
    const phaseCycles = 0.137;
    const values = sine({ frequencyHz, sampleRateHz, samples: 5000, amplitudeV: 4, phaseCycles });
    const crossings = new ZeroCrossingTracker({ offsetV: 0, amplitudeV: 4 }).push(values, 0);
    // Crossing k (sin argument k pi): t = (k/2 - phase) / f.
    const firstK = Math.ceil(2 * phaseCycles);
    expect(crossings.length).toBeGreaterThan(45);
    crossings.forEach((crossing, n) => {
      const k = firstK + n;
      const expectedIndex = ((k / 2 - phaseCycles) / frequencyHz) * sampleRateHz;
      expect(crossing.direction).toBe(k % 2 === 0 ? 'rising' : 'falling');
      // The odd-cubic fit removes the sine's curvature; what remains is the per-cycle offset estimate (rectangle
      // rule over about 199 samples), measured at about 4e-4 sample: 2e-3 sample (0.2 us) leaves room.
      expect(Math.abs(crossing.index - expectedIndex)).toBeLessThan(2e-3);
    });
  });

  it('removes a DC offset over whole cycles', () => {
    const values = sine({ frequencyHz: 60, sampleRateHz: 20000, samples: 20000, amplitudeV: 2, offsetV: 0.8 });
    const levels = estimateSyncLevels(values);
    // Mean over whole cycles of a sine is its offset; the cycle boundary falls within a sample, so the error is
    // at most one sample's worth of sine (2 V * 2 pi 60 / 20000 / 333 samples), well below 1 mV.
    expect(levels?.offsetV).toBeCloseTo(0.8, 3);
    expect(levels?.amplitudeV).toBeCloseTo(2, 2);
    const tracker = new ZeroCrossingTracker(levels ?? { offsetV: 0, amplitudeV: 1 });
    const crossings = tracker.push(values, 0);
    const rising = crossings.filter((crossing) => crossing.direction === 'rising');
    // Rising crossings of sin at k / 60 s: every 333.33 samples from 0.
    rising.forEach((crossing) => {
      const k = Math.round((crossing.index / 20000) * 60);
      expect(Math.abs(crossing.index - (k / 60) * 20000)).toBeLessThan(0.01);
    });
  });

  it('hysteresis: heavy noise near zero makes no extra crossings', () => {
    // 5 % noise of the amplitude, 8-bit quantisation: each cycle still gives exactly one crossing each way.
    const values = sine({ frequencyHz: 50, sampleRateHz: 50000, samples: 50000, amplitudeV: 5, noiseV: 0.25, bits: 8, seed: 9 });
    const crossings = new ZeroCrossingTracker({ offsetV: 0, amplitudeV: 5 }).push(values, 0);
    // One second of 50 Hz from phase 0: crossings at every half period, the one at t = 0 excluded: 99.
    expect(crossings).toHaveLength(99);
    for (let n = 1; n < crossings.length; n++) expect(crossings[n].direction).not.toBe(crossings[n - 1].direction);
  });

  it('a square-wave sync (comparator output) crosses between its bracketing samples', () => {
    const values = Float64Array.from({ length: 1000 }, (_, i) => (Math.floor((i + 0.4) / 100) % 2 === 0 ? 5 : -5));
    const crossings = new ZeroCrossingTracker({ offsetV: 0, amplitudeV: 5 }).push(values, 0);
    // The step sits between samples 99 and 100 (99.6 in continuous time): interpolation of +5 -> -5 gives 99.5.
    expect(crossings[0].index).toBeCloseTo(99.5, 9);
    expect(crossings[0].direction).toBe('falling');
    expect(crossings).toHaveLength(9);
  });

  it('gives the same crossings however the stream is cut into blocks (property)', () => {
    const values = sine({ frequencyHz: 55, sampleRateHz: 8000, samples: 4000, amplitudeV: 3, noiseV: 0.02, seed: 5 });
    const whole = new ZeroCrossingTracker({ offsetV: 0, amplitudeV: 3 }).push(values, 0);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: 700 }), { minLength: 1, maxLength: 30 }), (sizes) => {
        const tracker = new ZeroCrossingTracker({ offsetV: 0, amplitudeV: 3 });
        const found = [];
        let from = 0;
        let s = 0;
        while (from < values.length) {
          const to = Math.min(values.length, from + sizes[s++ % sizes.length]);
          found.push(...tracker.push(values.subarray(from, to), from));
          from = to;
        }
        expect(found).toEqual(whole);
      }),
      { numRuns: 40 },
    );
  });
});
