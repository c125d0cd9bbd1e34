/**
 * Sessions signed off before the logbook kept sign-offs (logbook schema 2, archives without `signOff`) ended as
 * plain "closed" with the sign-off step among their recorded steps, whatever their verdicts were. They are
 * classified from those recorded steps by the sign-off gate's own rule, as logbook migration 3 does in SQL
 * (main/store/schema.ts): every step recorded and within tolerance is "signed off"; anything else is "signed off
 * with exceptions" with a reason saying that none was asked for. Used on import, so an archive written before
 * sign-offs were kept lands in the logbook as the upgraded logbook holds the same session.
 */
import { signOffExceptions } from '../bench/signOffGate';
import { parseStepReports, type CommissioningStep, type StepReport } from '../contract/readings';
import type { SignOffException } from '../contract/records';

/** The reason kept for such a session (the same words as logbook migration 3). */
export const legacySignOffReason =
  'No reason was written: this session was signed off before Rampwright checked the steps at sign-off; the exceptions were found from its recorded steps when the logbook was upgraded.';

export type LegacySignOff = { kind: 'signed-off' } | { kind: 'signed-off-with-exceptions'; reason: string; exceptions: SignOffException[] };

/** The sign-off a closed session's recorded steps imply, or null when they do not include the sign-off step. */
export function legacySignOffOf(stepsJson: string | null | undefined): LegacySignOff | null {
  const steps = parseStepReports(stepsJson ?? null);
  if (!steps || !steps.some((report) => report.step === 'sign-off')) return null;
  const recorded: Partial<Record<CommissioningStep, StepReport>> = {};
  for (const report of steps) recorded[report.step] = report;
  const exceptions = signOffExceptions(recorded);
  return exceptions.length === 0 ? { kind: 'signed-off' } : { kind: 'signed-off-with-exceptions', reason: legacySignOffReason, exceptions };
}
