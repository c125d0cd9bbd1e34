import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { boardDesignSchema } from '../../../app/board/design';
import { isStandardValue } from '../../../app/board/eSeries';
import { predictRamp, type RampPrediction } from '../../../app/board/rampModel';
import type { RampReadings } from '../../../app/board/rampReadings';
import { planTrim } from '../../../app/board/trimPlan';
import { InputError } from '../../../app/errors';
import { referenceBoards } from '../../reference/boardCases';

const board = referenceBoards.fullWave50;

function readingsOf(prediction: RampPrediction, extra: Partial<RampReadings> = {}): RampReadings {
  return { floorV: prediction.floorV, peakV: prediction.peakV, slopeVPerMs: prediction.slopeVPerS / 1000, clipped: prediction.clipped, ...extra };
}

describe('trim plan', () => {
  it('a board in tolerance gets no suggestion, and says so', () => {
    const plan = planTrim(board, readingsOf(predictRamp(board, { vebShiftV: 0.01 })));
    expect(plan.status).toBe('in-tolerance');
    expect(plan.suggestions).toEqual([]);
    expect(plan.summary).toContain('no change needed');
  });

  it('gives the issue-3 JSON shape, with toOhm the effective resistance and values from the chosen series', () => {
    const slow = predictRamp(board, { partOverrides: { cRamp: 5.6e-7 } });
    for (const series of ['E12', 'E24', 'E96'] as const) {
      const plan = planTrim(board, readingsOf(slow), { series });
      expect(plan.status).toBe('trim');
      expect(plan.suggestions.length).toBeGreaterThan(1);
      expect(plan.estimate.chargingCurrentA).toBeGreaterThan(0);
      expect(plan.estimate.vebV).toBeGreaterThan(0.65); // the ramp is short: read as more V_EB
      for (const suggestion of plan.suggestions) {
        expect(suggestion.series).toBe(series);
        expect(['replace', 'parallel', 'series']).toContain(suggestion.method);
        expect(suggestion.reason.length).toBeGreaterThan(20);
        expect(suggestion.reason).not.toContain('\n');
        expect(suggestion.reason).toContain(suggestion.part);
        if (suggestion.method === 'replace') {
          expect(suggestion.addOhm).toBeNull();
          expect(isStandardValue(suggestion.toOhm, series)).toBe(true);
        } else {
          const added = suggestion.addOhm ?? NaN;
          expect(isStandardValue(added, series)).toBe(true);
          const effective = suggestion.method === 'parallel' ? (suggestion.fromOhm * added) / (suggestion.fromOhm + added) : suggestion.fromOhm + added;
          expect(suggestion.toOhm).toBeCloseTo(effective, 6);
        }
      }
      const best = plan.suggestions[0];
      // The ramp is short, so the best change adds current: a lower emitter resistance, the ref named.
      expect(best.part).toBe('rEmitter');
      expect(best.toOhm).toBeLessThan(best.fromOhm);
      expect(best.reason).toContain('R7');
      // First is best: no other suggestion of the same effort lands nearer the target.
      expect(Math.abs(best.predictedPeakErrorPct)).toBeLessThanOrEqual(board.tolerances.rampPeakPct);
      for (const other of plan.suggestions.filter((suggestion) => suggestion.method === best.method && suggestion.part === best.part)) {
        expect(Math.abs(best.predictedPeakErrorPct)).toBeLessThanOrEqual(Math.abs(other.predictedPeakErrorPct) + 1e-9);
      }
    }
  });

  it('a clipped ramp: the current is too high for the headroom, so the plan lowers it below clipping', () => {
    const clipped = predictRamp(board, { partOverrides: { cRamp: 1.5e-7 } });
    expect(clipped.clipped).toBe(true);
    const plan = planTrim(board, readingsOf(clipped));
    expect(plan.summary).toContain('too high for the supply headroom');
    const best = plan.suggestions[0];
    expect(best.toOhm).toBeGreaterThan(best.fromOhm);
    expect(best.clipped).toBe(false);
    expect(best.headroomV).toBeGreaterThan(0.5);
  });

  it('a target close to the clipping level moves the divider and re-solves the emitter resistor', () => {
    // Target 12.7 V on a board whose source saturates near 12.8 V: 0.5 V of headroom needs the base moved up.
    const tall = boardDesignSchema.parse({ ...board, rampTargetV: 12.7 });
    const clipped = predictRamp(tall, { partOverrides: { rEmitter: 2700 } });
    const plan = planTrim(tall, readingsOf(clipped), { fitted: { rEmitter: 2700 } });
    const best = plan.suggestions[0];
    expect(best.part === 'rBiasBottom' || best.part === 'rBiasTop').toBe(true);
    expect(best.alsoChange?.part).toBe('rEmitter');
    expect(best.headroomV).toBeGreaterThanOrEqual(0.5);
    expect(Math.abs(best.predictedPeakErrorPct)).toBeLessThan(3);
  });

  it('proposes the control-limit resistor when alpha max is off, rounded so alpha stays short of the limit', () => {
    const withControl = boardDesignSchema.parse({ ...board, parts: { ...board.parts, rControlTop: { ohm: 9100, ref: 'R9' }, potControl: { ohm: 10000, ref: 'RV1' } } });
    const plan = planTrim(withControl, readingsOf(predictRamp(withControl), { alphaMaxDeg: 178 }));
    expect(plan.controlLimit).not.toBeNull();
    expect(plan.controlLimit?.toOhm).toBeGreaterThan(9100);
    expect(plan.controlLimit?.predictedAlphaMaxDeg ?? 999).toBeLessThanOrEqual(withControl.alphaMaxDeg);
    expect(plan.controlLimit?.predictedAlphaMaxDeg ?? 0).toBeGreaterThan(withControl.alphaMaxDeg - 10);
    expect(plan.controlLimit?.reason).toContain('R9');
  });

  it('a late ramp start points at the sync and reset circuit', () => {
    // Design start: half the 300 us reset = 150 us = 2.7 deg at 50 Hz; 9 deg is past the 3 deg tolerance.
    const late = planTrim(board, readingsOf(predictRamp(board), { startDelayDeg: 9 }));
    expect(late.notes.join(' ')).toContain('check the sync and reset circuit');
    const onTime = planTrim(board, readingsOf(predictRamp(board), { startDelayDeg: 3 }));
    expect(onTime.notes.join(' ')).not.toContain('sync and reset');
  });

  it('a ramp beyond every tolerance corner asks for the fitted parts to be checked first', () => {
    const plan = planTrim(board, readingsOf(predictRamp(board, { partOverrides: { rEmitter: 5100 } })));
    expect(plan.notes.join(' ')).toContain('check that rEmitter (R7)');
  });

  it('property: any readings give a plan with finite numbers or an InputError, never a crash', () => {
    const reading = fc.oneof(fc.double({ min: -5, max: 20, noNaN: true }), fc.constant(Number.NaN), fc.constant(0));
    fc.assert(
      fc.property(reading, reading, fc.oneof(fc.double({ min: -1, max: 20, noNaN: true }), fc.constant(0)), fc.boolean(), (floorV, peakV, slopeVPerMs, clipped) => {
        try {
          const plan = planTrim(board, { floorV, peakV, slopeVPerMs, clipped });
          for (const suggestion of plan.suggestions) {
            expect(Number.isFinite(suggestion.toOhm) && Number.isFinite(suggestion.predictedPeakV)).toBe(true);
          }
          expect(Number.isFinite(plan.estimate.chargingCurrentA)).toBe(true);
        } catch (error) {
          expect(error).toBeInstanceOf(InputError);
        }
      }),
      { numRuns: 25 },
    );
    expect(() => planTrim(board, { floorV: 0.1, peakV: 0.05, slopeVPerMs: 0, clipped: false })).toThrow(/no charging ramp/);
  });
});
