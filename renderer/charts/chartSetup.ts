/**
 * chart.js, registered once with only what the screens draw (tree-shaken bundle), plus colours read from the
 * page's CSS so a theme change restyles every chart. All charts: `parsing: false` (data already in {x, y}),
 * no animation, fixed scales set by the caller.
 */
import { Chart, Filler, LinearScale, LineController, LineElement, PointElement, ScatterController, Tooltip, type ChartConfiguration, type ChartDataset, type Plugin } from 'chart.js';

Chart.register(LineController, ScatterController, LineElement, PointElement, LinearScale, Filler, Tooltip);

export { Chart };

export type RoleColour = 'sync' | 'ramp' | 'gate' | 'control' | 'text' | 'muted' | 'grid' | 'plot-bg' | 'ok' | 'bad' | 'marginal';

export function cssColour(name: RoleColour): string {
  return getComputedStyle(document.documentElement).getPropertyValue(`--${name}`).trim() || '#888888';
}

/** `#rrggbb` with an opacity, as `rgba()` (for pale bands and faded older cycles). */
export function withAlpha(hex: string, alpha: number): string {
  const match = /^#?([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex.trim());
  if (!match) return hex;
  return `rgba(${parseInt(match[1], 16)}, ${parseInt(match[2], 16)}, ${parseInt(match[3], 16)}, ${alpha})`;
}

export interface XyChartOptions {
  xTitle: string;
  yTitle: string;
  xMin?: number;
  xMax?: number;
  yMin?: number;
  yMax?: number;
  xStep?: number;
  xTick?: (value: number) => string;
  yTick?: (value: number) => string;
  /** Show a tooltip on hover (off for the live fold: it costs frame time). */
  tooltip?: boolean;
  /** Drawing of our own on top of the datasets (markers). */
  plugins?: Plugin<'line'>[];
}

export type XyDataset = ChartDataset<'line', { x: number; y: number }[]>;

export function createXyChart(canvas: HTMLCanvasElement, options: XyChartOptions): Chart<'line', { x: number; y: number }[]> {
  const config: ChartConfiguration<'line', { x: number; y: number }[]> = {
    type: 'line',
    data: { datasets: [] },
    plugins: options.plugins ?? [],
    options: {
      parsing: false,
      normalized: true,
      animation: false,
      responsive: true,
      maintainAspectRatio: false,
      spanGaps: false,
      events: options.tooltip ? ['mousemove', 'mouseout'] : [],
      elements: { point: { radius: 0, hitRadius: 6 }, line: { borderWidth: 1.5, tension: 0 } },
      plugins: { legend: { display: false }, tooltip: { enabled: options.tooltip ?? false, intersect: false } },
      scales: {
        x: axis(options.xTitle, options.xMin, options.xMax, options.xTick, options.xStep),
        y: axis(options.yTitle, options.yMin, options.yMax, options.yTick),
      },
    },
  };
  return new Chart(canvas, config);
}

function axis(title: string, min: number | undefined, max: number | undefined, tick?: (value: number) => string, step?: number) {
  return {
    type: 'linear' as const,
    min,
    max,
    title: { display: true, text: title, color: cssColour('muted') },
    grid: { color: cssColour('grid') },
    ticks: { color: cssColour('muted'), stepSize: step, maxRotation: 0, autoSkip: true, callback: tick ? (value: string | number) => tick(Number(value)) : undefined },
  };
}

/** Re-read the theme colours into a chart's axes (after the light/dark switch). */
export function restyleChart(chart: Chart<'line', { x: number; y: number }[]>): void {
  for (const scale of ['x', 'y'] as const) {
    const options = chart.options.scales?.[scale];
    if (!options) continue;
    if (options.grid) options.grid.color = cssColour('grid');
    if (options.ticks) options.ticks.color = cssColour('muted');
    if ('title' in options && options.title) options.title.color = cssColour('muted');
  }
  chart.update('none');
}

export function lineDataset(label: string, colour: string, data: { x: number; y: number }[], extra: Partial<XyDataset> = {}): XyDataset {
  return { label, data, borderColor: colour, backgroundColor: colour, pointRadius: 0, borderWidth: 1.5, fill: false, ...extra };
}

export function pointsDataset(label: string, colour: string, data: { x: number; y: number }[], extra: Partial<XyDataset> = {}): XyDataset {
  return { label, data, borderColor: colour, backgroundColor: colour, showLine: false, pointRadius: 3, pointHoverRadius: 5, ...extra };
}
