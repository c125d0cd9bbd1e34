/**
 * The demo: a unit commissioned from start to sign-off on the virtual board, through the same contract the
 * screens use. The board's ramp capacitor is 30 % low, so its ramp is tall and steep; the usual bench cure is a
 * select-on-test emitter resistor, so the trim plan's first suggestion is fitted to the virtual board and the
 * ramp re-checked. Runs faster than real time (the virtual
 * board is pumped, not paced). Our own scenario: an invented unit serial on one of the example designs.
 */
import { controlForAlpha } from '../../app/board/firingAngle';
import { controlLimitsOf } from '../../app/board/controlDivider';
import { predictRamp } from '../../app/board/rampModel';
import { createBenchClient, type BenchClient, type SessionRow, type StepReport, type TrimPlanView } from '../../app/contract';
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

function peakOf(report: StepReport | undefined): number | null {
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

  // 1. sync, 2. ramp (short: the wrong emitter resistor).
  await client.checkStep({ step: 'sync' });
  const rampBefore = await client.checkStep({ step: 'ramp' });

  // 3. trim: plan, fit the first suggestion, re-check the ramp.
  const trimPlan = await client.trimPlan({ series: 'E24' });
  const first = trimPlan.suggestions[0];
  if (first) {
    await client.applyTrim({ part: first.part, fromOhm: first.fromOhm, toOhm: first.toOhm, method: first.method, addOhm: first.addOhm, reason: first.reason, alsoChange: first.alsoChange ? { part: first.alsoChange.part, fromOhm: first.alsoChange.fromOhm, toOhm: first.alsoChange.toOhm } : null });
    run(settleS);
    await client.checkStep({ step: 'ramp' });
  } else {
    await client.checkStep({ step: 'trim' });
  }
  const state = await client.benchState();
  const rampAfter = state.steps.find((step) => step.step === 'ramp');

  // 4. transfer: sweep the control over the pot's range, floor to top; 5. limits from the same sweep.
  const prediction = predictRamp(design);
  const { controlMaxV } = controlLimitsOf(design, { prediction });
  const fromV = prediction.floorV + 0.05 * (controlMaxV - prediction.floorV);
  await client.setVirtualControl({ mode: 'sweep', fromV, toV: controlMaxV, periodS: sweepS });
  await client.clearTransfer();
  run(sweepS + 0.5);
  await client.checkStep({ step: 'transfer' });
  await client.checkStep({ step: 'limits' });
  const transfer = await client.transferPoints({});
  const finalState = await client.benchState();

  // 6. sign-off.
  const session = await client.signOff({ notes: 'commissioned on the virtual board' });
  await client.disconnect();
  return {
    session,
    designName,
    faults,
    steps: finalState.steps,
    trimPlan,
    rampPeakBeforeV: peakOf(rampBefore),
    rampVerdictBefore: rampBefore.verdict,
    rampPeakAfterV: peakOf(rampAfter),
    transferFit: transfer.fit ? { gainDegPerV: transfer.fit.gainDegPerV, offsetDeg: transfer.fit.offsetDeg, points: transfer.fit.points } : null,
    signalSeconds,
  };
}
