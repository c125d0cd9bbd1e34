/**
 * The commissioning steps of NAMING.md as plain functions: which readings belong to which step, each judged
 * against the design by app/bench (judgeReadings), and the step's state (waiting for data, measuring, done).
 * A step gives a verdict only once its own measurement exists; until then it is "not measured yet".
 * No transport, no timers: the session service calls these with what the pipeline has measured.
 */
import { controlLimitsOf } from '../../app/board/controlDivider';
import { controlRangeOf } from '../../app/board/controlRange';
import type { BoardDesign } from '../../app/board/design';
import { alphaForControl } from '../../app/board/firingAngle';
import { predictRamp } from '../../app/board/rampModel';
import { judgeReadings } from '../../app/bench/judge';
import type { CaptureReadings, TransferSummary } from '../../app/bench/readings';
import { signOffExceptionText, signOffGateOf, stepsBeforeSignOff } from '../../app/bench/signOffGate';
import { commissioningStepNames, commissioningStepTitles, type CommissioningStep, type Reading, type StepReport } from '../../app/contract';
import type { AlphaExtremes } from './benchPipeline';
import { infoReading, pickChecks, stepReport } from './stepReadings';
import { limitsStep, transferStep } from './sweepSteps';

export { infoReading, readingFromCheck } from './stepReadings';

export interface StepInputs {
  design: BoardDesign;
  /** Readings of the last complete window (null before the first). */
  window: CaptureReadings | null;
  transferFit: TransferSummary | null;
  extremes: AlphaExtremes;
  /** Reports recorded by `checkStep` in this session. */
  recorded: Partial<Record<CommissioningStep, StepReport>>;
  /** A trim was fitted and the ramp not checked since. */
  recheckNeeded: boolean;
  trimsApplied: number;
  signedOff: boolean;
}

/** Live reports of every step, before what `checkStep` recorded is laid over them. */
export function measureSteps(inputs: StepInputs): Record<CommissioningStep, StepReport> {
  const { design, window } = inputs;
  const cycles = window?.cycles ?? 0;
  const waiting = window === null || window.firingIntervals === 0;
  const prediction = predictRamp(design);
  const windowChecks = window ? judgeReadings(window, design) : [];

  const sync = stepReport(
    'sync',
    [...pickChecks(windowChecks, ['frequencyHz']), infoReading('periodJitterUs', 'Period jitter', 'us', window?.periodJitterUs ?? null), infoReading('syncAmplitudeV', 'Sync amplitude', 'V', window?.syncAmplitudeV ?? null), infoReading('gaps', 'Gaps in the samples', '', window ? window.gaps : null)],
    cycles,
    waiting ? 'waiting for sync zero crossings' : null,
    window === null || window.cycles === 0,
  );

  const rampReadings = [
    ...pickChecks(windowChecks, ['rampPeakV', 'rampStartDelayDeg', 'rampClipped', 'rampPeakBalanceV']),
    infoReading('slopeVPerMs', 'Ramp slope', 'V/ms', window?.ramp.slopeVPerMs ?? null, prediction.slopeVPerS / 1000),
    infoReading('rampFloorV', 'Ramp floor', 'V', window?.ramp.floorV ?? null, prediction.floorV),
    infoReading('nonlinearityPct', 'Ramp nonlinearity', '%', window?.ramp.nonlinearityPct ?? null),
    // Jitter only while the control is held: a window whose control moved has a transfer line, and its alpha spread
    // is the sweep's, not jitter.
    infoReading('alphaJitterDeg', 'Firing jitter at a held control', 'deg', window && window.transfer === null ? window.pulse.alphaStdDeg : null, null, window?.transfer ? 'the control is moving: no jitter reading while it does' : null),
  ];
  const ramp = stepReport('ramp', rampReadings, cycles, inputs.recheckNeeded ? 'a part was changed: check the ramp again' : null, waiting || window?.ramp.chargingIntervals === 0);

  const peak = rampReadings.find((reading) => reading.key === 'rampPeakV');
  const trimNeeded = peak?.verdict === 'out-of-tolerance' || peak?.verdict === 'marginal' || ramp.verdict === 'out-of-tolerance';
  const trimNote = waiting ? null : inputs.recheckNeeded ? 're-check the ramp after the change you fitted' : trimNeeded ? 'the ramp misses its target: open the trim plan' : 'the ramp is on target: no trim needed';
  const trim = stepReport('trim', [...(peak ? [{ ...peak, label: 'Ramp peak against its target' }] : []), infoReading('trimsApplied', 'Changes fitted this session', '', inputs.trimsApplied)], cycles, trimNote, waiting);
  // After a fitted change the trim step waits for the ramp's re-check: the readings are of the changed board.
  if (!waiting && inputs.recheckNeeded) trim.verdict = 'not-measured';

  const range = controlRangeOf(design, { prediction });
  const transfer = transferStep(design, window, inputs.transferFit, range);
  const limits = limitsStep(design, window, inputs.extremes, range);

  const earlier = { sync, ramp, trim, transfer, limits };
  const gate = signOffGateOf(inputs.recorded);
  const signOffReadings: Reading[] = stepsBeforeSignOff.map((step) => {
    const recorded = inputs.recorded[step];
    return { key: `${step}Verdict`, label: commissioningStepTitles[step], unit: '', value: null, expected: null, low: null, high: null, verdict: recorded?.verdict ?? 'not-measured', note: recorded ? 'recorded' : 'not recorded' };
  });
  const gateNote = inputs.signedOff ? 'signed off' : gate.clear ? 'every step is recorded and within tolerance: ready to sign off' : `to sign off now needs a written reason for: ${gate.exceptions.map(signOffExceptionText).join('; ')}`;
  const signOff = stepReport('sign-off', signOffReadings, cycles, gateNote, false);
  return { ...earlier, 'sign-off': signOff };
}

