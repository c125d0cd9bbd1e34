/**
 * Board: pick or edit a board design with validation as you type (the schema, then the board physics), the ramp
 * the model predicts for it, and a sizing calculator for the emitter resistor.
 */
import type { BoardDesign } from '../../app/board/design';
import { controlLimitsOf } from '../../app/board/controlDivider';
import { alphaRangeOf } from '../../app/board/firingAngle';
import { predictRamp } from '../../app/board/rampModel';
import type { ESeriesName } from '../../app/board/eSeries';
import { createXyChart, cssColour, lineDataset, restyleChart, withAlpha, type Chart } from '../charts/chartSetup';
import { h, fill, uniqueId } from '../dom/h';
import { checkDesign, designFieldGroups, fieldValueText, pathWords, problemForField, setFieldText, type DesignField } from '../shaping/designForm';
import { formatOhm } from '../../app/board/formatValues';
import { formatFixed, formatSi } from '../shaping/formatSi';
import { predictedRampPoints } from '../shaping/predictedRamp';
import { sizeEmitterResistor } from '../shaping/sizeEmitter';
import { runAction, type Screen, type ScreenContext } from '../shell/screen';

export class BoardScreen implements Screen {
  readonly name = 'board' as const;
  readonly title = 'Board';
  readonly element: HTMLElement;
  private readonly list = h('ul', { class: 'stack design-list', 'aria-label': 'Stored designs', 'data-testid': 'design-list' });
  private readonly form = h('form', { 'aria-label': 'Board design', novalidate: true, 'data-testid': 'design-form' });
  private readonly formStatus = h('p', { role: 'status', 'data-testid': 'design-status' });
  private readonly saveButton = h('button', { class: 'primary', type: 'button', 'data-testid': 'save-design' }, 'Save as a new version');
  private readonly canvas = h('canvas', { role: 'img', 'aria-label': 'Predicted ramp', 'data-testid': 'predicted-canvas' });
  private readonly chart: Chart<'line', { x: number; y: number }[]>;
  private readonly prediction = h('dl', { class: 'stat-list', 'data-testid': 'prediction' });
  private readonly sizingSeries = h('select', {}, ['E12', 'E24', 'E48', 'E96'].map((series) => h('option', { value: series }, series)));
  private readonly sizingTarget = h('input', { type: 'number', step: '0.1', min: '0' });
  private readonly sizingResult = h('div', { 'aria-live': 'polite', 'data-testid': 'sizing-result' });
  private readonly inputs = new Map<string, { input: HTMLInputElement | HTMLSelectElement; problem: HTMLElement; field: DesignField }>();
  private draft: Record<string, unknown> = {};
  private checked: BoardDesign | null = null;
  private timer: number | null = null;
  private openName: string | null = null;

