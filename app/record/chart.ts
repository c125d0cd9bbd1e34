/**
 * A plain x-y chart as a Figure: axes with round-number ticks, then series of a few kinds (lines, point markers,
 * filled bands, histogram bars, vertical and horizontal markers). Every plot of the record is one of these.
 */
import { pathFromPoints, type Figure, type FigureItem } from './figure';

export const chartInk = { axis: '#3b3f45', grid: '#d5d8dc', text: '#23262a', muted: '#6b7178' };

export type ChartSeries =
  | { kind: 'line'; x: ArrayLike<number>; y: ArrayLike<number>; colour: string; widthPx?: number; dash?: number[]; opacity?: number }
  | { kind: 'points'; x: ArrayLike<number>; y: ArrayLike<number>; colour: string; sizePx?: number; shape?: 'square' | 'diamond' }
  | { kind: 'band'; x: ArrayLike<number>; lower: ArrayLike<number>; upper: ArrayLike<number>; colour: string; opacity?: number }
  | { kind: 'bars'; from: ArrayLike<number>; to: ArrayLike<number>; height: ArrayLike<number>; colour: string; opacity?: number }
  | { kind: 'vertical'; at: number; colour: string; label?: string; dash?: number[]; widthPx?: number }
  | { kind: 'horizontal'; at: number; colour: string; label?: string; dash?: number[]; widthPx?: number };

export interface ChartSpec {
  title: string;
  widthPx?: number;
  heightPx?: number;
  xLabel: string;
  yLabel: string;
  xRange?: readonly [number, number];
  yRange?: readonly [number, number];
  /** Fixed x tick positions (the fold's 0, 90, 180, 270, 360), else round numbers. */
  xTicks?: readonly number[];
  series: ChartSeries[];
  /** Legend entries, drawn along the top. */
  legend?: Array<{ label: string; colour: string }>;
}

/** Round-number ticks (1, 2, 5 x 10^n steps) covering [low, high] with about `count` intervals (common practice). */
export function niceTicks(low: number, high: number, count = 5): number[] {
  if (!(high > low)) return [low];
  const raw = (high - low) / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((factor) => factor * power).find((candidate) => candidate >= raw) ?? 10 * power;
  const ticks: number[] = [];
  for (let value = Math.ceil(low / step - 1e-9) * step; value <= high + step * 1e-9; value += step) ticks.push(Math.abs(value) < step * 1e-9 ? 0 : value);
  return ticks;
}

export function formatTick(value: number): string {
  if (value === 0) return '0';
  const size = Math.abs(value);
  if (size >= 1000 || size < 0.01) return value.toExponential(1);
  return Number(value.toPrecision(4)).toString();
}

function extentOf(series: readonly ChartSeries[], axis: 'x' | 'y'): [number, number] {
  let low = Number.POSITIVE_INFINITY;
  let high = Number.NEGATIVE_INFINITY;
  const take = (values: ArrayLike<number>) => {
    for (let i = 0; i < values.length; i++) {
      if (!Number.isFinite(values[i])) continue;
      low = Math.min(low, values[i]);
      high = Math.max(high, values[i]);
    }
  };
  for (const item of series) {
    if (item.kind === 'line' || item.kind === 'points') take(axis === 'x' ? item.x : item.y);
    else if (item.kind === 'band') {
      if (axis === 'x') take(item.x);
      else {
        take(item.lower);
        take(item.upper);
      }
    } else if (item.kind === 'bars') {
      if (axis === 'x') {
        take(item.from);
        take(item.to);
      } else {
        take(item.height);
        take([0]);
      }
    } else if (item.kind === 'vertical' && axis === 'x') take([item.at]);
    else if (item.kind === 'horizontal' && axis === 'y') take([item.at]);
  }
  if (low === Number.POSITIVE_INFINITY) return [0, 1];
  if (low === high) return [low - (Math.abs(low) || 1) * 0.1, high + (Math.abs(high) || 1) * 0.1];
  const margin = (high - low) * 0.05;
  return [low - margin, high + margin];
}

