import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitLine, LineAccumulator } from '../../../app/signal/leastSquares';

describe('fitLine', () => {
  it('recovers an exact line, whatever the offset of x', () => {
    // Times in seconds an hour into a capture: a naive sum of squares would lose digits; the two-pass sums do not.
    const x = Float64Array.from({ length: 50 }, (_, i) => 3600 + i * 2e-5);
    const y = x.map((value) => 2.5 * (value - 3600) * 1000 - 0.75);
    const fit = fitLine(x, y);
    expect(fit).not.toBeNull();
    expect(fit?.slope).toBeCloseTo(2500, 6);
    // The intercept is -9e6 V, so rounding of slope x + intercept alone is about 9e6 * 2.2e-16 = 2e-9 V.
    expect(fit?.maxAbsResidual).toBeLessThan(1e-7);
  });

  it('fits only the requested range and reports the largest residual', () => {
    const x = [0, 1, 2, 3, 4, 5];
    const y = [100, 1, 3, 5, 7.5, -100];
    const fit = fitLine(x, y, { from: 1, to: 5 });
    // Hand computation: points (1,1) (2,3) (3,5) (4,7.5): slope = sum dx dy / sum dx^2 = 10.75 / 5 = 2.15,
    // intercept = 4.125 - 2.15 * 2.5 = -1.25; residuals 0.1, -0.05, -0.2, 0.15.
    expect(fit?.slope).toBeCloseTo(2.15, 12);
    expect(fit?.intercept).toBeCloseTo(-1.25, 12);
    expect(fit?.maxAbsResidual).toBeCloseTo(0.2, 12);
    expect(fit?.count).toBe(4);
  });

  it('gives null for fewer than two distinct x values', () => {
    expect(fitLine([1], [2])).toBeNull();
    expect(fitLine([1, 1, 1], [2, 3, 4])).toBeNull();
  });
});

describe('LineAccumulator', () => {
  it('agrees with the two-pass fit on any data (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double({ min: -1e3, max: 1e3, noNaN: true }), fc.double({ min: -1e3, max: 1e3, noNaN: true })), { minLength: 2, maxLength: 60 }),
        (points) => {
          const accumulator = new LineAccumulator();
          for (const [x, y] of points) accumulator.add(x, y);
          const batch = fitLine(points.map((p) => p[0]), points.map((p) => p[1]));
          const streamed = accumulator.fit();
          // Both null when x has no spread worth fitting; otherwise equal to rounding (relative 1e-6 on ill-conditioned sets).
          if (!batch || !streamed) return;
          const spread = Math.max(...points.map((p) => p[0])) - Math.min(...points.map((p) => p[0]));
          if (spread < 1e-3) return;
          expect(streamed.slope).toBeCloseTo(batch.slope, Math.max(0, 6 - Math.ceil(Math.log10(Math.abs(batch.slope) + 1))));
        },
      ),
    );
  });
});
