/**
 * The demo: a unit commissioned from start to sign-off on the virtual board, through the same contract the
 * screens use. The board's ramp capacitor is 30 % low, so its ramp is tall and steep; the usual bench cure is a
 * select-on-test emitter resistor, so the trim plan's first suggestion is fitted to the virtual board and the
 * ramp re-checked. Runs faster than real time (the virtual
 * board is pumped, not paced). Our own scenario: an invented unit serial on one of the example designs.
 */
import { controlRangeOf } from '../../app/board/controlRange';
import { controlForAlpha } from '../../app/board/firingAngle';
import { BenchCallError, createBenchClient, type BenchClient, type CommissioningStep, type SessionRow, type SignOffGate, type StepReport, type TrimPlanView } from '../../app/contract';
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
  trimPlan: TrimPlanView;
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
  const run = (seconds: number) => {
    const virtual = context.service.virtual();
    if (!virtual) throw new Error('the virtual board is not connected');
    virtual.pump(seconds);
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

  // 1. sync, 2. ramp (short: the wrong emitter resistor).
  await record('sync');
  const rampBefore = await record('ramp');

  // 3. trim: plan, fit the first suggestion, re-check the ramp.
  const trimPlan = await client.trimPlan({ series: 'E24' });
  const first = trimPlan.suggestions[0];
  if (first) {
    await client.applyTrim({ part: first.part, fromOhm: first.fromOhm, toOhm: first.toOhm, method: first.method, addOhm: first.addOhm, reason: first.reason, alsoChange: first.alsoChange ? { part: first.alsoChange.part, fromOhm: first.alsoChange.fromOhm, toOhm: first.alsoChange.toOhm } : null });
    run(settleS);
    await record('ramp');
  } else {
    await record('trim');
  }
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
    rampPeakBeforeV: peakOf(rampBefore),
    rampVerdictBefore: rampBefore?.verdict ?? 'not-measured',
    rampPeakAfterV: peakOf(rampAfter),
    transferFit: transfer.fit ? { gainDegPerV: transfer.fit.gainDegPerV, offsetDeg: transfer.fit.offsetDeg, points: transfer.fit.points } : null,
    signOffGate: finalState.signOffGate,
    signalSeconds,
  };
}
