/**
 * How a verdict is shown: words first, an icon as the second cue, colour (CSS class) only as the third
 * (NAMING.md: verdict colours are text plus an icon, never colour alone). "Not measured yet" has neither tick nor
 * cross. A reading for information has no verdict and gets no badge. DOM-free for unit tests.
 */
import type { Verdict } from '../../app/contract/readings';
import { verdictWords } from '../../app/contract/verdicts';

export interface VerdictView {
  text: string;
  icon: string;
  className: Verdict;
}

const icons: Record<Verdict, string> = { 'in-tolerance': '✓', marginal: '!', 'out-of-tolerance': '✕', 'not-measured': '–' };

export function verdictView(verdict: Verdict): VerdictView {
  return { text: verdictWords[verdict].text, icon: icons[verdict], className: verdict };
}
