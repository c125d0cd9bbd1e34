/**
 * The demo: units commissioned from start to sign-off on the virtual board, through the same contract the screens
 * use. Two stories of our own, on one example design, with invented unit serials:
 * - a wrong part: the ramp capacitor is 30 % low, beyond what parts in tolerance can do, so the plan says to measure
 *   it first; the technician measures it, the plan confirms, the part is replaced with its design value, the ramp
 *   re-checked, and the unit signed off;
 * - parts that stack up: every part of the current source inside its tolerance but all to one side, so the ramp is
 *   short with no part to blame; the plan's first bias trim is fitted, the ramp re-checked, and the unit signed off.
 * Runs faster than real time (the virtual board is pumped, not paced).
 */
import { controlRangeOf } from '../../app/board/controlRange';
import { controlForAlpha } from '../../app/board/firingAngle';
import type { PartRole } from '../../app/board/design';
import { BenchCallError, createBenchClient, type BenchClient, type CommissioningStep, type SessionRow, type SignOffGate, type StepReport, type TrimPlanView, type TrimSuggestion } from '../../app/contract';
import type { BenchContext } from './benchContext';

export interface DemoOptions {
  designName?: string;
  unitSerial?: string;
  operator?: string;
  faults?: string[];
  /** Seconds of board signal per measuring pause (default 1.5: a 1 s window after a restart, plus margin). */
  settleS?: number;
  /** Seconds of the control sweep for the transfer curve (default 4). */
  sweepS?: number;
}

export interface DemoReport {
  session: SessionRow;
  designName: string;
  faults: string[];
  steps: StepReport[];
  /** The plan the change was made from (after the measured part was told, when the first advice was to measure). */
  trimPlan: TrimPlanView;
  /** The first plan, from the ramp alone. */
  firstPlan: TrimPlanView;
  /** Parts the technician measured before changing one (ohm; farad for the ramp capacitor). */
  measuredParts: Partial<Record<PartRole, number>>;
  /** The change made: the plan's first suggestion. */
  change: TrimSuggestion | null;
  rampPeakBeforeV: number | null;
  rampVerdictBefore: StepReport['verdict'];
  rampPeakAfterV: number | null;
  transferFit: { gainDegPerV: number; offsetDeg: number; points: number } | null;
  /** The sign-off gate as the bench showed it before signing: with exceptions the demo closes without sign-off. */
  signOffGate: SignOffGate;
  signalSeconds: number;
}

export const demoDefaults = {
  designName: 'Charger firing board CH-50H (demo)',
  unitSerial: 'CH50H-0042',
  operator: 'Demo technician',
  faults: ['capacitor-low'],
};

/** The demo's two stories: a wrong part replaced, and parts in tolerance trimmed. */
export const demoStories: ReadonlyArray<{ unitSerial: string; faults: string[]; story: string }> = [
  { unitSerial: demoDefaults.unitSerial, faults: demoDefaults.faults, story: 'a wrong part: diagnosed, measured, replaced' },
  { unitSerial: 'CH50H-0043', faults: ['stacked-tolerances'], story: 'parts in tolerance that stack up: trimmed' },
];

/** A client over the in-process dispatch: the demo drives the bench exactly as a screen would. */
export function inProcessClient(context: BenchContext): BenchClient {
  return createBenchClient({
    invoke: (call, payload) => context.dispatch(call, payload),
    subscribe: (event, handler) => context.service.events.onEvent((name, data) => name === event && handler(data)),
  });
}

function peakOf(report: StepReport | null | undefined): number | null {
  return report?.readings.find((reading) => reading.key === 'rampPeakV')?.value ?? null;
}

