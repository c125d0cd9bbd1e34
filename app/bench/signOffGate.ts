/**
 * The sign-off gate: a unit is signed off at once only when every commissioning step is recorded and each step's
 * verdict lies within tolerance (in tolerance or marginal: marginal is inside the band, and the record shows it).
 * Anything else is an exception: a step not recorded, recorded without its measurement, or out of tolerance. With
 * exceptions the session can only be signed off "with exceptions", carrying a written reason the record prints.
 * The session service applies it at sign-off (the screens show the same list beforehand), so no client can skip it.
 */
import { commissioningStepTitles, type CommissioningStep, type StepReport } from '../contract/readings';
import type { SignOffException, SignOffGate } from '../contract/records';
import { verdictWords, withinTolerance } from '../contract/verdicts';

/** The steps a sign-off stands on, in bench order. */
export const stepsBeforeSignOff: readonly Exclude<CommissioningStep, 'sign-off'>[] = ['sync', 'ramp', 'trim', 'transfer', 'limits'];

/**
 * Shortest reason accepted, in characters, and fewest words (our rule: long enough to say what was excepted and
 * why, e.g. "limits checked on the customer's controller", so a lone "ok" or "n/a" cannot pass).
 */
export const reasonMinimumCharacters = 20;
export const reasonMinimumWords = 3;

export function signOffExceptions(recorded: Partial<Record<CommissioningStep, Pick<StepReport, 'verdict' | 'readings'>>>): SignOffException[] {
  const exceptions: SignOffException[] = [];
  for (const step of stepsBeforeSignOff) {
    const report = recorded[step];
    if (!report) {
      exceptions.push({ step, problem: 'not-recorded', readings: [] });
    } else if (report.verdict === 'not-measured') {
      exceptions.push({ step, problem: 'not-measured', readings: report.readings.filter((reading) => reading.verdict === 'not-measured').map((reading) => reading.label) });
    } else if (!withinTolerance(report.verdict)) {
      exceptions.push({ step, problem: 'out-of-tolerance', readings: report.readings.filter((reading) => reading.verdict === 'out-of-tolerance').map((reading) => reading.label) });
    }
  }
  return exceptions;
}

export function signOffGateOf(recorded: Partial<Record<CommissioningStep, Pick<StepReport, 'verdict' | 'readings'>>>): SignOffGate {
  const exceptions = signOffExceptions(recorded);
  return { clear: exceptions.length === 0, exceptions, reasonMinimumCharacters };
}

/** One exception in words, e.g. "Check limits and pulses: out of tolerance (Smallest alpha)". */
export function signOffExceptionText(exception: SignOffException): string {
  const what = exception.problem === 'not-recorded' ? 'not recorded' : verdictWords[exception.problem].phrase;
  return `${commissioningStepTitles[exception.step]}: ${what}${exception.readings.length > 0 ? ` (${exception.readings.join(', ')})` : ''}`;
}

/** The reason as it is kept: trimmed, runs of white space as one space. */
export function normalisedReason(reason: string): string {
  return reason.trim().replace(/\s+/g, ' ');
}

/** What is wrong with a written reason, or null when it will do. */
export function reasonProblem(reason: string): string | null {
  const text = normalisedReason(reason);
  if (text === '') return 'write why the unit is signed off with these exceptions';
  if (text.length < reasonMinimumCharacters || text.split(' ').length < reasonMinimumWords) {
    return `the reason must say what was excepted and why, in at least ${reasonMinimumWords} words and ${reasonMinimumCharacters} characters (got "${text}")`;
  }
  return null;
}
