/**
 * Transfer: firing angle against control voltage as it is swept. Live points, the least-squares fit, the design's
 * ideal line and the alpha limits on one plot; the fit's figures, the sweep and export beside it.
 */
import type { TransferFit, TransferPoint } from '../../app/contract/readings';
import { createXyChart, cssColour, lineDataset, pointsDataset, restyleChart, withAlpha, type Chart } from '../charts/chartSetup';
import { downloadBytes } from '../dom/download';
import { h, fill, uniqueId } from '../dom/h';
import { verdictBadge } from '../dom/verdictBadge';
import { formatFixed, formatSi } from '../shaping/formatSi';
import { fitLinePoints, toPoints, transferPointsCsv, transferRangeV } from '../shaping/transferView';
import { runAction, type Screen, type ScreenContext } from '../shell/screen';

export class TransferScreen implements Screen {
  readonly name = 'transfer' as const;
  readonly title = 'Transfer';
  readonly element: HTMLElement;
  private readonly canvas = h('canvas', { role: 'img', 'aria-label': 'Transfer curve: no points yet', 'data-testid': 'transfer-canvas' });
  private readonly chart: Chart<'line', { x: number; y: number }[]>;
  private readonly stats = h('dl', { class: 'stat-list', 'data-testid': 'transfer-stats' });
  private readonly fromInput = h('input', { type: 'number', step: '0.1', value: '0', 'aria-describedby': 'sweep-hint' });
  private readonly toInput = h('input', { type: 'number', step: '0.1', value: '5' });
  private readonly periodInput = h('input', { type: 'number', step: '1', min: '1', value: '20' });
  private readonly sweepButton = h('button', { class: 'primary', type: 'button', 'data-testid': 'start-sweep' }, 'Sweep the control voltage');
  private readonly clearButton = h('button', { class: 'secondary', type: 'button' }, 'Start the curve again');
  private readonly recordButton = h('button', { class: 'primary', type: 'button', 'data-testid': 'record-transfer' }, 'Record transfer curve');
  private readonly exportButton = h('button', { class: 'secondary', type: 'button', 'data-testid': 'export-transfer' }, 'Export points (CSV)');
  private readonly sweepPanel: HTMLElement;
  /** The Transfer step as the bench judges it now: its verdict, and what is still missing (both ends of the range). */
  private readonly stepStatus = h('p', { class: 'step-status', 'data-testid': 'transfer-step-status', 'aria-live': 'polite' });
  private lastStatusKey = '';
  private points: TransferPoint[] = [];
  private fit: TransferFit | null = null;
  private ideal: TransferPoint[] = [];
  private lastLoadMs = 0;
  /** The range the sweep fields were last filled from: a session on another design fills them again. */
  private sweepDefaultsFor = '';
  private range: { lowV: number; highV: number; alphaAtLowDeg: number | null; alphaAtHighDeg: number | null } | null = null;