export async function runCommissioningDemo(context: BenchContext, options: DemoOptions = {}): Promise<DemoReport> {
  const client = inProcessClient(context);
  const designName = options.designName ?? demoDefaults.designName;
  const faults = options.faults ?? demoDefaults.faults;
  const settleS = options.settleS ?? 1.5;
  const sweepS = options.sweepS ?? 4;
  let signalSeconds = 0;
  const virtualBoard = () => {
    const virtual = context.service.virtual();
    if (!virtual) throw new Error('the virtual board is not connected');
    return virtual;
  };
  const run = (seconds: number) => {
    virtualBoard().pump(seconds);
    signalSeconds += seconds;
  };

  const { design } = await client.getDesign({ name: designName });
  await client.startSession({ unitSerial: options.unitSerial ?? demoDefaults.unitSerial, designName, operator: options.operator ?? demoDefaults.operator, notes: 'virtual board demo' });
  const midControlV = controlForAlpha(design, 90) ?? design.rampTargetV / 2;
  await client.connect({ kind: 'virtual', designName, faults, control: { mode: 'fixed', controlV: midControlV }, seed: 42 });
  run(settleS);

  // A step the bench refuses to record (nothing measured yet) stays unrecorded: the sign-off gate then lists it.
  const record = async (step: CommissioningStep): Promise<StepReport | null> => {
    try {
      return await client.checkStep({ step });
    } catch (error) {
      if (error instanceof BenchCallError && error.code === 'not-ready') return null;
      throw error;
    }
  };

  // 1. sync, 2. ramp.
  await record('sync');
  const rampBefore = await record('ramp');

  // 3. trim: the plan; when it says a part is off, the technician measures that part first (on the virtual board
  // the meter reads the part actually fitted) and tells the plan, which then says to replace it.
  const firstPlan = await client.trimPlan({ series: 'E24' });
  let trimPlan = firstPlan;
  const measuredParts: Partial<Record<PartRole, number>> = {};
  const suspect = firstPlan.suggestions[0];
  if (suspect?.kind === 'repair' && suspect.part !== 'transistor') {
    const role = suspect.part as PartRole;
    measuredParts[role] = virtualBoard().partValue(role);
    trimPlan = await client.trimPlan({ series: 'E24', measuredParts });
  }
  const first = trimPlan.suggestions[0] ?? null;
  if (first) {
    await client.applyTrim({
      part: first.part, fromOhm: first.fromOhm, toOhm: first.toOhm, fromFarad: first.fromFarad, toFarad: first.toFarad, method: first.method, addOhm: first.addOhm, reason: first.reason,
      alsoChange: first.alsoChange ? { part: first.alsoChange.part, fromOhm: first.alsoChange.fromOhm, toOhm: first.alsoChange.toOhm } : null,
    });
    run(settleS);
    await record('ramp');
  }
  await record('trim');
  const state = await client.benchState();
  const rampAfter = state.steps.find((step) => step.step === 'ramp');

  // 4. transfer: sweep the control over the range the design allows; 5. limits from the same sweep.
  const range = controlRangeOf(design);
  await client.setVirtualControl({ mode: 'sweep', fromV: range.lowV, toV: range.highV, periodS: sweepS });
  await client.clearTransfer();
  run(sweepS + 0.5);
  await record('transfer');
  await record('limits');
  const transfer = await client.transferPoints({});
  const finalState = await client.benchState();

  // 6. sign-off, through the gate: a step missing or failing is never signed off on the technician's behalf (no
  // reason is ever written for them), so the demo then closes the session without sign-off and says why.
  const notes = 'commissioned on the virtual board';
  const session = finalState.signOffGate.clear ? await client.signOff({ notes }) : await client.stopSession({ notes });
  await client.disconnect();
  return {
    session,
    designName,
    faults,
    steps: finalState.steps,
    trimPlan,
    firstPlan,
    measuredParts,
    change: first,
    rampPeakBeforeV: peakOf(rampBefore),
    rampVerdictBefore: rampBefore?.verdict ?? 'not-measured',
    rampPeakAfterV: peakOf(rampAfter),
    transferFit: transfer.fit ? { gainDegPerV: transfer.fit.gainDegPerV, offsetDeg: transfer.fit.offsetDeg, points: transfer.fit.points } : null,
    signOffGate: finalState.signOffGate,
    signalSeconds,
  };
}

/** Both stories, one unit after the other, into the same logbook. */
export async function runDemoStories(context: BenchContext, options: Omit<DemoOptions, 'unitSerial' | 'faults'> = {}): Promise<DemoReport[]> {
  const reports: DemoReport[] = [];
  for (const story of demoStories) reports.push(await runCommissioningDemo(context, { ...options, unitSerial: story.unitSerial, faults: story.faults }));
  return reports;
}