/** What the screens see: recorded steps stay done, except the ramp and trim after a part was changed. */
export function stepReports(inputs: StepInputs): StepReport[] {
  const live = measureSteps(inputs);
  return commissioningStepNames.map((step) => {
    const recorded = inputs.recorded[step];
    const invalidated = inputs.recheckNeeded && (step === 'ramp' || step === 'trim');
    if (step === 'sign-off' && inputs.signedOff && recorded) return recorded;
    if (recorded && !invalidated && step !== 'sign-off') return recorded;
    return live[step];
  });
}

/** The step to work on next: the first one not recorded (or invalidated by a fitted change). */
export function currentStepOf(inputs: Pick<StepInputs, 'recorded' | 'recheckNeeded' | 'signedOff'>): CommissioningStep {
  if (inputs.recheckNeeded) return 'ramp';
  return commissioningStepNames.find((step) => !inputs.recorded[step]) ?? 'sign-off';
}

/**
 * The recorded form of a step: its live report marked done. Refused, with the reason in words, while the step has
 * nothing to record or its checks lack their measurement (a step is never recorded before it was measured).
 */
export function recordStep(live: StepReport): { recorded: StepReport } | { refused: string } {
  const title = commissioningStepTitles[live.step].toLowerCase();
  if (live.status === 'waiting') return { refused: `nothing measured for the step "${title}" yet: wait for readings${live.note ? ` (${live.note})` : ''}` };
  if (live.verdict === 'not-measured') {
    const missing = live.readings.filter((reading) => reading.verdict === 'not-measured').map((reading) => reading.label);
    return { refused: `the step "${title}" is not measured yet${missing.length > 0 ? ` (${missing.join(', ')})` : ''}${live.note ? `: ${live.note}` : ''}` };
  }
  return { recorded: { ...live, status: 'done' } };
}

/** The design's transfer curve from the board model, over the control pot's range (for drawing the ideal line). */
export function idealTransfer(design: BoardDesign, points = 40): Array<{ t: number; controlV: number; alphaDeg: number }> {
  const prediction = predictRamp(design);
  const { controlMaxV } = controlLimitsOf(design, { prediction });
  const line: Array<{ t: number; controlV: number; alphaDeg: number }> = [];
  for (let index = 0; index <= points; index++) {
    const controlV = prediction.floorV + ((controlMaxV - prediction.floorV) * index) / points;
    const alphaDeg = alphaForControl(design, controlV, { prediction });
    if (alphaDeg !== null) line.push({ t: 0, controlV, alphaDeg });
  }
  return line;
}
