/**
 * What the step list shows: for each commissioning step the live readings while measuring, or the recorded ones
 * once the step was checked and nothing newer is coming in. DOM-free for unit tests.
 */
import { commissioningStepNames, commissioningStepTitles, type CommissioningStep, type Reading, type StepReport } from '../../app/contract/readings';

export interface StepRow {
  step: CommissioningStep;
  report: StepReport;
  /** True when the step has been checked and recorded in the session. */
  recorded: boolean;
}

/** The steps' titles: one table for every screen, record and command (app/contract/readings.ts). */
export const stepTitles: Record<CommissioningStep, string> = commissioningStepTitles;

export function mergeSteps(recorded: readonly StepReport[], live: readonly StepReport[]): StepRow[] {
  return commissioningStepNames.map((step) => {
    const done = recorded.find((report) => report.step === step) ?? null;
    const current = live.find((report) => report.step === step) ?? null;
    const recordedDone = done !== null && done.status === 'done';
    // Live readings win while they have data: the technician watches the board change as they trim.
    const report = current && current.readings.length > 0 ? { ...current, status: recordedDone ? ('done' as const) : current.status } : (done ?? current ?? { step, status: 'waiting' as const, verdict: 'not-measured' as const, readings: [], cycles: 0, note: null });
    return { step, report, recorded: recordedDone };
  });
}

/** The first reading found under any of `keys`, searching every step. */
export function pickReading(steps: readonly StepReport[], keys: readonly string[]): Reading | null {
  for (const key of keys) {
    for (const report of steps) {
      const reading = report.readings.find((candidate) => candidate.key === key);
      if (reading) return reading;
    }
  }
  return null;
}

/** "design 6 V, 5.82 – 6.18 V" style text for a reading's expectation, or null when the design asks nothing. */
export function designText(reading: Reading, format: (value: number | null) => string): string | null {
  if (reading.expected === null && reading.low === null && reading.high === null) return null;
  const parts: string[] = [];
  if (reading.expected !== null) parts.push(`design ${format(reading.expected)}`);
  if (reading.low !== null && reading.high !== null) parts.push(`${format(reading.low)} to ${format(reading.high)}`);
  else if (reading.low !== null) parts.push(`at least ${format(reading.low)}`);
  else if (reading.high !== null) parts.push(`at most ${format(reading.high)}`);
  return parts.join(', ');
}

/**
 * The words that stand for a judged check's value when it has no number: "yes"/"no" for a yes/no check, "recorded"
 * for a step on the sign-off card (the note carries them); null when the number (or a dash) is the value.
 */
export function wordedValue(reading: Reading): string | null {
  return reading.value === null && reading.unit === '' && reading.verdict !== null && reading.note ? reading.note : null;
}
