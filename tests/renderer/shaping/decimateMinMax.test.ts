import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { xyDecimateMinMax } from '../../../renderer/shaping/decimateMinMax';

function ramp(count: number, xMax: number): { x: Float64Array; y: Float64Array } {
  const x = new Float64Array(count);
  const y = new Float64Array(count);
  for (let index = 0; index < count; index++) {
    x[index] = (index / count) * xMax;
    y[index] = Math.sin((2 * Math.PI * index) / count);
  }
  return { x, y };
}

describe('xyDecimateMinMax', () => {
  it('keeps a one-sample spike that every-nth thinning would drop', () => {
    // 1000 samples of a folded cycle (50 kS/s at 50 Hz), one 5 V sample in a 0 V record: a gate glitch.
    const series = ramp(1000, 360);
    series.y.fill(0);
    series.y[537] = 5;
    const out = xyDecimateMinMax(series, { bucketCount: 50, xMin: 0, xMax: 360 });
    expect(out.x.length).toBeLessThanOrEqual(200);
    expect(Math.max(...out.y)).toBe(5);
    expect(out.x[Array.from(out.y).indexOf(5)]).toBe(series.x[537]);
  });

  it('returns short records unchanged', () => {
    const series = ramp(30, 360);
    const out = xyDecimateMinMax(series, { bucketCount: 10, xMin: 0, xMax: 360 });
    expect(Array.from(out.y)).toEqual(Array.from(series.y));
  });

  it('keeps extremes, order and only original points (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: 1, maxLength: 3000 }),
        fc.integer({ min: 1, max: 200 }),
        fc.boolean(),
        (values, bucketCount, keepEnds) => {
          const perBucket = keepEnds ? 4 : 2;
          const y = Float64Array.from(values);
          const x = Float64Array.from(values, (_, index) => (index / values.length) * 360);
          const out = xyDecimateMinMax({ x, y }, { bucketCount, xMin: 0, xMax: 360, keepEnds });
          expect(out.x.length).toBeLessThanOrEqual(Math.max(values.length <= bucketCount * perBucket ? values.length : 0, bucketCount * perBucket));
          expect(Math.max(...out.y)).toBe(Math.max(...values));
          expect(Math.min(...out.y)).toBe(Math.min(...values));
          const original = new Map<number, number>();
          for (let index = 0; index < x.length; index++) original.set(x[index], y[index]);
          for (let k = 0; k < out.x.length; k++) {
            expect(original.get(out.x[k])).toBe(out.y[k]);
            if (k > 0) expect(out.x[k]).toBeGreaterThan(out.x[k - 1]);
          }
        },
      ),
      { numRuns: 200 },
    );
  });

  it('in every bucket keeps that bucket’s own minimum and maximum', () => {
    const series = ramp(5000, 360);
    const bucketCount = 40;
    const out = xyDecimateMinMax(series, { bucketCount, xMin: 0, xMax: 360 });
    for (let bucket = 0; bucket < bucketCount; bucket++) {
      const low = (bucket * 360) / bucketCount;
      const high = ((bucket + 1) * 360) / bucketCount;
      const inputs = Array.from(series.y).filter((_, index) => series.x[index] >= low && series.x[index] < high);
      const outputs = Array.from(out.y).filter((_, index) => out.x[index] >= low && out.x[index] < high);
      expect(Math.max(...outputs)).toBe(Math.max(...inputs));
      expect(Math.min(...outputs)).toBe(Math.min(...inputs));
    }
  });

  it('rejects a bucket count below one', () => {
    expect(() => xyDecimateMinMax(ramp(10, 1), { bucketCount: 0, xMin: 0, xMax: 1 })).toThrow(TypeError);
  });
});
