/**
 * A unit's drift in the Logbook screen: each session's figures as recorded at its steps, the trend warnings in words,
 * and the ramp peak against the session's date (the axis the trend is fitted on).
 */
import { cssColour, createXyChart, lineDataset, restyleChart, type Chart } from '../charts/chartSetup';
import { fill, h } from '../dom/h';
import { outcomeBadge } from '../dom/outcomeBadge';
import { driftAxis } from '../shaping/driftAxis';
import { formatFixed, formatReading, formatSi } from '../shaping/formatSi';
import { runAction, type ScreenContext } from '../shell/screen';

type LineChart = Chart<'line', { x: number; y: number }[]>;

export class DriftPanel {
  readonly element = h('section', { class: 'panel stack', hidden: true, 'aria-label': 'Drift of the unit', 'data-testid': 'drift' });
  private chart: LineChart | null = null;

  constructor(private readonly context: ScreenContext) {}

  /** `benchOf` names the bench of a session the screen lists (null when it does not know it). */
  async show(unitSerial: string, benchOf: (sessionId: number) => string | null): Promise<void> {
    const result = await runAction(this.context, null, () => this.context.client.drift({ unitSerial }));
    if (!result) return;
    const axis = driftAxis(result.points.map((point) => point.startedAt));
    const canvas = h('canvas', { role: 'img', 'aria-label': `Ramp peak of unit ${unitSerial} across ${result.points.length} sessions, by date`, 'data-testid': 'drift-canvas', 'data-points': String(result.points.length) });
    fill(
      this.element,
      h('h2', {}, `Drift of unit ${unitSerial}`),
      h('p', { class: 'muted' }, 'Each session\'s figures as recorded at its steps: the board as it was signed for, after any trim.'),
      driftForecast(result.warnings, result.points.length),
      h(
        'table',
        { class: 'data' },
        h('thead', {}, h('tr', {}, ['Session', 'Bench', 'Date', 'Outcome', 'Ramp peak', 'Slope', 'α gain', 'α offset', 'Firing jitter (held control)'].map((title) => h('th', { scope: 'col' }, title)))),
        h(
          'tbody',
          {},
          result.points.map((point) =>
            h(
              'tr',
              {},
              h('td', {}, `#${point.sessionId}`),
              h('td', {}, benchOf(point.sessionId) ?? '–'),
              h('td', {}, new Date(point.startedAt).toLocaleString()),
              h('td', {}, outcomeBadge(point.outcome)),
              h('td', { class: 'number' }, formatSi(point.rampPeakV, 'V')),
              h('td', { class: 'number' }, formatReading(point.slopeVPerMs, 'V/ms')),
              h('td', { class: 'number' }, point.alphaGainDegPerV === null ? '–' : `${point.alphaGainDegPerV.toFixed(2)}°/V`),
              h('td', { class: 'number' }, formatFixed(point.alphaOffsetDeg, '°')),
              h('td', { class: 'number' }, formatFixed(point.alphaJitterDeg, '°', 2)),
            ),
          ),
        ),
      ),
      h('div', { class: 'plot small' }, canvas),
    );
    this.element.hidden = false;
    this.chart?.destroy();
    const chart = createXyChart(canvas, { xTitle: axis.title, yTitle: 'Ramp peak', xTick: axis.tick, yTick: (value) => `${Number(value.toFixed(3))} V`, tooltip: true });
    this.chart = chart;
    const peaks = result.points.map((point) => point.rampPeakV).filter((value): value is number => value !== null);
    if (peaks.length > 0 && chart.options.scales?.y) {
      // At least ±5 % around the mean, so millivolts of noise do not look like drift.
      const mean = peaks.reduce((sum, value) => sum + value, 0) / peaks.length;
      const half = Math.max((Math.max(...peaks) - Math.min(...peaks)) * 0.6, Math.abs(mean) * 0.05);
      chart.options.scales.y.min = mean - half;
      chart.options.scales.y.max = mean + half;
    }
    const plotted = result.points.flatMap((point, index) => (point.rampPeakV === null ? [] : [{ x: axis.days[index], y: point.rampPeakV }]));
    chart.data.datasets = [lineDataset('Ramp peak', cssColour('ramp'), plotted, { pointRadius: 4, borderWidth: 2 })];
    chart.update('none');
  }

  hide(): void {
    this.element.hidden = true;
  }

  restyle(): void {
    if (this.chart) restyleChart(this.chart);
  }
}

/** The trend warnings in words with an icon (never colour alone); a plain line when no trend heads for a limit. */
function driftForecast(warnings: readonly string[], sessions: number): HTMLElement {
  if (warnings.length === 0) {
    return sessions < 3
      ? h('p', { class: 'muted', 'data-testid': 'drift-forecast' }, 'A trend with its uncertainty needs at least three sessions of this unit.')
      : h('p', { 'data-testid': 'drift-forecast' }, 'No trend heads for a tolerance limit.');
  }
  return h(
    'div',
    { class: 'drift-warnings', role: 'alert', 'data-testid': 'drift-forecast' },
    warnings.map((warning) => h('p', {}, h('span', { 'aria-hidden': 'true' }, '⚠ '), h('strong', {}, 'Trend warning: '), warning)),
  );
}
