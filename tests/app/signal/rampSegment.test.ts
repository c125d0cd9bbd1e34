import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzeRampSegment, lastUpCrossing, UpCrossingFinder } from '../../../app/signal/rampSegment';

/** A firing interval's ramp samples: reset at the floor for `resetSamples` around each crossing (at 0 and `halfCycle`). */
function rampSamples(options: { halfCycle: number; resetSamples: number; floorV: number; slopeVPerSample: number; clipV?: number; earlyFraction?: number }): Float64Array {
  const margin = Math.ceil(0.05 * options.halfCycle);
  const values = new Float64Array(options.halfCycle + 2 * margin);
  const startS = options.resetSamples / 2;
  const endS = options.halfCycle - options.resetSamples / 2;
  for (let i = 0; i < values.length; i++) {
    const t = i - margin;
    let v = options.floorV;
    if (t > startS && t < endS) {
      const elapsed = t - startS;
      // Early effect: slope falls linearly with time by `earlyFraction` over the interval.
      const k = options.earlyFraction ?? 0;
      v = options.floorV + options.slopeVPerSample * (elapsed - (k * elapsed * elapsed) / (2 * (endS - startS)));
      if (options.clipV !== undefined) v = Math.min(v, options.clipV);
    }
    values[i] = v;
  }
  return values;
}

describe('analyzeRampSegment', () => {
  const halfCycle = 200;
  const margin = 10;

  it('reads floor, slope, start, peak of an ideal ramp exactly', () => {
    const values = rampSamples({ halfCycle, resetSamples: 6.4, floorV: 0.3, slopeVPerSample: 0.04 });
    const segment = analyzeRampSegment(values, { windowStartIndex: margin, windowEndIndex: margin + halfCycle, chargeEndCrossingIndex: margin + halfCycle, minimumSpanV: 0.1 });
    expect(segment).not.toBeNull();
    expect(segment?.floorV).toBeCloseTo(0.3, 12);
    expect(segment?.slopeVPerSample).toBeCloseTo(0.04, 12);
    // Start: 3.2 samples after the crossing; end 3.2 before the next: peak = 0.3 + 0.04 * 193.6.
    expect(segment?.startIndex).toBeCloseTo(margin + 3.2, 9);
    expect(segment?.peakV).toBeCloseTo(0.3 + 0.04 * 193.6, 9);
    expect(segment?.nonlinearityPct).toBeLessThan(1e-9);
    expect(segment?.clipped).toBe(false);
  });

  it('an Early-effect ramp (slope down 40 % by the end) is nonlinear but not clipped', () => {
    const values = rampSamples({ halfCycle, resetSamples: 6, floorV: 0, slopeVPerSample: 0.05, earlyFraction: 0.4 });
    const segment = analyzeRampSegment(values, { windowStartIndex: margin, windowEndIndex: margin + halfCycle, minimumSpanV: 0.1 });
    expect(segment?.clipped).toBe(false);
    // A parabola's deviation from its chord-like fit over 10-90 %: several percent of the peak (here about 2 %).
    expect(segment?.nonlinearityPct).toBeGreaterThan(0.5);
    expect(segment?.tailSlopeRatio).toBeGreaterThan(0.6);
  });

  it('a ramp that flattens at 70 % of the interval is clipped, and its peak is the clip level', () => {
    const values = rampSamples({ halfCycle, resetSamples: 6, floorV: 0.1, slopeVPerSample: 0.05, clipV: 0.1 + 0.05 * 135 });
    const segment = analyzeRampSegment(values, { windowStartIndex: margin, windowEndIndex: margin + halfCycle, minimumSpanV: 0.1 });
    expect(segment?.clipped).toBe(true);
    expect(segment?.peakV).toBeCloseTo(0.1 + 0.05 * 135, 9);
    expect(segment?.tailSlopeRatio).toBeLessThan(0.1);
  });

  it('a ramp that does not rise is no ramp', () => {
    const values = new Float64Array(220).fill(0.2);
    expect(analyzeRampSegment(values, { windowStartIndex: 10, windowEndIndex: 210, minimumSpanV: 0.1 })).toBeNull();
  });
});

describe('UpCrossingFinder: the bisected last up-crossing equals the scan', () => {
  it('gives lastUpCrossing\'s answer for any samples, range and level', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: -20, max: 20 }), { minLength: 1, maxLength: 60 }),
        fc.integer({ min: -3, max: 63 }),
        fc.integer({ min: -3, max: 63 }),
        fc.array(fc.integer({ min: -22, max: 22 }), { minLength: 1, maxLength: 5 }),
        (samples, from, to, levels) => {
          const values = Float64Array.from(samples, (value) => value / 4);
          const finder = new UpCrossingFinder(values, from, to);
          for (const level of levels) expect(finder.lastUp(level / 4)).toBe(lastUpCrossing(values, level / 4, from, to));
          // From a later start, as the ramp's passes ask of a finder built from the first sample.
          const later = from + Math.abs(levels[0]);
          for (const level of levels) expect(finder.lastUpFrom(level / 4, later)).toBe(lastUpCrossing(values, level / 4, later, to));
        },
      ),
      { numRuns: 2000 },
    );
  });
});
