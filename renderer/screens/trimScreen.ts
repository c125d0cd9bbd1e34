/**
 * Trim: the ranked trim plan (which part, which standard value, what the ramp will then do), the predicted ramp
 * drawn over the measured one, and "I fitted this", which records the change and asks for a re-check. Parts the
 * technician measured on the board go to the planner, so a wrong part fitted is planned from, not around.
 */
import type { BoardDesign, PartRole } from '../../app/board/design';
import type { KnownPart, TrimPlanView, TrimSuggestion } from '../../app/contract/records';
import { createXyChart, cssColour, lineDataset, restyleChart, withAlpha, type Chart } from '../charts/chartSetup';
import { h, fill, uniqueId } from '../dom/h';
import { formatSi } from '../shaping/formatSi';
import { formatFarad, formatOhm, formatPartValue, formatVolt } from '../../app/board/formatValues';
import { designValueOf } from '../../app/board/measuredParts';
import { isBoardPart, partNameCapitalised, recordedPartName, recordedPartValue } from '../../app/board/partNames';
import { measurableParts, partValueText, readMeasuredFields } from '../shaping/measuredPartsForm';
import { foldTracePoints } from '../shaping/foldPoints';
import { runAction, type Screen, type ScreenContext } from '../shell/screen';

const methodWords: Record<TrimSuggestion['method'], string> = { replace: 'Replace', parallel: 'Add across', series: 'Add in series' };

function partText(design: BoardDesign | null, part: string): string {
  return isBoardPart(part) ? partNameCapitalised(design, part) : part;
}

function knownPartText(design: BoardDesign | null, part: KnownPart): string {
  return `${partText(design, part.part)} ${formatPartValue(part.part, part.value)} ${part.source === 'measured' ? 'measured' : 'fitted'} (design ${formatPartValue(part.part, part.designValue)})`;
}

/** The Value cell: what goes in, in the drawing code. */
function changeValueText(suggestion: TrimSuggestion): string {
  if (suggestion.part === 'transistor') return 'one of the design\'s type';
  if (suggestion.toFarad !== null) return `${suggestion.fromFarad === null ? '' : `${formatFarad(suggestion.fromFarad)} → `}${formatFarad(suggestion.toFarad)}`;
  if (suggestion.addOhm !== null) return `${formatOhm(suggestion.addOhm)} ${suggestion.series} → ${formatOhm(suggestion.toOhm ?? Number.NaN)}`;
  return `${suggestion.fromOhm === null ? '' : `${formatOhm(suggestion.fromOhm)} → `}${formatOhm(suggestion.toOhm ?? Number.NaN)}${suggestion.kind === 'trim' ? ` ${suggestion.series}` : ''}`;
}

