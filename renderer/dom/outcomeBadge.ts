/** A session's outcome in words with an icon; a sign-off with exceptions stands out (never colour alone). */
import { outcomeWords, type SessionOutcome } from '../../app/contract/records';
import { h } from './h';

export function outcomeBadge(outcome: SessionOutcome): HTMLElement {
  const icon = outcome === 'signed-off' ? '✓' : outcome === 'signed-off-with-exceptions' ? '⚠' : '–';
  return h('span', { class: `outcome ${outcome}` }, h('span', { 'aria-hidden': 'true' }, `${icon} `), outcomeWords[outcome].text);
}