  constructor(private readonly context: ScreenContext) {
    this.chart = createXyChart(this.canvas, { xTitle: 'Control voltage', yTitle: 'Firing angle α', yMin: 0, yMax: 180, xTick: (value) => formatSi(value, 'V'), yTick: (value) => `${value}°`, tooltip: true });
    this.sweepButton.addEventListener('click', () => void this.sweep());
    this.clearButton.addEventListener('click', () => void runAction(context, this.clearButton, async () => {
      const cleared = await context.client.clearTransfer();
      context.notices.show('info', `Cleared ${cleared.cleared} points; the curve starts again.`);
      await this.load();
    }));
    this.recordButton.addEventListener('click', () => void runAction(context, this.recordButton, async () => {
      const report = await context.client.checkStep({ step: 'transfer' });
      context.notices.show('info', `Transfer curve recorded (${report.readings.length} readings).`);
      await context.store.refresh();
    }));
    this.exportButton.addEventListener('click', () => {
      if (this.points.length === 0) {
        context.notices.show('warning', 'No transfer points to export yet: sweep the control voltage first.');
        return;
      }
      const serial = context.store.state?.session?.unitSerial ?? 'unit';
      downloadBytes(`${serial}-transfer.csv`, 'text/csv', transferPointsCsv(this.points));
    });
    const field = (label: string, input: HTMLInputElement) => {
      const id = uniqueId('sweep');
      input.id = id;
      return h('label', { class: 'field', for: id }, label, input);
    };
    this.sweepPanel = h(
      'fieldset',
      {},
      h('legend', {}, 'Sweep (virtual board)'),
      h('div', { class: 'form-grid' }, field('From (V)', this.fromInput), field('To (V)', this.toInput), field('Over (s)', this.periodInput)),
      h('p', { class: 'muted', id: 'sweep-hint' }, 'On a real board, turn the control potentiometer slowly end to end; points appear as the firing angle follows.'),
      h('div', { class: 'row' }, this.sweepButton),
    );
    this.element = h(
      'div',
      {},
      h('h1', { class: 'screen-title' }, 'Transfer curve'),
      h(
        'div',
        { class: 'two-columns' },
        h(
          'section',
          { class: 'panel', 'aria-label': 'Transfer plot' },
          h('div', { class: 'plot' }, this.canvas),
          h(
            'div',
            { class: 'plot-caption' },
            h('span', {}, h('span', { class: 'swatch gate', 'aria-hidden': 'true' }), 'measured points'),
            h('span', {}, h('span', { class: 'swatch control', 'aria-hidden': 'true' }), 'least-squares fit'),
            h('span', {}, h('span', { class: 'swatch sync', 'aria-hidden': 'true' }), 'ideal line from the design (dashed)'),
            h('span', {}, h('span', { class: 'swatch ramp', 'aria-hidden': 'true' }), 'α limits (dotted)'),
          ),
        ),
        h('section', { class: 'panel stack', 'aria-label': 'Fit and actions' }, h('h2', {}, 'Fit'), this.stats, this.sweepPanel, this.stepStatus, h('div', { class: 'row' }, this.recordButton, this.exportButton, this.clearButton)),
      ),
    );
    context.store.on('live', () => this.renderStepStatus());
    context.store.on('state', () => this.renderStepStatus());
    context.store.on('transfer', (points) => {
      this.points.push(...(points as TransferPoint[]));
      if (this.element.hidden) return;
      // The fit is the service's: fetch it again now and then while points arrive.
      if (performance.now() - this.lastLoadMs > 1500) void this.load().catch((error) => this.context.notices.fromError(error));
      else this.draw();
    });
  }

  /** The step's verdict and note, redrawn only when they change (a live frame arrives twenty times a second). */
  private renderStepStatus(): void {
    const report = this.context.store.liveSteps().find((step) => step.step === 'transfer') ?? this.context.store.state?.steps.find((step) => step.step === 'transfer');
    const key = report ? `${report.status}/${report.verdict}/${report.note ?? ''}` : '';
    if (key === this.lastStatusKey) return;
    this.lastStatusKey = key;
    this.stepStatus.dataset.verdict = report?.verdict ?? 'not-measured';
    fill(
      this.stepStatus,
      report ? [h('strong', {}, 'Transfer step: '), verdictBadge(report.verdict), report.status === 'done' ? ' recorded' : '', report.note ? h('span', { class: 'muted' }, ` · ${report.note}`) : null] : null,
    );
  }

  shown(): void {
    void this.load().catch((error) => this.context.notices.fromError(error));
  }

  restyle(): void {
    restyleChart(this.chart);
    this.draw();
  }

  private async load(): Promise<void> {
    if (!this.context.store.state?.session) {
      this.points = [];
      this.fit = null;
      this.ideal = [];
      this.draw();
      return;
    }
    this.lastLoadMs = performance.now();
    const result = await this.context.client.transferPoints({});
    this.points = result.points;
    const rangeKey = result.controlRange ? `${result.controlRange.lowV}/${result.controlRange.highV}` : '';
    if (result.controlRange && rangeKey !== this.sweepDefaultsFor) {
      // Sweep the control range the design allows by default: the same range the Transfer and Limits steps judge,
      // so following the defaults never makes the Limits step fail (rounded inwards, never past an end).
      this.fromInput.value = String(Math.ceil(result.controlRange.lowV * 100) / 100);
      this.toInput.value = String(Math.floor(result.controlRange.highV * 100) / 100);
      this.sweepDefaultsFor = rangeKey;
    }
    this.range = result.controlRange;
    this.fit = result.fit;
    this.ideal = result.ideal;
    this.draw();
  }

