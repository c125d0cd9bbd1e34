/**
 * The pieces a step report is built from: a judged check in the contract's reading shape, a reading shown for
 * information, and the report itself, whose verdict follows from its checks (app/contract/verdicts.ts).
 */
import type { ReadingCheck } from '../../app/bench/judge';
import { stepVerdictOf, type CommissioningStep, type Reading, type StepReport } from '../../app/contract';

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

/** A step's report: while waiting it has no verdict to give ("not measured yet"); otherwise its checks decide. */
export function stepReport(step: CommissioningStep, readings: Reading[], cycles: number, note: string | null, waiting: boolean): StepReport {
  return { step, status: waiting ? 'waiting' : 'measuring', verdict: waiting ? 'not-measured' : stepVerdictOf(readings), readings, cycles, note };
}

/** The checks under these keys, in this order, as readings. */
export function pickChecks(checks: readonly ReadingCheck[], keys: readonly string[]): Reading[] {
  return keys.flatMap((key) => checks.filter((check) => check.key === key).map(readingFromCheck));
}
