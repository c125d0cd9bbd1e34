/** Messages for the technician, read out by screen readers (aria-live), gone after a while. */
import { BenchCallError } from '../../app/contract/errors';
import { h } from '../dom/h';

export type NoticeLevel = 'info' | 'warning' | 'error';

export class Notices {
  readonly element = h('div', { class: 'notices', role: 'status', 'aria-live': 'polite' });

  show(level: NoticeLevel, message: string, lifetimeMs = 7000): void {
    const notice = h('div', { class: `notice ${level}` }, h('strong', {}, level === 'info' ? '' : level === 'warning' ? 'Warning: ' : 'Problem: '), message);
    this.element.appendChild(notice);
    while (this.element.children.length > 4) this.element.firstElementChild?.remove();
    window.setTimeout(() => notice.remove(), lifetimeMs);
  }

  /** An error from a call: expected faults say what to fix; bugs say they are bugs. */
  fromError(error: unknown): void {
    if (error instanceof BenchCallError) this.show(error.expected ? 'warning' : 'error', error.message);
    else this.show('error', error instanceof Error ? error.message : String(error));
  }
}
