import { describe, expect, it } from 'vitest';
import { estimateFromReadings } from '../../../app/board/estimateFromReadings';
import { predictRamp, type RampPrediction } from '../../../app/board/rampModel';
import type { RampReadings } from '../../../app/board/rampReadings';
import { referenceBoards } from '../../reference/boardCases';

const board = referenceBoards.fullWave50;

function readingsOf(prediction: RampPrediction): RampReadings {
  return { floorV: prediction.floorV, peakV: prediction.peakV, slopeVPerMs: prediction.slopeVPerS / 1000, clipped: prediction.clipped };
}

describe('inverse estimation from ramp readings', () => {
  it('recovers a V_EB shift and the charging current from a model ramp', () => {
    const shifted = predictRamp(board, { vebShiftV: 0.06 });
    const estimate = estimateFromReadings(board, readingsOf(shifted));
    expect(estimate.explanation).toBe('veb');
    expect(estimate.basis).toBe('peak');
    // The junction law's shift comes back to 0.1 mV (the bisection resolves microvolts). The operating V_EB moves
    // a little less than 60 mV: the smaller current takes back V_T ln(I'/I), about 0.8 mV for 3 % less current.
    expect(estimate.modelShiftV).toBeCloseTo(0.06, 4);
    expect(estimate.vebV).toBeCloseTo(shifted.vebV, 5);
    expect(estimate.vebShiftV).toBeGreaterThan(0.058);
    expect(estimate.vebShiftV).toBeLessThan(0.06);
    expect(estimate.chargingCurrentA / shifted.chargingCurrentA).toBeCloseTo(1, 5);
    expect(estimate.currentErrorPct).toBeLessThan(0);
  });

  it('states the ambiguity: a capacitance error explains the same ramp', () => {
    const wrongCapacitor = predictRamp(board, { partOverrides: { cRamp: board.parts.cRamp.farad * 1.15 } });
    const estimate = estimateFromReadings(board, readingsOf(wrongCapacitor));
    // +15 % capacitance: within 0.5 % (the Early droop makes a C error and a current error differ slightly).
    expect(Math.abs(estimate.capacitanceErrorPct - 15)).toBeLessThan(0.5);
    // The same ramp read as current: about 1/1.15 - 1 = -13 %.
    expect(Math.abs(estimate.currentErrorPct - (1 / 1.15 - 1) * 100)).toBeLessThan(0.5);
    expect(estimate.ambiguity).toContain('cannot tell them apart');
    expect(estimate.ambiguity).toContain('capacitor');
  });

  it('fits a clipped ramp on its slope', () => {
    const clipped = predictRamp(board, { partOverrides: { rEmitter: 2700 }, vebShiftV: -0.02 });
    expect(clipped.clipped).toBe(true);
    const estimate = estimateFromReadings(board, readingsOf(clipped), { partOverrides: { rEmitter: 2700 } });
    expect(estimate.basis).toBe('slope');
    expect(estimate.modelShiftV).toBeCloseTo(-0.02, 3);
  });

  it('a current error too large for V_EB falls back to the capacitance reading', () => {
    const fast = predictRamp(board, { partOverrides: { cRamp: board.parts.cRamp.farad / 3 } });
    const estimate = estimateFromReadings(board, readingsOf(fast));
    expect(estimate.explanation).toBe('capacitance');
    expect(estimate.capacitanceFarad / (board.parts.cRamp.farad / 3)).toBeCloseTo(1, 2);
    expect(estimate.ambiguity).toContain('more than a V_EB error can explain');
  });
});
