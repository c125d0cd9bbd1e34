/**
 * How a verdict is shown: words first, an icon as the second cue, colour (CSS class) only as the third
 * (NAMING.md: verdict colours are text plus an icon, never colour alone). DOM-free for unit tests.
 */
import type { Verdict } from '../../app/contract/readings';

export interface VerdictView {
  text: string;
  icon: string;
  className: Verdict | 'pending';
}

export function verdictView(verdict: Verdict | null | undefined): VerdictView {
  switch (verdict) {
    case 'in-tolerance':
      return { text: 'In tolerance', icon: '✓', className: 'in-tolerance' };
    case 'marginal':
      return { text: 'Marginal', icon: '!', className: 'marginal' };
    case 'out-of-tolerance':
      return { text: 'Out of tolerance', icon: '✕', className: 'out-of-tolerance' };
    default:
      return { text: 'Not checked', icon: '…', className: 'pending' };
  }
}

/** The worst of several verdicts (out beats marginal beats in); null when none are given. */
export function worstVerdict(verdicts: readonly (Verdict | null)[]): Verdict | null {
  const rank: Record<Verdict, number> = { 'in-tolerance': 0, marginal: 1, 'out-of-tolerance': 2 };
  let worst: Verdict | null = null;
  for (const verdict of verdicts) if (verdict && (worst === null || rank[verdict] > rank[worst])) worst = verdict;
  return worst;
}
