/**
 * The commissioning steps of NAMING.md as plain functions: which readings belong to which step, each judged
 * against the design by app/bench (judgeReadings), and the step's state (waiting for data, measuring, done).
 * No transport, no timers: the session service calls these with what the pipeline has measured.
 */
import type { BoardDesign } from '../../app/board/design';
import { predictRamp } from '../../app/board/rampModel';
import { controlLimitsOf } from '../../app/board/controlDivider';
import { alphaForControl } from '../../app/board/firingAngle';
import { judgeReadings, type ReadingCheck } from '../../app/bench/judge';
import type { CaptureReadings, TransferSummary } from '../../app/bench/readings';
import { averageOutputV } from '../../app/power/rectifierOutput';
import { commissioningStepNames, type CommissioningStep, type Reading, type StepReport, type Verdict } from '../../app/contract';
import type { AlphaExtremes } from './benchPipeline';

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

const verdictRank: Record<Verdict, number> = { 'in-tolerance': 0, marginal: 1, 'out-of-tolerance': 2 };

export function worstVerdict(verdicts: ReadonlyArray<Verdict | null>): Verdict | null {
  let worst: Verdict | null = null;
  for (const verdict of verdicts) if (verdict && (worst === null || verdictRank[verdict] > verdictRank[worst])) worst = verdict;
  return worst;
}

/** A judged check as the screens show it: the band is the expected value plus or minus the tolerance, or a limit. */
export function readingFromCheck(check: ReadingCheck): Reading {
  const value = typeof check.measured === 'number' ? check.measured : null;
  const expected = typeof check.expected === 'number' ? check.expected : null;
  let low: number | null = null;
  let high: number | null = null;
  if (expected !== null && check.toleranceAbs !== null) {
    if (check.limit === 'at-most') high = expected + check.toleranceAbs;
    else if (check.limit === 'at-least') low = expected - check.toleranceAbs;
    else {
      low = expected - check.toleranceAbs;
      high = expected + check.toleranceAbs;
    }
  }
  let note = check.note;
  if (typeof check.measured === 'boolean') note = check.note ?? (check.measured ? 'yes' : 'no');
  return { key: check.key, label: check.label, unit: check.unit, value, expected, low, high, verdict: check.verdict, note };
}

/** A reading shown for information, without a verdict. */
export function infoReading(key: string, label: string, unit: string, value: number | null, expected: number | null = null, note: string | null = null): Reading {
  return { key, label, unit, value, expected, low: null, high: null, verdict: null, note };
}

function report(step: CommissioningStep, readings: Reading[], cycles: number, note: string | null, waiting: boolean): StepReport {
  return { step, status: waiting ? 'waiting' : 'measuring', verdict: waiting ? null : worstVerdict(readings.map((reading) => reading.verdict)), readings, cycles, note };
}

function pick(checks: readonly ReadingCheck[], keys: readonly string[]): Reading[] {
  return keys.flatMap((key) => checks.filter((check) => check.key === key).map(readingFromCheck));
}

