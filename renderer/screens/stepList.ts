/**
 * The commissioning steps down one side of the Bench screen: each with its readings against the design, a verdict
 * as text plus icon, and the action that records it. The selected step is marked for eyes and screen readers.
 */
import type { CommissioningStep, Reading } from '../../app/contract/readings';
import { h, fill } from '../dom/h';
import { verdictBadge } from '../dom/verdictBadge';
import { formatReading } from '../shaping/formatSi';
import { designText, stepTitles, wordedValue, type StepRow } from '../shaping/stepView';

export interface StepActions {
  check(step: CommissioningStep, button: HTMLButtonElement): void;
  open(step: CommissioningStep): void;
  select(step: CommissioningStep): void;
}

const statusWords = { waiting: 'Waiting for signal', measuring: 'Measuring', done: 'Recorded' } as const;

/** What a waiting step waits for: the signal, or (the signal there) what the technician has to do. */
function statusText(step: CommissioningStep, report: StepRow['report']): string {
  if (report.status === 'waiting' && report.cycles > 0) return step === 'transfer' ? 'Waiting for a control sweep' : 'Waiting for readings';
  return statusWords[report.status];
}

interface StepElements {
  item: HTMLLIElement;
  verdict: HTMLElement;
  status: HTMLElement;
  recheck: HTMLElement;
  readings: HTMLElement;
  note: HTMLElement;
  actions: HTMLElement;
  /** What the actions were built for; rebuilt only when it changes, so a button never moves under a pointer. */
  actionsKey: string;
}

export class StepList {
  readonly element = h('ol', { class: 'steps', 'aria-label': 'Commissioning steps' });
  private readonly items = new Map<CommissioningStep, StepElements>();
  private shownSelected: CommissioningStep | null = null;

  constructor(private readonly actions: StepActions) {}

  /** Updates the list in place: text and readings change, the elements (and the focused button) stay. */
  render(rows: readonly StepRow[], selected: CommissioningStep, sessionOpen: boolean, recheckNeeded: boolean): void {
    rows.forEach((row, index) => {
      const elements = this.items.get(row.step) ?? this.create(row.step, index);
      const report = row.report;
      const isSelected = row.step === selected;
      elements.item.dataset.status = report.status;
      if (isSelected) elements.item.setAttribute('aria-current', 'step');
      else elements.item.removeAttribute('aria-current');
      fill(elements.verdict, verdictBadge(report.verdict));
      elements.status.textContent = `${statusText(row.step, report)}${report.cycles > 0 ? ` · ${report.cycles} cycles` : ''}${row.recorded ? ' · in the session' : ''}`;
      elements.recheck.hidden = !(recheckNeeded && row.step === 'ramp');
      fill(elements.readings, report.readings.flatMap((reading) => readingRow(reading)));
      elements.readings.hidden = report.readings.length === 0;
      elements.note.textContent = report.note ?? '';
      elements.note.hidden = !report.note;
      // A newly selected step (keyboard, or the bench moving on after a recording) is brought into view.
      if (isSelected && this.shownSelected !== row.step) {
        this.shownSelected = row.step;
        if (this.element.isConnected && !this.element.closest('[hidden]')) elements.item.scrollIntoView({ block: 'nearest' });
      }
      const actionsKey = `${isSelected}/${sessionOpen}`;
      if (actionsKey !== elements.actionsKey) {
        elements.actionsKey = actionsKey;
        fill(elements.actions, isSelected ? this.stepActions(row.step, sessionOpen) : null);
      }
    });
  }

  private create(step: CommissioningStep, index: number): StepElements {
    const verdict = h('span', { class: 'verdict-slot' });
    const status = h('p', { class: 'note' });
    const recheck = h('p', { class: 'note', role: 'alert', hidden: true }, h('strong', {}, 'A part was changed: check the ramp again.'));
    const readings = h('dl', { class: 'readings' });
    const note = h('p', { class: 'note' });
    const actions = h('div', {});
    const item = h(
      'li',
      { class: 'step', 'data-step': step },
      h(
        'header',
        { onclick: () => this.actions.select(step) },
        // A real button, so Tab reaches every step and Enter or Space selects it.
        h(
          'button',
          { type: 'button', class: 'step-select', 'data-testid': `select-${step}` },
          h('span', { class: 'number', 'aria-hidden': 'true' }, index + 1),
          h('span', { class: 'name' }, stepTitles[step], h('span', { class: 'visually-hidden' }, `, step ${index + 1}`)),
        ),
        verdict,
      ),
      status,
      recheck,
      readings,
      note,
      actions,
    );
    const elements: StepElements = { item, verdict, status, recheck, readings, note, actions, actionsKey: '' };
    this.items.set(step, elements);
    this.element.appendChild(item);
    return elements;
  }

  private stepActions(step: CommissioningStep, sessionOpen: boolean): HTMLElement {
    const check = h('button', { class: 'primary', type: 'button', disabled: !sessionOpen, 'data-testid': `check-${step}` }, step === 'sign-off' ? 'Sign off and close' : step === 'trim' ? 'Record the trim step' : `Record ${stepTitles[step].toLowerCase()}`);
    check.addEventListener('click', () => this.actions.check(step, check));
    const open = step === 'trim' || step === 'transfer' ? h('button', { class: 'secondary', type: 'button', onclick: () => this.actions.open(step) }, step === 'trim' ? 'Open trim plan' : 'Open transfer curve') : null;
    return h('div', { class: 'step-actions' }, check, open, sessionOpen ? null : h('span', { class: 'muted' }, 'Start a session first'));
  }
}

function readingRow(reading: Reading): HTMLElement[] {
  const format = (value: number | null) => formatReading(value, reading.unit);
  const design = designText(reading, format);
  // A judged check without a number (yes/no, a step as recorded) reads as its words, never as a dash with a tick.
  const worded = wordedValue(reading);
  return [
    h('dt', {}, reading.label),
    // Words that already say the measurement is missing ("not recorded") stand alone, without a second badge.
    h('dd', { 'data-reading': reading.key }, h('strong', {}, worded ?? format(reading.value)), ' ', reading.verdict && !(worded !== null && reading.verdict === 'not-measured') ? verdictBadge(reading.verdict) : null),
    design ? h('div', { class: 'design' }, design) : null,
    // A diagnosis or what a limit is for, in words, when the reading is off or needs explaining; marked as an alarm
    // only for a reading beyond or near its limit, never for one not measured yet.
    reading.note && worded === null && reading.verdict !== 'in-tolerance' ? h('div', { class: reading.verdict === 'out-of-tolerance' || reading.verdict === 'marginal' ? 'reading-note' : 'reading-note quiet', 'data-note': reading.key }, reading.note) : null,
  ].filter((element): element is HTMLElement => element !== null);
}
