/**
 * Advice that works, checked in ngspice (an outside reference) on held-out boards: designs sized here by the sizing
 * code from targets of our own, in no fixture or other test. Each board is simulated with the parts actually fitted,
 * its ramp read straight from the traces, the plan made from those readings alone, its first suggestion applied to
 * the simulated board, and ngspice run again (issue 11):
 * - a part far outside its tolerance (a capacitor 30 % low, every other part as designed) is named first, to be
 *   measured and replaced with its design value;
 * - parts inside their tolerance that stack up (and a transistor a little off the design's) get a bias trim first,
 *   which lands within 5 % of the target, its predicted peak within 1 % of the simulated one.
 */
import { describe, expect, it } from 'vitest';
import type { BoardDesign } from '../../../app/board/design';
import type { PartOverrides } from '../../../app/board/parts';
import type { RampReadings } from '../../../app/board/rampReadings';
import { sizeBoard } from '../../../app/board/sizeBoard';
import { sizingTargetsSchema, type SizingTargetsInput } from '../../../app/board/sizingTargets';
import { planTrim, type TrimSuggestion } from '../../../app/board/trimPlan';
import { readDeckRamp } from '../../reference/boardCases';
import { simulateFiringBoard } from '../../reference/firingBoardDeck';
import { ngspiceAvailable } from '../../reference/ngspice';

const heldOutTargets: SizingTargetsInput[] = [
  { name: 'held-out P (50 Hz half-wave)', mainsHz: 50, rectifier: 'half-wave', supplyV: 12, rampTargetV: 5, cRampFarad: 6.8e-7 },
  { name: 'held-out Q (60 Hz full-wave, E96)', mainsHz: 60, rectifier: 'full-wave', supplyV: 24, rampTargetV: 9, cRampFarad: 2.2e-7, series: 'E96', emitterDropFraction: 0.2 },
  { name: 'held-out R (50 Hz full-wave, E12)', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 6, cRampFarad: 1e-6, series: 'E12', transistor: { vebV: 0.63, beta: 200, earlyV: 45 } },
];
const heldOut: BoardDesign[] = heldOutTargets.map((targets) => sizeBoard(sizingTargetsSchema.parse(targets)).design);

/** What is really on the simulated board: part values and the transistor. */
interface Board {
  fitted: PartOverrides;
  vebShiftV?: number;
  beta?: number;
}

function readRamp(design: BoardDesign, board: Board): RampReadings {
  const traces = simulateFiringBoard(design, { controlV: 100, cycles: 3, partOverrides: board.fitted, vebShiftV: board.vebShiftV, beta: board.beta });
  const reading = readDeckRamp(traces, design, design.rectifier === 'full-wave' ? 4 : 2);
  const chargingS = reading.rampEndS - reading.rampStartS;
  return { floorV: reading.floorV, peakV: reading.peakV, slopeVPerMs: reading.slopeVPerS / 1000, clipped: reading.clipOnsetS !== null && reading.clipOnsetS < chargingS };
}

/** The simulated board after the change: an added resistor goes across or in line with the part actually fitted. */
function applied(design: BoardDesign, board: Board, suggestion: TrimSuggestion): Board {
  if (suggestion.part === 'transistor') return { fitted: board.fitted };
  if (suggestion.part === 'cRamp') return { ...board, fitted: { ...board.fitted, cRamp: suggestion.toFarad ?? NaN } };
  const actualOhm = board.fitted[suggestion.part] ?? design.parts[suggestion.part]?.ohm ?? NaN;
  const added = suggestion.addOhm ?? NaN;
  const newOhm = suggestion.method === 'replace' ? (suggestion.toOhm ?? NaN) : suggestion.method === 'parallel' ? (actualOhm * added) / (actualOhm + added) : actualOhm + added;
  const fitted: PartOverrides = { ...board.fitted, [suggestion.part]: newOhm };
  if (suggestion.alsoChange) fitted[suggestion.alsoChange.part] = suggestion.alsoChange.toOhm;
  return { ...board, fitted };
}

