import { describe, expect, it } from 'vitest';
import { boardDesignSchema } from '../../../app/board/design';
import { predictRamp } from '../../../app/board/rampModel';
import { analyseTolerances } from '../../../app/board/toleranceAnalysis';
import { referenceBoards } from '../../reference/boardCases';

const board = referenceBoards.fullWave50;

describe('tolerance analysis (seeded Monte Carlo and worst case)', () => {
  it('is repeatable for a seed and differs between seeds', () => {
    const first = analyseTolerances(board, { runs: 60, seed: 7 });
    const again = analyseTolerances(board, { runs: 60, seed: 7 });
    const other = analyseTolerances(board, { runs: 60, seed: 8 });
    expect(again.peakV).toEqual(first.peakV);
    expect(other.peakV.mean).not.toBe(first.peakV.mean);
  });

  it('zero tolerances and a single temperature give no spread at all', () => {
    const exact = boardDesignSchema.parse({
      ...board,
      parts: { ...board.parts, rEmitter: { ohm: 7500, tolerancePct: 0 }, rBiasTop: { ohm: 22000, tolerancePct: 0 }, rBiasBottom: { ohm: 100000, tolerancePct: 0 }, cRamp: { farad: 4.7e-7, tolerancePct: 0 } },
    });
    const report = analyseTolerances(exact, { runs: 20, vebSpreadV: 0, betaSpreadPct: 0, temperatureRangeC: { minC: 25, maxC: 25 } });
    expect(report.peakV.standardDeviation).toBeLessThan(1e-12);
    expect(report.peakV.mean).toBeCloseTo(predictRamp(exact).peakV, 12);
  });

  it('V_EB drift alone (-2 mV/K, Sedra and Smith) spreads the peak as the hand estimate says', () => {
    const exact = boardDesignSchema.parse({
      ...board,
      parts: { ...board.parts, rEmitter: { ohm: 7500, tolerancePct: 0 }, rBiasTop: { ohm: 22000, tolerancePct: 0 }, rBiasBottom: { ohm: 100000, tolerancePct: 0 }, cRamp: { farad: 4.7e-7, tolerancePct: 0 } },
    });
    const report = analyseTolerances(exact, { runs: 0, vebSpreadV: 0, betaSpreadPct: 0, temperatureRangeC: { minC: 0, maxC: 50 } });
    // Hand: 50 K x 2 mV = 100 mV of V_EB against a 2.055 V emitter drop (V - V_TH - V_EB) is 4.87 % of the current,
    // so about 4.87 % of the 5.55 V peak = 0.270 V. 10 % margin: the junction's log term takes back about 1 mV.
    const spreadV = report.worstCase.peakHighV - report.worstCase.peakLowV;
    expect(spreadV).toBeGreaterThan(0.9 * 0.27);
    expect(spreadV).toBeLessThan(1.1 * 0.27);
  });

  it('the worst case brackets every Monte Carlo run', () => {
    const report = analyseTolerances(board, { runs: 200, seed: 3 });
    expect(report.worstCase.peakLowV).toBeLessThanOrEqual(report.peakV.min + 1e-12);
    expect(report.worstCase.peakHighV).toBeGreaterThanOrEqual(report.peakV.max - 1e-12);
    expect(report.alphaDeg).not.toBeNull();
    expect(report.worstCase.alphaLowDeg ?? Infinity).toBeLessThanOrEqual((report.alphaDeg?.min ?? 0) + 1e-9);
    expect(report.worstCase.alphaHighDeg ?? -Infinity).toBeGreaterThanOrEqual((report.alphaDeg?.max ?? 0) - 1e-9);
    // Alpha is taken at the control voltage of 90 deg on the nominal board.
    expect(report.alphaDeg?.nominal).toBeCloseTo(90, 6);
    // 5 % resistors and a 10 % capacitor: a uniform spread of +-10 % alone has a standard deviation of 5.8 %;
    // the total lies between that and the root-sum-square of all terms (under 10 %).
    expect(report.peakV.standardDeviation / report.peakV.mean).toBeGreaterThan(0.05);
    expect(report.peakV.standardDeviation / report.peakV.mean).toBeLessThan(0.1);
  });
});
