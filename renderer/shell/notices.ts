/**
 * Messages for the technician, read out by screen readers (aria-live), gone after a while or at once with their
 * close button. While any is shown the page keeps room for them at its foot, so scrolled to the end nothing of the
 * screen (a Stop button, a table's last columns) stays hidden under them.
 */
import { BenchCallError } from '../../app/contract/errors';
import { h } from '../dom/h';

export type NoticeLevel = 'info' | 'warning' | 'error';

export class Notices {
  readonly element = h('div', { class: 'notices', role: 'status', 'aria-live': 'polite' });

  show(level: NoticeLevel, message: string, lifetimeMs = 7000): void {
    const close = h('button', { class: 'notice-close', type: 'button', 'aria-label': 'Dismiss this message', title: 'Dismiss' }, '×');
    const notice = h('div', { class: `notice ${level}` }, h('span', {}, h('strong', {}, level === 'info' ? '' : level === 'warning' ? 'Warning: ' : 'Problem: '), message), close);
    const remove = (): void => {
      notice.remove();
      this.keepRoom();
    };
    close.addEventListener('click', remove);
    this.element.appendChild(notice);
    while (this.element.children.length > 4) this.element.firstElementChild?.remove();
    this.keepRoom();
    window.setTimeout(remove, lifetimeMs);
  }

  /** Room at the page's foot as tall as the messages shown (none when there are none). */
  private keepRoom(): void {
    const shown = this.element.children.length > 0;
    document.body.style.paddingBottom = shown ? `${this.element.getBoundingClientRect().height + 24}px` : '';
  }

  /** An error from a call: expected faults say what to fix; bugs say they are bugs. */
  fromError(error: unknown): void {
    if (error instanceof BenchCallError) this.show(error.expected ? 'warning' : 'error', error.message);
    else this.show('error', error instanceof Error ? error.message : String(error));
  }
}