  private async sweep(): Promise<void> {
    const fromV = Number(this.fromInput.value);
    const toV = Number(this.toInput.value);
    const periodS = Number(this.periodInput.value);
    if (![fromV, toV, periodS].every(Number.isFinite) || periodS <= 0) {
      this.context.notices.show('warning', 'The sweep needs numbers: from and to in volts, and a time above 0 s.');
      return;
    }
    await runAction(this.context, this.sweepButton, async () => {
      await this.context.client.setVirtualControl({ mode: 'sweep', fromV, toV, periodS });
      this.context.notices.show('info', `Sweeping the control voltage from ${fromV} V to ${toV} V over ${periodS} s.`);
    });
  }

  private draw(): void {
    const design = this.ideal.length > 0 ? { fromV: Math.min(...this.ideal.map((point) => point.controlV)), toV: Math.max(...this.ideal.map((point) => point.controlV)) } : { fromV: 0, toV: 5 };
    const range = transferRangeV(this.points, design);
    const x = this.chart.options.scales?.x;
    if (x) {
      x.min = range.fromV;
      x.max = range.toV;
    }
    const limits = this.context.store.liveSteps().find((step) => step.step === 'limits')?.readings ?? [];
    const alphaLimit = (key: string) => limits.find((reading) => reading.key === key)?.expected ?? null;
    const minDeg = alphaLimit('alphaMinDeg');
    const maxDeg = alphaLimit('alphaMaxDeg');
    const ramp = cssColour('ramp');
    this.chart.data.datasets = [
      pointsDataset('Measured', withAlpha(cssColour('gate'), 0.75), toPoints(this.points), { pointRadius: 2.5 }),
      lineDataset('Least-squares fit', cssColour('control'), this.fit ? fitLinePoints(this.fit, range.fromV, range.toV) : [], { borderWidth: 2.5 }),
      lineDataset('Ideal from the design', cssColour('sync'), toPoints(this.ideal), { borderDash: [7, 5], borderWidth: 2 }),
      lineDataset('Minimum α', ramp, minDeg !== null ? [{ x: range.fromV, y: minDeg }, { x: range.toV, y: minDeg }] : [], { borderDash: [2, 4] }),
      lineDataset('Maximum α', ramp, maxDeg !== null ? [{ x: range.fromV, y: maxDeg }, { x: range.toV, y: maxDeg }] : [], { borderDash: [2, 4] }),
    ];
    this.chart.update('none');
    const fit = this.fit;
    const entry = (label: string, value: string) => [h('dt', {}, label), h('dd', {}, value)];
    fill(
      this.stats,
      entry('Points', String(this.points.length)),
      entry('Gain', fit ? `${formatFixed(fit.gainDegPerV, '°', 2)} per volt` : '–'),
      entry('Offset', fit ? formatFixed(fit.offsetDeg, '°', 1) : '–'),
      entry('Largest deviation from the line', fit ? formatFixed(fit.maxDeviationDeg, '°', 2) : '–'),
      entry('Control range covered', fit ? `${formatSi(fit.controlMinV, 'V')} to ${formatSi(fit.controlMaxV, 'V')}` : '–'),
      entry('The design’s control range', this.range ? `${formatSi(this.range.lowV, 'V')} to ${formatSi(this.range.highV, 'V')}` : '–'),
    );
    this.canvas.setAttribute('aria-label', `Transfer curve: ${this.points.length} points${fit ? `, gain ${fit.gainDegPerV.toFixed(2)} degrees per volt` : ''}`);
    this.canvas.dataset.points = String(this.points.length);
    const sessionOpen = !!this.context.store.state?.session;
    this.recordButton.disabled = !sessionOpen;
    this.sweepPanel.hidden = this.context.store.health?.source?.kind === 'serial';
  }
}
