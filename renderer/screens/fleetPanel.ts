/**
 * The fleet of the chosen unit's board design, in the Logbook screen: a histogram per figure (ramp peak, alpha
 * gain) of every unit's latest session, the board model's Monte Carlo prediction over it, and the unit marked;
 * when the units come from more than one bench (a shared logbook), a table of each bench's units and mean figures,
 * so a bench that reads apart from the line shows.
 */
import { outcomeCounts, type FleetView } from '../../app/contract/records';
import { createXyChart, cssColour, lineDataset, restyleChart, withAlpha, type Chart } from '../charts/chartSetup';
import { h, fill } from '../dom/h';
import { formatSi } from '../shaping/formatSi';
import { fleetPlacementText, histogramOutline, predictedPoints } from '../shaping/fleetShapes';
import { runAction, type ScreenContext } from '../shell/screen';

type LineChart = Chart<'line', { x: number; y: number }[]>;

export class FleetPanel {
  readonly element = h('section', { class: 'panel stack', hidden: true, 'aria-label': 'Fleet of the board design', 'data-testid': 'fleet' });
  private charts: LineChart[] = [];

  constructor(private readonly context: ScreenContext) {}

  async show(designName: string, unitSerial: string): Promise<void> {
    const view = await runAction(this.context, null, () => this.context.client.fleet({ designName, unitSerial }));
    if (!view) return;
    this.render(view);
  }

  hide(): void {
    this.element.hidden = true;
  }

  restyle(): void {
    for (const chart of this.charts) restyleChart(chart);
  }

  private render(view: FleetView): void {
    for (const chart of this.charts) chart.destroy();
    this.charts = [];
    const plots = view.figures.map((figure) => {
      const canvas = h('canvas', { role: 'img', 'aria-label': `${figure.label} of ${figure.count} units, with the board model's prediction`, 'data-testid': `fleet-canvas-${figure.key}`, 'data-units': String(figure.count) });
      return { figure, canvas, block: h('div', { class: 'stack' }, h('h3', {}, `${figure.label} (${figure.unit})`), h('div', { class: 'plot small' }, canvas), h('p', { 'data-testid': `fleet-text-${figure.key}` }, fleetPlacementText(figure))) };
    });
    fill(
      this.element,
      h('h2', {}, `Fleet of ${view.designName}: ${view.units} unit${view.units === 1 ? '' : 's'}`),
      h('p', { class: 'muted', 'data-testid': 'fleet-outcomes' }, `Each unit's latest session, as recorded at its steps (${outcomeCounts(view.outcomes)}). The line is what the board model expects from the parts' tolerances (Monte Carlo), as units per bin.`),
      h('div', { class: 'fleet-plots' }, plots.map((plot) => plot.block)),
      h(
        'div',
        { class: 'plot-caption' },
        h('span', {}, h('span', { class: 'swatch ramp', 'aria-hidden': 'true' }), 'units (histogram)'),
        h('span', {}, h('span', { class: 'swatch control', 'aria-hidden': 'true' }), 'board model'),
        h('span', {}, h('span', { class: 'swatch gate', 'aria-hidden': 'true' }), 'this unit (dashed)'),
      ),
      view.benches.length > 1 ? benchTable(view.benches) : null,
    );
    this.element.hidden = false;
    for (const { figure, canvas } of plots) {
      const chart = createXyChart(canvas, { xTitle: `${figure.label} (${figure.unit})`, yTitle: 'Units', xTick: (value) => `${Number(value.toPrecision(4))}`, yTick: (value) => (Number.isInteger(value) ? String(value) : ''), tooltip: true });
      const outline = histogramOutline(figure.bins);
      const predicted = predictedPoints(figure.bins);
      const top = Math.max(1, ...outline.map((point) => point.y), ...predicted.map((point) => point.y));
      const scales = chart.options.scales;
      if (scales?.y) {
        scales.y.min = 0;
        scales.y.max = Math.ceil(top * 1.15);
      }
      if (scales?.x && figure.bins.length > 0) {
        scales.x.min = figure.bins[0].fromValue;
        scales.x.max = figure.bins[figure.bins.length - 1].toValue;
      }
      chart.data.datasets = [
        lineDataset('Units', cssColour('ramp'), outline, { borderWidth: 1.5, fill: 'origin', backgroundColor: withAlpha(cssColour('ramp'), 0.25) }),
        lineDataset('Board model', cssColour('control'), predicted, { borderWidth: 2 }),
        ...(figure.marked ? [lineDataset(`Unit ${figure.marked.serial}`, cssColour('gate'), [{ x: figure.marked.value, y: 0 }, { x: figure.marked.value, y: top * 1.1 }], { borderWidth: 2, borderDash: [6, 4] })] : []),
      ];
      chart.update('none');
      this.charts.push(chart);
    }
  }
}

function benchTable(benches: FleetView['benches']): HTMLElement {
  return h(
    'div',
    { class: 'stack', 'data-testid': 'fleet-benches' },
    h('h3', {}, 'By bench'),
    h('p', { class: 'muted' }, 'Each unit counts once, under the bench that did its latest session.'),
    h(
      'table',
      { class: 'data' },
      h('thead', {}, h('tr', {}, ['Bench', 'Units', 'Mean ramp peak', 'Mean alpha gain'].map((title, column) => h('th', { scope: 'col', class: column > 0 ? 'number' : null }, title)))),
      h('tbody', {}, benches.map((bench) => h('tr', {}, h('td', { class: 'nowrap' }, bench.bench ?? '–'), h('td', { class: 'number' }, String(bench.units)), h('td', { class: 'number' }, formatSi(bench.rampPeakMeanV, 'V')), h('td', { class: 'number' }, bench.alphaGainMeanDegPerV === null ? '–' : `${bench.alphaGainMeanDegPerV.toFixed(2)}°/V`)))),
    ),
  );
}
