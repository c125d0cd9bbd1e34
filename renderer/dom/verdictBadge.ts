/** A verdict as text plus icon, with the words also read by screen readers. */
import type { Verdict } from '../../app/contract/readings';
import { verdictView } from '../shaping/verdictView';
import { h } from './h';

export function verdictBadge(verdict: Verdict): HTMLElement {
  const view = verdictView(verdict);
  return h('span', { class: `verdict ${view.className}`, 'data-verdict': view.className }, h('span', { class: 'icon', 'aria-hidden': 'true' }, view.icon), view.text);
}
