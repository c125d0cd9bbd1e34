/**
 * The Logbook screen's words about sharing: where this bench pushes and what waits, whether one session is in the
 * shared logbook yet, and what the times on screen mean. Words and an icon, never colour alone.
 */
import type { CallResult } from '../../app/contract';
import type { SessionRow } from '../../app/contract/records';
import { h } from '../dom/h';

/** How often the Logbook screen asks again while it is shown and the bench pushes somewhere (ms). */
export const sharingPollMs = 3000;

/** Whether the sessions table must be read again: sessions went out, or came to wait, or the reason changed. */
export function sharingMoved(before: CallResult<'sharing'> | null, now: CallResult<'sharing'>): boolean {
  return before === null || before.waiting !== now.waiting || before.problem !== now.problem || before.target !== now.target;
}

/** Where this bench pushes and how many of its finished sessions wait; null when it pushes nowhere. */
export function sharingStatus(sharing: CallResult<'sharing'> | null): HTMLElement[] | null {
  if (!sharing || sharing.target === null) return null;
  const waiting = sharing.waiting === 0 ? 'every finished session is shared' : `${sharing.waiting} finished session${sharing.waiting === 1 ? '' : 's'} not yet shared`;
  const reached = sharing.lastReachedAt ? ` · last reached ${new Date(sharing.lastReachedAt).toLocaleTimeString()}` : '';
  const parts = [h('p', {}, h('strong', {}, 'Shared logbook: '), sharing.target, ` · ${waiting}${reached}`)];
  if (sharing.problem) {
    parts.push(h('p', { class: 'sharing-problem', role: 'status' }, h('span', { 'aria-hidden': 'true' }, '⚠ '), `Not reached: ${sharing.problem}. Sessions stay recorded on this bench and are pushed when it answers.`));
  }
  return parts;
}

/** Whether a session of this bench is in the shared logbook yet: words and an icon, never colour alone. */
export function sharedCell(session: SessionRow): HTMLElement {
  if (session.sharedAt !== null) return h('span', { title: `pushed ${new Date(session.sharedAt).toLocaleString()}` }, h('span', { 'aria-hidden': 'true' }, '✓ '), 'Shared');
  if (session.status === 'open') return h('span', { class: 'muted' }, 'Recording');
  return h('span', { class: 'not-shared' }, h('span', { 'aria-hidden': 'true' }, '○ '), 'Not yet shared');
}

/** The local zone's offset from UTC, written out, so a reader knows what the times on screen mean. */
export function localTimeNote(): string {
  const minutes = -new Date().getTimezoneOffset();
  const sign = minutes < 0 ? '−' : '+';
  const two = (value: number) => String(value).padStart(2, '0');
  return `Times are local (UTC${sign}${two(Math.floor(Math.abs(minutes) / 60))}:${two(Math.abs(minutes) % 60)}); the logbook keeps them in UTC.`;
}
