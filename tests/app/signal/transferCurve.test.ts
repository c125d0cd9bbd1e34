import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitLine } from '../../../app/signal/leastSquares';
import { TransferCurveAccumulator } from '../../../app/signal/transferCurve';

describe('TransferCurveAccumulator', () => {
  it('gain, offset and max deviation equal a brute-force fit over all points (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double({ min: 0, max: 10, noNaN: true }), fc.double({ min: -3, max: 3, noNaN: true })), { minLength: 3, maxLength: 200 }),
        (points) => {
          const accumulator = new TransferCurveAccumulator();
          // A near-linear transfer (deg = 170 - 15 V) plus the scatter the property draws.
          const data = points.map(([controlV, scatterDeg]) => [controlV, 170 - 15 * controlV + scatterDeg] as const);
          for (const [controlV, alphaDeg] of data) accumulator.add(controlV, alphaDeg);
          const reading = accumulator.reading();
          const brute = fitLine(data.map((p) => p[0]), data.map((p) => p[1]));
          const rangeV = Math.max(...data.map((p) => p[0])) - Math.min(...data.map((p) => p[0]));
          if (!brute || rangeV < 0.05) {
            expect(reading).toBeNull();
            return;
          }
          expect(reading).not.toBeNull();
          expect(reading?.gainDegPerV).toBeCloseTo(brute.slope, 5);
          expect(reading?.offsetDeg).toBeCloseTo(brute.intercept, 4);
          // Exactness of the hull shortcut: the same largest residual as checking every point.
          expect(reading?.maxDeviationDeg).toBeCloseTo(brute.maxAbsResidual, 5);
          expect(reading?.points).toBe(data.length);
        },
      ),
    );
  });

  it('keeps a hull vertex beside a control a hair above zero (a counterexample the property once found)', () => {
    // Five points; 5e-324 V made the hull's cross products underflow and drop the vertex at (0 V, 170.00001 deg).
    const data = [[0, 170.00001], [0, 170], [0, 170], [5e-324, 170], [0.05, 169.25]] as const;
    const accumulator = new TransferCurveAccumulator();
    for (const [controlV, alphaDeg] of data) accumulator.add(controlV, alphaDeg);
    const brute = fitLine(data.map((p) => p[0]), data.map((p) => p[1]))!;
    expect(accumulator.reading()?.maxDeviationDeg).toBeCloseTo(brute.maxAbsResidual, 9);
  });

  it('a fixed control voltage gives no transfer fit', () => {
    const accumulator = new TransferCurveAccumulator();
    for (let i = 0; i < 10; i++) accumulator.add(2.5, 90 + i * 0.01);
    expect(accumulator.reading()).toBeNull();
  });
});

describe('TransferCurveAccumulator memory bound', () => {
  it('points on a smooth curve (all on the hull) keep the hull bounded; max deviation stays close to the brute force', () => {
    const accumulator = new TransferCurveAccumulator({ maxHullVertices: 64 });
    const controls: number[] = [];
    const alphas: number[] = [];
    // A concave transfer (Early-effect-like): every point is a hull vertex. 20000 points, an hour of a slow sweep.
    for (let i = 0; i < 20000; i++) {
      const controlV = 1 + 7 * ((i * 0.6180339887) % 1);
      const alphaDeg = 20 + 18 * controlV - 0.4 * controlV * controlV;
      controls.push(controlV);
      alphas.push(alphaDeg);
      accumulator.add(controlV, alphaDeg);
      expect(accumulator.hullSize).toBeLessThanOrEqual(64);
    }
    const reading = accumulator.reading();
    const brute = fitLine(controls, alphas);
    expect(reading?.gainDegPerV).toBeCloseTo(brute?.slope ?? 0, 6);
    const error = reading?.thinningErrorDeg ?? 0;
    expect(error).toBeGreaterThan(0);
    // Thinning can only lower the answer (fewer points), and here by no more than the estimate it reports.
    expect(reading?.maxDeviationDeg ?? 0).toBeLessThanOrEqual((brute?.maxAbsResidual ?? 0) + 1e-9);
    expect((brute?.maxAbsResidual ?? 0) - (reading?.maxDeviationDeg ?? 0)).toBeLessThanOrEqual(error + 1e-9);
    // And it is small against the curve's own deviation (about 2.4 deg here).
    expect(error).toBeLessThan(0.05);
  });
});
