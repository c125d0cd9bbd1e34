/**
 * Verdicts as every screen, record and command shows them, and how a step's verdict follows from its readings.
 * One table of words, keyed by every state, so a state added to `Verdict` fails to compile wherever it is not shown.
 */
import type { MeasuredVerdict, Reading, Verdict } from './readings';

/** Words for each state: `text` starts a sentence, `phrase` sits inside one ("ramp peak out of tolerance"). */
export const verdictWords: Record<Verdict, { text: string; phrase: string }> = {
  'in-tolerance': { text: 'In tolerance', phrase: 'in tolerance' },
  marginal: { text: 'Marginal', phrase: 'marginal' },
  'out-of-tolerance': { text: 'Out of tolerance', phrase: 'out of tolerance' },
  'not-measured': { text: 'Not measured yet', phrase: 'not measured yet' },
};

const measuredRank: Record<MeasuredVerdict, number> = { 'in-tolerance': 0, marginal: 1, 'out-of-tolerance': 2 };

/** The worst of the verdicts measurements earned (out beats marginal beats in); null when none was earned. */
export function worstMeasuredVerdict(verdicts: ReadonlyArray<Verdict | null>): MeasuredVerdict | null {
  let worst: MeasuredVerdict | null = null;
  for (const verdict of verdicts) {
    if (verdict === null || verdict === 'not-measured') continue;
    if (worst === null || measuredRank[verdict] > measuredRank[worst]) worst = verdict;
  }
  return worst;
}

/**
 * A step's verdict: "not measured yet" while any of its checks lacks its measurement (or it carries no check at
 * all), else the worst verdict its checks earned. Readings for information (verdict null) never count.
 */
export function stepVerdictOf(readings: ReadonlyArray<Pick<Reading, 'verdict'>>): Verdict {
  const checks = readings.map((reading) => reading.verdict).filter((verdict): verdict is Verdict => verdict !== null);
  if (checks.length === 0 || checks.includes('not-measured')) return 'not-measured';
  return worstMeasuredVerdict(checks) ?? 'not-measured';
}

/** True for the two verdicts that lie within the tolerance. */
export function withinTolerance(verdict: Verdict | null): boolean {
  return verdict === 'in-tolerance' || verdict === 'marginal';
}