export function buildChart(spec: ChartSpec): Figure {
  const widthPx = spec.widthPx ?? 640;
  const heightPx = spec.heightPx ?? 300;
  const left = 62;
  const right = 16;
  const top = spec.legend && spec.legend.length > 0 ? 40 : 24;
  const bottom = 44;
  const [xLow, xHigh] = spec.xRange ?? extentOf(spec.series, 'x');
  const [yLow, yHigh] = spec.yRange ?? extentOf(spec.series, 'y');
  const plotW = widthPx - left - right;
  const plotH = heightPx - top - bottom;
  const sx = (x: number) => left + ((x - xLow) / (xHigh - xLow)) * plotW;
  const sy = (y: number) => top + plotH - ((y - yLow) / (yHigh - yLow)) * plotH;
  const clampY = (y: number) => Math.min(top + plotH, Math.max(top, y));
  const items: FigureItem[] = [];
  const text = (x: number, y: number, value: string, anchor: 'start' | 'middle' | 'end', colour = chartInk.text, sizePx = 11) =>
    items.push({ kind: 'text', x, y, text: value, sizePx, colour, anchor });

  const xTicks = (spec.xTicks ?? niceTicks(xLow, xHigh)).filter((tick) => tick >= xLow - 1e-9 && tick <= xHigh + 1e-9);
  const yTicks = niceTicks(yLow, yHigh);
  for (const tick of xTicks) {
    items.push({ kind: 'path', d: pathFromPoints([[sx(tick), top], [sx(tick), top + plotH]]), stroke: chartInk.grid, fill: null, widthPx: 0.6 });
    text(sx(tick), top + plotH + 14, formatTick(tick), 'middle', chartInk.muted, 10);
  }
  for (const tick of yTicks) {
    items.push({ kind: 'path', d: pathFromPoints([[left, sy(tick)], [left + plotW, sy(tick)]]), stroke: chartInk.grid, fill: null, widthPx: 0.6 });
    text(left - 6, sy(tick) + 3.5, formatTick(tick), 'end', chartInk.muted, 10);
  }
  items.push({ kind: 'path', d: pathFromPoints([[left, top], [left, top + plotH], [left + plotW, top + plotH]]), stroke: chartInk.axis, fill: null, widthPx: 1 });
  text(left + plotW / 2, heightPx - 8, spec.xLabel, 'middle');
  text(6, top - 8, spec.yLabel, 'start');

  const inside = (x: number, y: number) => Number.isFinite(x) && Number.isFinite(y) && x >= xLow && x <= xHigh && y >= yLow && y <= yHigh;
  for (const series of spec.series) {
    switch (series.kind) {
      case 'line': {
        // Split at gaps (non-finite values) so a missing reading never draws a false segment.
        let run: Array<[number, number]> = [];
        const flush = () => {
          if (run.length > 1) items.push({ kind: 'path', d: pathFromPoints(run), stroke: series.colour, fill: null, widthPx: series.widthPx ?? 1.4, dash: series.dash, opacity: series.opacity });
          run = [];
        };
        for (let i = 0; i < series.x.length; i++) {
          if (!Number.isFinite(series.x[i]) || !Number.isFinite(series.y[i])) flush();
          else run.push([sx(series.x[i]), clampY(sy(series.y[i]))]);
        }
        flush();
        break;
      }
      case 'points': {
        const size = (series.sizePx ?? 5) / 2;
        const shapes: string[] = [];
        for (let i = 0; i < series.x.length; i++) {
          if (!inside(series.x[i], series.y[i])) continue;
          const x = sx(series.x[i]);
          const y = sy(series.y[i]);
          shapes.push(
            series.shape === 'diamond'
              ? pathFromPoints([[x, y - size], [x + size, y], [x, y + size], [x - size, y]], true)
              : pathFromPoints([[x - size, y - size], [x + size, y - size], [x + size, y + size], [x - size, y + size]], true),
          );
        }
        if (shapes.length > 0) items.push({ kind: 'path', d: shapes.join(' '), stroke: series.colour, fill: series.colour, widthPx: 0.5 });
        break;
      }
      case 'band': {
        const upper: Array<[number, number]> = [];
        const lower: Array<[number, number]> = [];
        for (let i = 0; i < series.x.length; i++) {
          if (!Number.isFinite(series.lower[i]) || !Number.isFinite(series.upper[i])) continue;
          upper.push([sx(series.x[i]), clampY(sy(series.upper[i]))]);
          lower.push([sx(series.x[i]), clampY(sy(series.lower[i]))]);
        }
        if (upper.length > 1) items.push({ kind: 'path', d: pathFromPoints([...upper, ...lower.reverse()], true), stroke: null, fill: series.colour, widthPx: 0, opacity: series.opacity ?? 0.18 });
        break;
      }
      case 'bars': {
        const rectangles: string[] = [];
        for (let i = 0; i < series.height.length; i++) {
          if (!(series.height[i] > 0)) continue;
          const x0 = sx(series.from[i]);
          const x1 = sx(series.to[i]);
          const y0 = sy(0);
          const y1 = clampY(sy(series.height[i]));
          rectangles.push(pathFromPoints([[x0, y0], [x1, y0], [x1, y1], [x0, y1]], true));
        }
        if (rectangles.length > 0) items.push({ kind: 'path', d: rectangles.join(' '), stroke: series.colour, fill: series.colour, widthPx: 0.6, opacity: series.opacity ?? 0.55 });
        break;
      }
      case 'vertical': {
        if (!(series.at >= xLow && series.at <= xHigh)) break;
        items.push({ kind: 'path', d: pathFromPoints([[sx(series.at), top], [sx(series.at), top + plotH]]), stroke: series.colour, fill: null, widthPx: series.widthPx ?? 1, dash: series.dash });
        // Labels near the right edge go on the line's left, at the bottom, clear of horizontal markers' labels and trends.
        if (series.label) {
          const nearRight = sx(series.at) > left + plotW * 0.6;
          text(sx(series.at) + (nearRight ? -3 : 3), nearRight ? top + plotH - 6 : top + 11, series.label, nearRight ? 'end' : 'start', series.colour, 10);
        }
        break;
      }
      case 'horizontal': {
        if (!(series.at >= yLow && series.at <= yHigh)) break;
        items.push({ kind: 'path', d: pathFromPoints([[left, sy(series.at)], [left + plotW, sy(series.at)]]), stroke: series.colour, fill: null, widthPx: series.widthPx ?? 1, dash: series.dash });
        if (series.label) text(left + 4, sy(series.at) - 4, series.label, 'start', series.colour, 10);
        break;
      }
    }
  }
  let legendX = left;
  for (const entry of spec.legend ?? []) {
    items.push({ kind: 'path', d: pathFromPoints([[legendX, 14], [legendX + 10, 14], [legendX + 10, 22], [legendX, 22]], true), stroke: entry.colour, fill: entry.colour, widthPx: 0.5 });
    text(legendX + 14, 22, entry.label, 'start');
    legendX += 24 + entry.label.length * 6.2;
  }
  return { widthPx, heightPx, title: spec.title, items };
}