export class TrimScreen implements Screen {
  readonly name = 'trim' as const;
  readonly title = 'Trim';
  readonly element: HTMLElement;
  private readonly seriesSelect = h('select', { 'data-testid': 'trim-series' }, ['E12', 'E24', 'E48', 'E96'].map((series) => h('option', { value: series }, series)));
  private readonly refreshButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'trim-refresh' }, 'Work out the plan again');
  private readonly summary = h('div', { class: 'stack', 'data-testid': 'trim-summary', 'aria-live': 'polite' });
  private readonly table = h('div', { 'data-testid': 'trim-plan' });
  private readonly recheck = h('div', { class: 'banner', role: 'alert', hidden: true, 'data-testid': 'trim-recheck' });
  private readonly canvas = h('canvas', { role: 'img', 'aria-label': 'Ramp: measured and predicted', 'data-testid': 'trim-canvas' });
  private readonly chart: Chart<'line', { x: number; y: number }[]>;
  private readonly partsForm = h('div', { class: 'form-grid wide-fields', 'data-testid': 'trim-parts' });
  private readonly partsButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'trim-parts-plan' }, 'Plan with these values');
  private readonly partsForget = h('button', { class: 'secondary', type: 'button', 'data-testid': 'trim-parts-forget' }, 'Forget measured values');
  private readonly partInputs = new Map<PartRole, { input: HTMLInputElement; problem: HTMLElement; fitted: HTMLElement }>();
  private plan: TrimPlanView | null = null;
  private design: BoardDesign | null = null;
  private designKey = '';
  private chosen = 0;
  /** The row of this plan recorded with "I fitted this"; a plan is fitted once, a new plan starts afresh. */
  private fittedIndex: number | null = null;

  constructor(private readonly context: ScreenContext) {
    this.seriesSelect.value = 'E24';
    this.chart = createXyChart(this.canvas, { xTitle: 'Electrical degrees', yTitle: 'Ramp volts', xMin: 0, xMax: 360, xStep: 30, xTick: (value) => `${value}°`, yTick: (value) => `${Number(value.toFixed(2))} V`, tooltip: true });
    this.seriesSelect.addEventListener('change', () => void this.load());
    this.refreshButton.addEventListener('click', () => void this.load());
    const seriesId = uniqueId('series');
    this.seriesSelect.id = seriesId;
    this.element = h(
      'div',
      {},
      h('h1', { class: 'screen-title' }, 'Trim plan'),
      this.recheck,
      h(
        'div',
        { class: 'trim-top' },
        h('section', { class: 'panel stack', 'aria-label': 'Plan' }, h('div', { class: 'row' }, h('label', { class: 'field', for: seriesId }, 'Standard values from', this.seriesSelect), this.refreshButton), this.summary),
        h(
          'section',
          { class: 'panel', 'aria-labelledby': 'trim-plot-title' },
          h('h2', { id: 'trim-plot-title' }, 'Ramp: measured and predicted'),
          h('div', { class: 'plot small' }, this.canvas),
          h(
            'div',
            { class: 'plot-caption' },
            h('span', {}, h('span', { class: 'swatch ramp', 'aria-hidden': 'true' }), 'measured'),
            h('span', {}, h('span', { class: 'swatch control', 'aria-hidden': 'true' }), 'predicted after the chosen change (dashed)'),
            h('span', {}, h('span', { class: 'swatch sync', 'aria-hidden': 'true' }), 'target'),
          ),
        ),
      ),
      h(
        'section',
        { class: 'panel stack trim-parts', 'aria-labelledby': 'trim-parts-title' },
        h('h2', { id: 'trim-parts-title' }, 'Parts on the board'),
        h('p', { class: 'muted' }, 'If the ramp is far off, measure the parts that set it (board powered down, part lifted at one end) and type what you found; leave a field blank for a part you did not measure. The plan then starts from the board as built.'),
        this.partsForm,
        h('div', { class: 'row' }, this.partsButton, this.partsForget),
      ),
      h('section', { class: 'panel', 'aria-labelledby': 'trim-list-title' }, h('h2', { id: 'trim-list-title' }, 'Changes, best first'), h('p', { class: 'muted' }, 'Pick a row to draw its predicted ramp. Power the board down before changing a part.'), this.table),
    );
    this.partsButton.addEventListener('click', () => void this.planWithMeasured(false));
    this.partsForget.addEventListener('click', () => void this.planWithMeasured(true));
    context.store.on('state', () => this.renderRecheck());
  }

  shown(): void {
    void this.load();
    this.renderRecheck();
  }

  restyle(): void {
    restyleChart(this.chart);
    this.draw();
  }

  private async load(): Promise<void> {
    if (!this.context.store.state?.session) {
      this.plan = null;
      fill(this.summary, h('p', { class: 'empty' }, 'Start a session on the Bench screen; the plan comes from the ramp readings.'));
      fill(this.table);
      this.draw();
      return;
    }
    await this.loadDesign();
    const plan = await runAction(this.context, this.refreshButton, () => this.context.client.trimPlan({ series: this.seriesSelect.value as 'E24' }));
    if (!plan) return;
    this.showPlan(plan);
  }

  private showPlan(plan: TrimPlanView): void {
    this.plan = plan;
    this.chosen = 0;
    this.fittedIndex = null;
    this.render();
    this.renderParts(plan.knownParts);
  }

  /** The session's design, for the part fields (fetched again only when the session's design changes). */
  private async loadDesign(): Promise<void> {
    const session = this.context.store.state?.session;
    if (!session) return;
    const key = `${session.designName}@${session.designVersion}`;
    if (key === this.designKey && this.design) return;
    const stored = await runAction(this.context, null, () => this.context.client.getDesign({ name: session.designName, version: session.designVersion }));
    if (!stored) return;
    this.design = stored.design;
    this.designKey = key;
    this.buildPartFields(stored.design);
  }

  private buildPartFields(design: BoardDesign): void {
    this.partInputs.clear();
    const labels = measurableParts.map((role) => {
      const designValue = designValueOf(design, role) ?? Number.NaN;
      const id = uniqueId(`measured-${role}`);
      const input = h('input', { id, type: 'text', inputmode: 'text', autocomplete: 'off', spellcheck: 'false', placeholder: `as designed: ${partValueText(role, designValue)}`, 'data-testid': `measured-${role}` });
      const problem = h('span', { class: 'field-problem', 'aria-live': 'polite' });
      const fitted = h('span', { class: 'muted small' });
      input.setAttribute('aria-describedby', `${id}-problem`);
      problem.id = `${id}-problem`;
      this.partInputs.set(role, { input, problem, fitted });
      return h('label', { class: 'field', for: id }, partNameCapitalised(design, role), input, fitted, problem);
    });
    fill(this.partsForm, labels);
  }

  /** Measured values go back in their fields; a part changed this session says so under its field. */
  private renderParts(known: readonly KnownPart[]): void {
    for (const [role, field] of this.partInputs) {
      const entry = known.find((part) => part.part === role);
      field.input.value = entry?.source === 'measured' ? partValueText(role, entry.value) : '';
      field.input.setAttribute('aria-invalid', 'false');
      field.problem.textContent = '';
      field.fitted.textContent = entry?.source === 'fitted' ? `fitted this session: ${formatPartValue(role, entry.value)}` : '';
    }
  }

  private async planWithMeasured(forget: boolean): Promise<void> {
    const design = this.design;
    if (!design || !this.context.store.state?.session) return;
    const texts: Partial<Record<PartRole, string>> = {};
    for (const [role, field] of this.partInputs) texts[role] = forget ? '' : field.input.value;
    const { measured, problems } = readMeasuredFields(design, texts);
    let firstBad: HTMLInputElement | null = null;
    for (const [role, field] of this.partInputs) {
      const problem = problems[role] ?? '';
      field.problem.textContent = problem;
      field.input.setAttribute('aria-invalid', String(problem !== ''));
      if (problem !== '' && firstBad === null) firstBad = field.input;
    }
    if (firstBad) {
      firstBad.focus();
      return;
    }
    const plan = await runAction(this.context, forget ? this.partsForget : this.partsButton, () => this.context.client.trimPlan({ series: this.seriesSelect.value as 'E24', measuredParts: measured }));
    if (plan) this.showPlan(plan);
  }

  private render(): void {
    const plan = this.plan;
    if (!plan) return;
    fill(
      this.summary,
      h('p', { class: 'big-reading' }, h('span', { class: 'label' }, 'Ramp peak now'), h('span', { class: 'value', 'data-testid': 'trim-measured' }, formatSi(plan.measuredPeakV, 'V')), h('span', { class: 'design' }, ` target ${formatSi(plan.targetPeakV, 'V')}`)),
      h('p', { class: 'trim-summary-line', 'data-testid': 'trim-message' }, h('strong', {}, plan.summary)),
      plan.knownParts.length > 0 ? h('p', { 'data-testid': 'trim-known' }, h('strong', {}, 'Planned for the board as built: '), plan.knownParts.map((part) => knownPartText(this.design, part)).join('; '), '.') : null,
      plan.notes.length > 0 ? h('ul', { class: 'trim-notes', 'data-testid': 'trim-notes' }, plan.notes.filter((note) => !note.startsWith('Planned for the board as built')).map((note) => h('li', {}, note))) : null,
    );
    if (plan.suggestions.length === 0) {
      fill(this.table, h('p', { class: 'empty', 'data-testid': 'trim-none' }, plan.inTolerance ? 'The ramp is in tolerance: nothing to change.' : 'No standard value brings the ramp to its target; check the parts against the design.'));
      this.draw();
      return;
    }
    const measuredParts = new Set(plan.knownParts.filter((part) => part.source === 'measured').map((part) => part.part));
    fill(
      this.table,
      h(
        'table',
        { class: 'data' },
        h('thead', {}, h('tr', {}, ['Rank', 'Part', 'Change', 'Value', 'Predicted peak', 'Headroom', 'What and why', ''].map((title) => h('th', { scope: 'col' }, title)))),
        h(
          'tbody',
          {},
          plan.suggestions.map((suggestion, index) => {
            // Once one row of this plan is recorded, every row's button is spent: the next change needs a new plan.
            const spent = this.fittedIndex !== null;
            const fitted = h('button', { class: index === 0 ? 'primary' : 'secondary', type: 'button', 'data-testid': `fitted-${index}`, disabled: spent }, this.fittedIndex === index ? 'Recorded ✓' : suggestion.kind === 'repair' ? 'I replaced it' : 'I fitted this');
            fitted.addEventListener('click', (event) => {
              event.stopPropagation();
              void this.applyTrim(suggestion, fitted);
            });
            return h(
              'tr',
              { class: `clickable ${suggestion.kind}${suggestion.withinTolerance ? '' : ' outside-band'}`, 'aria-selected': String(index === this.chosen), 'data-kind': suggestion.kind, onclick: () => { this.chosen = index; this.render(); } },
              h('td', { class: 'number' }, index + 1),
              h('td', {}, partText(this.design, suggestion.part)),
              h('td', {}, suggestion.kind === 'repair' ? (measuredParts.has(suggestion.part) || suggestion.part === 'transistor' ? 'Replace' : 'Measure, replace') : methodWords[suggestion.method]),
              h('td', { class: 'number' }, changeValueText(suggestion)),
              // Volts as the reason beside them says them (7.40 V, not 7.4 V): one column reads evenly.
              h('td', { class: 'number' }, formatVolt(suggestion.predictedPeakV), suggestion.withinTolerance ? null : h('div', { class: 'field-problem' }, 'outside the band')),
              h('td', { class: 'number' }, suggestion.headroomV === null ? '–' : formatVolt(suggestion.headroomV)),
              h('td', {}, suggestion.reason),
              h('td', {}, fitted),
            );
          }),
        ),
      ),
    );
    this.draw();
  }

  private async applyTrim(suggestion: TrimSuggestion, button: HTMLButtonElement): Promise<void> {
    await runAction(this.context, button, async () => {
      const result = await this.context.client.applyTrim({ part: suggestion.part, fromOhm: suggestion.fromOhm, toOhm: suggestion.toOhm, fromFarad: suggestion.fromFarad, toFarad: suggestion.toFarad, method: suggestion.method, addOhm: suggestion.addOhm, reason: suggestion.reason, alsoChange: suggestion.alsoChange ? { part: suggestion.alsoChange.part, fromOhm: suggestion.alsoChange.fromOhm, toOhm: suggestion.alsoChange.toOhm } : null });
      const change = result.trim.part === 'transistor' ? 'replaced' : `${recordedPartValue(result.trim.part, result.trim.fromOhm)} → ${recordedPartValue(result.trim.part, result.trim.toOhm)}`;
      this.context.notices.show('info', `Recorded: ${recordedPartName(this.design, result.trim.part)} ${change}. Check the ramp again.`);
      this.fittedIndex = this.plan?.suggestions.indexOf(suggestion) ?? null;
      this.render();
      await this.context.store.refresh();
    });
  }

  private renderRecheck(): void {
    const needed = this.context.store.state?.recheckNeeded ?? false;
    this.recheck.hidden = !needed;
    if (!needed) return;
    const go = h('button', { class: 'primary', type: 'button', 'data-testid': 'go-recheck' }, 'Check the ramp again');
    go.addEventListener('click', () => {
      this.context.store.selectStep('ramp');
      this.context.go('bench');
    });
    fill(this.recheck, h('p', {}, h('strong', {}, 'A change was recorded. '), 'Power the board up again and check the ramp: the plan is only right once the new ramp is measured.'), go);
  }

  private draw(): void {
    const plan = this.plan;
    const chosen = plan?.suggestions[this.chosen] ?? null;
    const measured = plan?.measuredRamp ? foldTracePoints(plan.measuredRamp, 300) : [];
    const predicted = chosen?.predictedRamp ? foldTracePoints(chosen.predictedRamp, 300) : [];
    const target = plan ? [{ x: 0, y: plan.targetPeakV }, { x: 360, y: plan.targetPeakV }] : [];
    let high = plan?.targetPeakV ?? 1;
    for (const point of [...measured, ...predicted]) high = Math.max(high, point.y);
    const y = this.chart.options.scales?.y;
    if (y) {
      y.min = Math.floor(Math.min(0, ...measured.map((point) => point.y)));
      y.max = Math.ceil(high * 1.15);
    }
    this.chart.data.datasets = [
      lineDataset('Measured ramp', cssColour('ramp'), measured, { borderWidth: 2.2 }),
      lineDataset('Predicted ramp', cssColour('control'), predicted, { borderWidth: 2.2, borderDash: [7, 4] }),
      lineDataset('Target', withAlpha(cssColour('sync'), 0.9), target, { borderDash: [3, 3] }),
    ];
    this.chart.update('none');
    this.canvas.dataset.points = String(measured.length + predicted.length);
  }
}
