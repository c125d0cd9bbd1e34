/**
 * Advice that works (issue 3): a board of our own with a wrong part fitted is simulated by ngspice (outside
 * reference), its ramp read straight from the traces, the trim plan made from those readings alone, the first
 * suggestion applied to the simulated board, and ngspice run again: the ramp must land within 5 % of target.
 */
import { describe, expect, it } from 'vitest';
import type { BoardDesign } from '../../../app/board/design';
import type { ESeriesName } from '../../../app/board/eSeries';
import type { PartOverrides } from '../../../app/board/parts';
import type { RampReadings } from '../../../app/board/rampReadings';
import { planTrim, type TrimSuggestion } from '../../../app/board/trimPlan';
import { readDeckRamp, referenceBoards } from '../../reference/boardCases';
import { simulateFiringBoard } from '../../reference/firingBoardDeck';
import { ngspiceAvailable } from '../../reference/ngspice';

interface Fault {
  label: string;
  board: BoardDesign;
  /** Parts actually on the simulated board. */
  fitted: PartOverrides;
  vebShiftV?: number;
  series: ESeriesName;
  /** What the technician tells the planner (a part measured in circuit). */
  known?: PartOverrides;
  expectClipped?: boolean;
}

const faults: Fault[] = [
  { label: 'board A: 560 nF ramp capacitor fitted for 470 nF (E24)', board: referenceBoards.fullWave50, fitted: { cRamp: 5.6e-7 }, series: 'E24' },
  { label: 'board A: 82 kohm fitted for rBiasBottom 100 kohm (E12)', board: referenceBoards.fullWave50, fitted: { rBiasBottom: 82000 }, series: 'E12' },
  { label: 'board B: 3.9 kohm for rBiasTop 4.7 kohm and a transistor needing 30 mV more V_EB (E96)', board: referenceBoards.halfWave60, fitted: { rBiasTop: 3900 }, vebShiftV: 0.03, series: 'E96' },
  { label: 'board C: 220 nF for 470 nF, the ramp clips (E24)', board: referenceBoards.fullWave50Drive, fitted: { cRamp: 2.2e-7 }, series: 'E24', expectClipped: true },
  { label: 'board A: the emitter resistor itself is 5.1 kohm, measured and told to the planner (E24)', board: referenceBoards.fullWave50, fitted: { rEmitter: 5100 }, known: { rEmitter: 5100 }, series: 'E24' },
];

function chargingIndex(board: BoardDesign): number {
  return board.rectifier === 'full-wave' ? 4 : 2;
}

function readRamp(board: BoardDesign, fitted: PartOverrides, vebShiftV: number | undefined): RampReadings {
  const traces = simulateFiringBoard(board, { controlV: 100, cycles: 3, partOverrides: fitted, vebShiftV });
  const reading = readDeckRamp(traces, board, chargingIndex(board));
  const chargingS = reading.rampEndS - reading.rampStartS;
  return { floorV: reading.floorV, peakV: reading.peakV, slopeVPerMs: reading.slopeVPerS / 1000, clipped: reading.clipOnsetS !== null && reading.clipOnsetS < chargingS };
}

/** The simulated board after the change: an added resistor goes across or in line with the part actually fitted. */
function applied(board: BoardDesign, fitted: PartOverrides, suggestion: TrimSuggestion): PartOverrides {
  const actualOhm = fitted[suggestion.part] ?? board.parts[suggestion.part]?.ohm ?? NaN;
  const added = suggestion.addOhm ?? NaN;
  const newOhm = suggestion.method === 'replace' ? suggestion.toOhm : suggestion.method === 'parallel' ? (actualOhm * added) / (actualOhm + added) : actualOhm + added;
  const result: PartOverrides = { ...fitted, [suggestion.part]: newOhm };
  if (suggestion.alsoChange) result[suggestion.alsoChange.part] = suggestion.alsoChange.toOhm;
  return result;
}

describe.skipIf(!ngspiceAvailable())('trim advice checked in ngspice', () => {
  for (const fault of faults) {
    it(fault.label, () => {
      const { board } = fault;
      const before = readRamp(board, fault.fitted, fault.vebShiftV);
      expect(before.clipped).toBe(fault.expectClipped ?? false);
      // The fault must matter: outside the design's tolerance before the trim.
      expect(Math.abs(before.peakV / board.rampTargetV - 1) * 100).toBeGreaterThan(board.tolerances.rampPeakPct);

      const plan = planTrim(board, before, { series: fault.series, fitted: fault.known });
      expect(plan.status).toBe('trim');
      if (fault.expectClipped) expect(plan.summary).toContain('too high for the supply headroom');
      const best = plan.suggestions[0];

      const after = readRamp(board, applied(board, fault.fitted, best), fault.vebShiftV);
      // Issue 3: within 5 % of the target. The plan's own prediction must also hold in ngspice to 2 %
      // (the model's peak tolerance against ngspice).
      expect(Math.abs(after.peakV / board.rampTargetV - 1)).toBeLessThan(0.05);
      expect(Math.abs(after.peakV / best.predictedPeakV - 1)).toBeLessThan(0.02);
      expect(after.clipped).toBe(false);
    });
  }

  it('board A: the emitter resistor itself wrong and not known to the planner is flagged for a parts check', () => {
    const board = referenceBoards.fullWave50;
    const plan = planTrim(board, readRamp(board, { rEmitter: 5100 }, undefined));
    expect(plan.notes[0]).toContain('check that rEmitter (R7)');
  });
});
