/**
 * The commissioning steps down one side of the Bench screen: each with its readings against the design, a verdict
 * as text plus icon, and the action that records it. The selected step is marked for eyes and screen readers.
 */
import type { CommissioningStep, Reading } from '../../app/contract/readings';
import { h, fill } from '../dom/h';
import { verdictBadge } from '../dom/verdictBadge';
import { formatReading } from '../shaping/formatSi';
import { designText, stepTitles, type StepRow } from '../shaping/stepView';

export interface StepActions {
  check(step: CommissioningStep, button: HTMLButtonElement): void;
  open(step: CommissioningStep): void;
  select(step: CommissioningStep): void;
}

const statusWords = { waiting: 'Waiting for signal', measuring: 'Measuring', done: 'Recorded' } as const;

export class StepList {
  readonly element = h('ol', { class: 'steps', 'aria-label': 'Commissioning steps' });

  constructor(private readonly actions: StepActions) {}

  render(rows: readonly StepRow[], selected: CommissioningStep, sessionOpen: boolean, recheckNeeded: boolean): void {
    // Redrawing must not steal keyboard focus from the step's button.
    const focusedId = (document.activeElement as HTMLElement | null)?.dataset?.testid;
    const focusInside = this.element.contains(document.activeElement);
    fill(
      this.element,
      rows.map((row, index) => {
        const report = row.report;
        const isSelected = row.step === selected;
        const readings = report.readings.flatMap((reading) => readingRow(reading));
        const needsRecheck = recheckNeeded && row.step === 'ramp';
        return h(
          'li',
          { class: 'step', 'data-step': row.step, 'data-status': report.status, 'aria-current': isSelected ? 'step' : null },
          h(
            'header',
            { onclick: () => this.actions.select(row.step) },
            h('span', { class: 'number', 'aria-hidden': 'true' }, index + 1),
            h('span', { class: 'name' }, stepTitles[row.step], h('span', { class: 'visually-hidden' }, `, step ${index + 1}`)),
            verdictBadge(report.verdict, report.status === 'waiting' ? 'Waiting' : 'No verdict'),
          ),
          h('p', { class: 'note' }, `${statusWords[report.status]}${report.cycles > 0 ? ` · ${report.cycles} cycles` : ''}${row.recorded ? ' · in the session' : ''}`),
          needsRecheck ? h('p', { class: 'note', role: 'alert' }, h('strong', {}, 'A part was changed: check the ramp again.')) : null,
          readings.length > 0 ? h('dl', { class: 'readings' }, readings) : null,
          report.note ? h('p', { class: 'note' }, report.note) : null,
          isSelected ? this.stepActions(row.step, sessionOpen) : null,
        );
      }),
    );
    if (focusInside && focusedId) this.element.querySelector<HTMLElement>(`[data-testid="${focusedId}"]`)?.focus();
  }

  private stepActions(step: CommissioningStep, sessionOpen: boolean): HTMLElement {
    const check = h('button', { class: 'primary', type: 'button', disabled: !sessionOpen, 'data-testid': `check-${step}` }, step === 'sign-off' ? 'Sign off and close' : step === 'trim' ? 'Record: no trim needed' : `Record ${stepTitles[step].toLowerCase()}`);
    check.addEventListener('click', () => this.actions.check(step, check));
    const open = step === 'trim' || step === 'transfer' ? h('button', { class: 'secondary', type: 'button', onclick: () => this.actions.open(step) }, step === 'trim' ? 'Open trim plan' : 'Open transfer curve') : null;
    return h('div', { class: 'step-actions' }, check, open, sessionOpen ? null : h('span', { class: 'muted' }, 'Start a session first'));
  }
}

function readingRow(reading: Reading): HTMLElement[] {
  const format = (value: number | null) => formatReading(value, reading.unit);
  const design = designText(reading, format);
  return [
    h('dt', {}, reading.label),
    h('dd', { 'data-reading': reading.key }, h('strong', {}, format(reading.value)), ' ', reading.verdict ? verdictBadge(reading.verdict) : null),
    design ? h('div', { class: 'design' }, design) : null,
  ].filter((element): element is HTMLElement => element !== null);
}