  constructor(private readonly context: ScreenContext) {
    this.chart = createXyChart(this.canvas, { xTitle: 'Electrical degrees', yTitle: 'Ramp volts', xMin: 0, xMax: 360, xStep: 30, xTick: (value) => `${value}°`, yTick: (value) => `${value} V`, tooltip: true });
    this.sizingSeries.value = 'E24';
    this.buildForm();
    this.saveButton.addEventListener('click', () => void this.save());
    const sizeButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'size-emitter' }, 'Size the emitter resistor');
    sizeButton.addEventListener('click', () => this.size());
    const targetId = uniqueId('sizing');
    const seriesId = uniqueId('sizing');
    this.sizingTarget.id = targetId;
    this.sizingSeries.id = seriesId;
    this.element = h(
      'div',
      {},
      h('h1', { class: 'screen-title' }, 'Board design'),
      h(
        'div',
        { class: 'three-columns' },
        h('section', { class: 'panel stack', 'aria-labelledby': 'designs-title' }, h('h2', { id: 'designs-title' }, 'Designs'), this.list),
        h('section', { class: 'panel', 'aria-label': 'Edit design' }, this.form, this.formStatus, h('div', { class: 'row' }, this.saveButton)),
        h(
          'div',
          { class: 'stack' },
          h('section', { class: 'panel', 'aria-labelledby': 'predicted-title' }, h('h2', { id: 'predicted-title' }, 'Predicted ramp'), h('div', { class: 'plot small' }, this.canvas), this.prediction),
          h(
            'section',
            { class: 'panel stack', 'aria-labelledby': 'sizing-title' },
            h('h2', { id: 'sizing-title' }, 'Sizing: emitter resistor'),
            h('p', { class: 'muted' }, 'With this divider and capacitor, which emitter resistor gives the ramp height you want?'),
            h('div', { class: 'form-grid' }, h('label', { class: 'field', for: targetId }, 'Ramp height (V)', this.sizingTarget), h('label', { class: 'field', for: seriesId }, 'Standard values', this.sizingSeries)),
            h('div', { class: 'row' }, sizeButton),
            this.sizingResult,
          ),
        ),
      ),
    );
  }

  shown(): void {
    void this.loadList();
  }

  restyle(): void {
    restyleChart(this.chart);
    this.drawPrediction();
  }

  private buildForm(): void {
    for (const group of designFieldGroups) {
      const grid = h('div', { class: 'form-grid' });
      for (const field of group.fields) {
        const id = `design-${field.path.replace(/\./g, '-')}`;
        const problemId = `${id}-problem`;
        const input =
          field.kind === 'choice'
            ? h('select', { id, name: field.path, 'aria-describedby': problemId }, (field.choices ?? []).map((choice) => h('option', { value: choice }, choice)))
            : h('input', { id, name: field.path, type: 'text', inputmode: field.kind === 'number' ? 'decimal' : null, autocomplete: 'off', 'aria-describedby': problemId });
        const problem = h('span', { class: 'field-problem', id: problemId });
        input.addEventListener('input', () => this.onEdit(field, input));
        input.addEventListener('change', () => this.onEdit(field, input));
        this.inputs.set(field.path, { input, problem, field });
        grid.appendChild(h('label', { class: field.wide ? 'field wide' : 'field', for: id }, field.label, input, problem));
      }
      this.form.appendChild(h('fieldset', {}, h('legend', {}, group.title), grid));
    }
  }

  private async loadList(): Promise<void> {
    const result = await runAction(this.context, null, () => this.context.client.listDesigns());
    if (!result) return;
    fill(
      this.list,
      result.designs.length === 0 ? h('li', { class: 'empty' }, 'No designs stored yet.') : null,
      result.designs.map((summary) => {
        const open = h('button', { class: 'secondary', type: 'button', 'data-design': summary.name, 'aria-current': String(summary.name === this.openName) }, summary.name);
        open.addEventListener('click', () => void this.open(summary.name));
        return h('li', {}, open, h('div', { class: 'muted' }, `v${summary.version} · ${summary.mainsHz} Hz ${summary.rectifier} · ramp ${formatSi(summary.rampTargetV, 'V')}`));
      }),
    );
    if (Object.keys(this.draft).length === 0 && result.designs.length > 0) await this.open(result.designs[0].name);
  }

  private async open(name: string): Promise<void> {
    const stored = await runAction(this.context, null, () => this.context.client.getDesign({ name }));
    if (!stored) return;
    this.draft = structuredClone(stored.design) as unknown as Record<string, unknown>;
    this.openName = stored.summary.name;
    for (const button of this.list.querySelectorAll<HTMLButtonElement>('button[data-design]')) button.setAttribute('aria-current', String(button.dataset.design === name));
    for (const { input, field } of this.inputs.values()) input.value = fieldValueText(this.draft, field);
    this.formStatus.textContent = `Editing ${stored.summary.name}, version ${stored.summary.version}.`;
    // The sizing calculator follows the design: a result worked out for another design must not be applied here.
    this.clearSizing();
    this.sizingTarget.value = '';
    this.validate();
  }

  private onEdit(field: DesignField, input: HTMLInputElement | HTMLSelectElement): void {
    setFieldText(this.draft, field, input.value);
    // A sizing result was worked out with the divider and capacitor as they were: any other change makes it stale.
    if (field.path !== 'parts.rEmitter.ohm') this.clearSizing();
    // As you type: a short pause so a half-typed number is not judged on every key.
    if (this.timer !== null) window.clearTimeout(this.timer);
    this.timer = window.setTimeout(() => this.validate(), 150);
  }

  private validate(): void {
    this.timer = null;
    const result = checkDesign(this.draft);
    this.checked = result.design;
    let errors = 0;
    for (const { input, problem, field } of this.inputs.values()) {
      const found = problemForField(result.problems, field);
      problem.textContent = found ? `${found.severity === 'warning' ? 'Note: ' : ''}${found.message}` : '';
      input.setAttribute('aria-invalid', String(found?.severity === 'error'));
      if (found?.severity === 'error') errors += 1;
    }
    const unplaced = [...result.problems.entries()].filter(([path]) => ![...this.inputs.values()].some(({ field }) => problemForField(new Map([[path, { severity: 'error', message: '' }]]), field)));
    this.formStatus.textContent = errors + unplaced.length === 0 ? (result.design ? 'The design is valid.' : '') : `${errors + unplaced.length} problem${errors + unplaced.length === 1 ? '' : 's'} to fix before saving.${unplaced.map(([path, problem]) => ` ${pathWords(path)}: ${problem.message}.`).join('')}`;
    this.saveButton.disabled = result.design === null || [...result.problems.values()].some((problem) => problem.severity === 'error');
    if (result.design && !this.sizingTarget.value) this.sizingTarget.value = String(result.design.rampTargetV);
    this.drawPrediction();
  }

  private drawPrediction(): void {
    const design = this.checked;
    if (!design) {
      this.chart.data.datasets = [];
      this.chart.update('none');
      fill(this.prediction, h('dt', {}, 'Prediction'), h('dd', {}, 'shown once the design is valid'));
      return;
    }
    const prediction = predictRamp(design);
    const points = predictedRampPoints(design, prediction);
    const tolerance = design.tolerances.rampPeakPct / 100;
    const y = this.chart.options.scales?.y;
    if (y) {
      y.min = 0;
      y.max = Math.ceil(Math.max(design.rampTargetV * (1 + tolerance), prediction.peakV, prediction.clipV) * 1.1);
    }
    const ramp = cssColour('ramp');
    const line = (volts: number) => [{ x: 0, y: volts }, { x: 360, y: volts }];
    this.chart.data.datasets = [
      lineDataset('Predicted ramp', ramp, points, { borderWidth: 2.2 }),
      lineDataset('Tolerance, low', withAlpha(ramp, 0.35), line(design.rampTargetV * (1 - tolerance)), { borderWidth: 0.8 }),
      lineDataset('Tolerance, high', withAlpha(ramp, 0.35), line(design.rampTargetV * (1 + tolerance)), { borderWidth: 0.8, fill: '-1', backgroundColor: withAlpha(ramp, 0.12) }),
      lineDataset('Target', ramp, line(design.rampTargetV), { borderDash: [8, 5], borderWidth: 1.2 }),
      lineDataset('Clipping level', cssColour('sync'), line(prediction.clipV), { borderDash: [2, 3], borderWidth: 1.2 }),
    ];
    this.chart.update('none');
    this.canvas.setAttribute('aria-label', `Predicted ramp: peak ${formatSi(prediction.peakV, 'V')} against a target of ${formatSi(design.rampTargetV, 'V')}`);
    const limits = controlLimitsOf(design, { prediction });
    const alphaRange = alphaRangeOf(design, prediction);
    const entry = (label: string, value: string) => [h('dt', {}, label), h('dd', {}, value)];
    fill(
      this.prediction,
      entry('Charging current', formatSi(prediction.chargingCurrentA, 'A')),
      entry('Slope', `${formatSi(prediction.slopeVPerS / 1000, 'V')}/ms`),
      entry('Peak at half-cycle end', formatSi(prediction.peakV, 'V')),
      entry('Target', `${formatSi(design.rampTargetV, 'V')} ± ${formatFixed(design.tolerances.rampPeakPct, '%')}`),
      entry('Headroom to clipping', prediction.clipped ? 'clipped: current too high for the supply' : formatSi(prediction.headroomV, 'V')),
      entry('Ramp spans', `${formatFixed(alphaRange.startDeg, '°')} to ${formatFixed(alphaRange.endDeg, '°')}`),
      entry('α at the pot’s end', limits.alphaMaxDeg === null ? 'past the ramp: the board can stop firing' : formatFixed(limits.alphaMaxDeg, '°')),
      entry('Limit resistor for α max', limits.limitResistorOhm === null ? '–' : formatOhm(limits.limitResistorOhm)),
    );
  }

  private clearSizing(): void {
    fill(this.sizingResult);
  }

  private size(): void {
    const design = this.checked;
    const targetV = Number(this.sizingTarget.value);
    if (!design) {
      fill(this.sizingResult, h('p', { class: 'field-problem' }, 'Fix the design first: the calculator uses its divider and capacitor.'));
      return;
    }
    if (!(targetV > 0)) {
      fill(this.sizingResult, h('p', { class: 'field-problem' }, 'Type the ramp height you want, in volts, above 0.'));
      return;
    }
    const sizing = sizeEmitterResistor(design, targetV, this.sizingSeries.value as ESeriesName);
    if (!sizing) {
      fill(this.sizingResult, h('p', { class: 'field-problem' }, `No emitter resistor from 10R to 10M gives ${formatSi(targetV, 'V')} with this divider and capacitor.`));
      return;
    }
    const use = h('button', { class: 'secondary', type: 'button' }, `Use ${formatOhm(sizing.standardOhm)}`);
    use.addEventListener('click', () => {
      const entry = this.inputs.get('parts.rEmitter.ohm');
      if (!entry) return;
      entry.input.value = formatOhm(sizing.standardOhm, 6);
      this.onEdit(entry.field, entry.input);
    });
    fill(
      this.sizingResult,
      h(
        'dl',
        { class: 'stat-list' },
        h('dt', {}, 'Exact value'),
        h('dd', {}, formatOhm(sizing.exactOhm, 4)),
        h('dt', {}, `Nearest ${sizing.series}`),
        h('dd', {}, formatOhm(sizing.standardOhm)),
        h('dt', {}, 'Predicted peak'),
        h('dd', {}, `${formatSi(sizing.standard.peakV, 'V')}${sizing.standard.clipped ? ' (clipped)' : ''}`),
        h('dt', {}, 'Headroom'),
        h('dd', {}, formatSi(sizing.standard.headroomV, 'V')),
      ),
      use,
    );
  }

  private async save(): Promise<void> {
    if (!this.checked) return;
    const design = this.checked;
    await runAction(this.context, this.saveButton, async () => {
      const stored = await this.context.client.saveDesign({ design });
      if (!stored.saved) {
        // Nothing to save: say so, and keep the version as it is.
        this.formStatus.textContent = `Nothing changed: ${stored.summary.name} stays version ${stored.summary.version}, and no new version was saved.`;
        this.context.notices.show('info', `Nothing changed in ${stored.summary.name}: no new version saved.`);
        return;
      }
      this.formStatus.textContent = `Saved ${stored.summary.name}, version ${stored.summary.version}.`;
      await this.loadList();
    });
  }
}