/** Live reports of every step, before what `checkStep` recorded is laid over them. */
export function measureSteps(inputs: StepInputs): Record<CommissioningStep, StepReport> {
  const { design, window } = inputs;
  const cycles = window?.cycles ?? 0;
  const waiting = window === null || window.firingIntervals === 0;
  const prediction = predictRamp(design);
  const windowChecks = window ? judgeReadings(window, design) : [];

  const sync = report(
    'sync',
    [...pick(windowChecks, ['frequencyHz']), infoReading('periodJitterUs', 'Period jitter', 'us', window?.periodJitterUs ?? null), infoReading('syncAmplitudeV', 'Sync amplitude', 'V', window?.syncAmplitudeV ?? null), infoReading('gaps', 'Gaps in the samples', '', window ? window.gaps : null)],
    cycles,
    waiting ? 'waiting for sync zero crossings' : null,
    window === null || window.cycles === 0,
  );

  const rampReadings = [
    ...pick(windowChecks, ['rampPeakV', 'rampStartDelayDeg', 'rampClipped', 'rampPeakBalanceV']),
    infoReading('slopeVPerMs', 'Ramp slope', 'V/ms', window?.ramp.slopeVPerMs ?? null, prediction.slopeVPerS / 1000),
    infoReading('rampFloorV', 'Ramp floor', 'V', window?.ramp.floorV ?? null, prediction.floorV),
    infoReading('nonlinearityPct', 'Ramp nonlinearity', '%', window?.ramp.nonlinearityPct ?? null),
  ];
  const ramp = report('ramp', rampReadings, cycles, inputs.recheckNeeded ? 'a part was changed: check the ramp again' : null, waiting || window?.ramp.chargingIntervals === 0);

  const peak = rampReadings.find((reading) => reading.key === 'rampPeakV');
  const trimNeeded = peak?.verdict === 'out-of-tolerance' || peak?.verdict === 'marginal' || ramp.verdict === 'out-of-tolerance';
  const trimNote = waiting ? null : inputs.recheckNeeded ? 're-check the ramp after the change you fitted' : trimNeeded ? 'the ramp misses its target: open the trim plan' : 'the ramp is on target: no trim needed';
  const trim = report('trim', [...(peak ? [{ ...peak, label: 'Ramp peak against its target' }] : []), infoReading('trimsApplied', 'Changes fitted this session', '', inputs.trimsApplied)], cycles, trimNote, waiting);
  if (!waiting && inputs.recheckNeeded) trim.verdict = null;

  let transfer: StepReport;
  if (inputs.transferFit && window) {
    const checks = judgeReadings({ ...window, transfer: inputs.transferFit }, design);
    transfer = report(
      'transfer',
      [
        ...pick(checks, ['alphaAtControlLowDeg', 'alphaAtControlHighDeg']),
        infoReading('gainDegPerV', 'Transfer gain', 'deg/V', inputs.transferFit.gainDegPerV),
        infoReading('offsetDeg', 'Transfer offset', 'deg', inputs.transferFit.offsetDeg),
        infoReading('maxDeviationDeg', 'Largest deviation from a line', 'deg', inputs.transferFit.maxDeviationDeg),
        infoReading('controlMinV', 'Control swept from', 'V', inputs.transferFit.controlMinV),
        infoReading('controlMaxV', 'Control swept to', 'V', inputs.transferFit.controlMaxV),
      ],
      inputs.transferFit.points,
      null,
      false,
    );
  } else {
    transfer = report('transfer', pick(windowChecks, ['alphaDeg']), cycles, 'sweep the control voltage over its range to record the transfer curve', true);
  }

  let limitChecks: ReadingCheck[] = [];
  if (window) {
    const swept = inputs.extremes.cycles > 0 ? { alphaMinDeg: inputs.extremes.alphaMinDeg, alphaMaxDeg: inputs.extremes.alphaMaxDeg } : {};
    limitChecks = judgeReadings({ ...window, pulse: { ...window.pulse, ...swept } }, design);
  }
  const limits = report(
    'limits',
    [...pick(limitChecks, ['alphaMaxDeg', 'alphaMinDeg', 'alphaBalanceDeg', 'pulseWidthUs', 'pulseLatchUs', 'wrongHalfCyclePulses', 'missingPulses', 'multiplePulses']), ...loadReadings(design, limitChecks)],
    cycles,
    waiting ? null : 'turn the control to both ends so the largest and smallest alpha are seen',
    waiting,
  );

  const earlier = [sync, ramp, trim, transfer, limits];
  const signOff = report(
    'sign-off',
    earlier.map((step) => {
      const shown = inputs.recorded[step.step] ?? step;
      return { key: `${step.step}Verdict`, label: `Step: ${step.step}`, unit: '', value: null, expected: null, low: null, high: null, verdict: shown.verdict, note: inputs.recorded[step.step] ? 'recorded' : 'not recorded yet' };
    }),
    cycles,
    inputs.signedOff ? 'signed off' : null,
    false,
  );
  return { sync, ramp, trim, transfer, limits, 'sign-off': signOff };
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

/** The recorded form of a step: its live report marked done. Refused while there is nothing to record. */
export function recordStep(live: StepReport): StepReport | null {
  if (live.status === 'waiting') return null;
  return { ...live, status: 'done' };
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

/**
 * What the measured alpha range means at the load, when the design names it: the average load voltage at the
 * smallest and largest alpha (resistive load, app/power/rectifierOutput.ts), for information.
 */
function loadReadings(design: BoardDesign, limitChecks: readonly ReadingCheck[]): Reading[] {
  const load = design.load;
  if (!load) return [];
  const measured = (key: string): number | null => {
    const value = limitChecks.find((check) => check.key === key)?.measured;
    return typeof value === 'number' ? value : null;
  };
  const outputAt = (alphaDeg: number | null): number | null => (alphaDeg === null ? null : averageOutputV(design.rectifier, load.mainsRmsV, alphaDeg));
  const note = load.henry > 0 ? 'resistive-load formula; an inductive load conducting past the zero crossing gives less' : null;
  return [
    infoReading('loadAtAlphaMinV', 'Average load voltage at the smallest alpha', 'V', outputAt(measured('alphaMinDeg')), outputAt(design.alphaMinDeg), note),
    infoReading('loadAtAlphaMaxV', 'Average load voltage at the largest alpha', 'V', outputAt(measured('alphaMaxDeg')), outputAt(design.alphaMaxDeg), note),
  ];
}