/** Inside their tolerances, stacking up (our scenarios): each ramp well outside its 3 % band. */
function stackUps(design: BoardDesign): Array<{ label: string; board: Board }> {
  const { rEmitter, rBiasBottom, rBiasTop, cRamp } = design.parts;
  const edge = (value: number, tolerancePct: number, share: number): number => value * (1 + (share * tolerancePct) / 100);
  return [
    {
      label: 'capacitor and lower bias resistor high, emitter resistor low, transistor 15 mV and 20 % gain off',
      board: { fitted: { cRamp: edge(cRamp.farad, cRamp.tolerancePct, 0.85), rBiasBottom: edge(rBiasBottom.ohm, rBiasBottom.tolerancePct, 0.8), rEmitter: edge(rEmitter.ohm, rEmitter.tolerancePct, 0.4) }, vebShiftV: 0.015, beta: design.transistor.beta * 0.8 },
    },
    {
      label: 'capacitor low, upper bias resistor high, emitter resistor low',
      board: { fitted: { cRamp: edge(cRamp.farad, cRamp.tolerancePct, -0.9), rBiasTop: edge(rBiasTop.ohm, rBiasTop.tolerancePct, 0.7), rEmitter: edge(rEmitter.ohm, rEmitter.tolerancePct, -0.6) } },
    },
  ];
}

describe.skipIf(!ngspiceAvailable())('trim advice on held-out boards, checked in ngspice', () => {
  for (const design of heldOut) {
    it(`${design.name}: a capacitor 30 % low is named first, to be replaced with its design value, and that lands on target`, () => {
      const board: Board = { fitted: { cRamp: design.parts.cRamp.farad * 0.7 } };
      const plan = planTrim(design, readRamp(design, board));
      expect(plan.status).toBe('repair');
      const first = plan.suggestions[0];
      expect(first).toMatchObject({ kind: 'repair', part: 'cRamp', method: 'replace', toFarad: design.parts.cRamp.farad });
      const after = readRamp(design, applied(design, board, first));
      expect(Math.abs(after.peakV / design.rampTargetV - 1)).toBeLessThan(0.05);
      expect(Math.abs(first.predictedPeakV / after.peakV - 1)).toBeLessThan(0.01);
    });

    it(`${design.name}: a clipped ramp (emitter resistor at 0.42x, told as fitted): the first change is predicted within 1 % of ngspice`, () => {
      // The case that drifted before V_EB, beta and the Early effect followed the current: a change of more than 2x.
      const board: Board = { fitted: { rEmitter: design.parts.rEmitter.ohm * 0.42 } };
      const before = readRamp(design, board);
      expect(before.clipped).toBe(true);
      const plan = planTrim(design, before, { fitted: board.fitted });
      const first = plan.suggestions[0];
      expect(first).toMatchObject({ kind: 'trim', part: 'rEmitter' });
      const after = readRamp(design, applied(design, board, first));
      expect(Math.abs(after.peakV / design.rampTargetV - 1)).toBeLessThan(0.05);
      expect(Math.abs(first.predictedPeakV / after.peakV - 1)).toBeLessThan(0.01);
    });

    for (const stackUp of stackUps(design)) {
      it(`${design.name}: ${stackUp.label}: a bias trim first, within 5 % of target, predicted within 1 %`, () => {
        const before = readRamp(design, stackUp.board);
        expect(Math.abs(before.peakV / design.rampTargetV - 1) * 100).toBeGreaterThan(design.tolerances.rampPeakPct);
        const series = design.parts.rEmitter.tolerancePct <= 1 ? 'E96' : 'E24';
        let plan = planTrim(design, before, { series });
        expect(plan.diagnosis.consistent).toBe(true);
        expect(plan.status).toBe('trim');
        // When the part to change could move the result by a third of the band (10 % parts), the advice says to
        // measure it first: the technician does, tells the plan, and takes its first advice then.
        const asked = plan.suggestions[0];
        if (asked.part !== 'transistor' && asked.part !== 'cRamp' && asked.reason.includes('measure it first')) {
          const measured = { [asked.part]: stackUp.board.fitted[asked.part] ?? design.parts[asked.part]?.ohm ?? NaN };
          plan = planTrim(design, before, { series, fitted: measured, measured });
        }
        const first = plan.suggestions[0];
        expect(first.kind).toBe('trim');
        const after = readRamp(design, applied(design, stackUp.board, first));
        // Issue 11: within 5 % of the target, and the plan's own prediction within 1 % of ngspice.
        expect(Math.abs(after.peakV / design.rampTargetV - 1)).toBeLessThan(0.05);
        expect(Math.abs(first.predictedPeakV / after.peakV - 1)).toBeLessThan(0.01);
        expect(after.clipped).toBe(false);
      });
    }
  }
});
