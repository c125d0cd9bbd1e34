/**
 * The record's plots as Figures (chart.ts): the cycle fold, the transfer curve with its fit (one session or two
 * overlaid), a figure's drift across sessions with the trend, its 95 % band and the tolerance limits, and the fleet
 * histogram with the Monte Carlo prediction. Signal colours from NAMING.md.
 */
import type { FoldCycle } from '../contract/readings';
import { buildChart, chartInk, type ChartSeries } from './chart';
import type { DriftAnalysis, DriftLimits } from './drift';
import type { Figure } from './figure';
import type { FleetFigure } from './fleet';
import { fittedStandardError, studentTQuantile } from './regression';

/** NAMING.md, "Colour". */
export const signalColours = { sync: '#5b6b82', ramp: '#d9622b', gate: '#8e4fb0', control: '#2f7d5b' } as const;
/** A second session drawn beside the first: slate, so it never reads as a signal of its own. */
const secondColour = signalColours.sync;

export function foldFigure(cycles: readonly FoldCycle[], options: { title?: string; widthPx?: number } = {}): Figure {
  const series: ChartSeries[] = [];
  cycles.forEach((cycle, index) => {
    // Older cycles fainter, the newest full strength: the eye reads the spread and the latest at once.
    const opacity = cycles.length === 1 ? 1 : 0.35 + (0.65 * index) / (cycles.length - 1);
    series.push({ kind: 'line', x: cycle.sync.deg, y: cycle.sync.v, colour: signalColours.sync, widthPx: 1, opacity });
    series.push({ kind: 'line', x: cycle.ramp.deg, y: cycle.ramp.v, colour: signalColours.ramp, widthPx: 1.3, opacity });
    series.push({ kind: 'line', x: cycle.gate.deg, y: cycle.gate.v, colour: signalColours.gate, widthPx: 1, opacity });
    if (cycle.control) series.push({ kind: 'line', x: cycle.control.deg, y: cycle.control.v, colour: signalColours.control, widthPx: 1, opacity });
  });
  const last = cycles[cycles.length - 1];
  if (last) {
    for (const deg of last.zeroCrossingsDeg) series.push({ kind: 'vertical', at: deg, colour: signalColours.sync, dash: [4, 3], label: deg > 350 ? undefined : 'zero crossing' });
    for (const deg of last.firingDeg) series.push({ kind: 'vertical', at: deg, colour: signalColours.gate, widthPx: 1.4, label: `firing ${deg.toFixed(1)} deg` });
  }
  const legend = [
    { label: 'sync', colour: signalColours.sync },
    { label: 'ramp', colour: signalColours.ramp },
    { label: 'gate', colour: signalColours.gate },
    ...(cycles.some((cycle) => cycle.control) ? [{ label: 'control', colour: signalColours.control }] : []),
  ];
  return buildChart({
    title: options.title ?? `Cycle fold: ${cycles.length} cycles overlaid, electrical degrees 0-360`,
    widthPx: options.widthPx,
    xLabel: 'electrical degrees from the zero crossing',
    yLabel: 'V',
    xRange: [0, 360],
    xTicks: [0, 45, 90, 135, 180, 225, 270, 315, 360],
    series,
    legend,
  });
}

export interface TransferSet {
  label: string;
  points: ReadonlyArray<{ controlV: number; alphaDeg: number }>;
  fit: { gainDegPerV: number; offsetDeg: number; controlMinV: number; controlMaxV: number } | null;
}

export function transferFigure(sets: readonly TransferSet[], options: { title?: string; widthPx?: number } = {}): Figure {
  const colours = [signalColours.gate, secondColour];
  const series: ChartSeries[] = [];
  sets.forEach((set, index) => {
    const colour = colours[index % colours.length];
    series.push({ kind: 'points', x: set.points.map((point) => point.controlV), y: set.points.map((point) => point.alphaDeg), colour, sizePx: 4, shape: index === 0 ? 'square' : 'diamond' });
    if (set.fit) {
      const xs = [set.fit.controlMinV, set.fit.controlMaxV];
      series.push({ kind: 'line', x: xs, y: xs.map((x) => set.fit!.offsetDeg + set.fit!.gainDegPerV * x), colour: signalColours.control, widthPx: 1.6, dash: index === 0 ? undefined : [6, 3] });
    }
  });
  return buildChart({
    title: options.title ?? 'Transfer curve: firing angle against control voltage, with the least-squares line',
    widthPx: options.widthPx,
    xLabel: 'control voltage (V)',
    yLabel: 'alpha (deg)',
    series,
    legend: [...sets.map((set, index) => ({ label: set.label, colour: colours[index % colours.length] })), { label: 'least-squares line', colour: signalColours.control }],
  });
}

export function driftFigure(analysis: DriftAnalysis, limits: DriftLimits, labels: { label: string; unit: string }, options: { widthPx?: number; heightPx?: number } = {}): Figure {
  const series: ChartSeries[] = [];
  const { fit } = analysis;
  const lastDay = analysis.points.length > 0 ? Math.max(...analysis.points.map((point) => point.day)) : 0;
  const crossing = analysis.forecasts.find((forecast) => forecast.crossingDay !== null && forecast.status === 'predicted');
  const endDay = Math.max(lastDay * 1.25 + 1, crossing?.crossingDay !== undefined && crossing.crossingDay !== null ? crossing.crossingDay * 1.05 : 0);
  if (fit) {
    const days = Array.from({ length: 41 }, (_, index) => (endDay * index) / 40);
    const quantile = fit.n > 2 ? studentTQuantile(0.975, fit.n - 2) : 0;
    const centre = days.map((day) => fit.intercept + fit.slope * day);
    if (fit.n > 2) {
      const half = days.map((day) => quantile * (fittedStandardError(fit, day) ?? 0));
      series.push({ kind: 'band', x: days, lower: centre.map((value, index) => value - half[index]), upper: centre.map((value, index) => value + half[index]), colour: signalColours.ramp, opacity: 0.15 });
    }
    series.push({ kind: 'line', x: days, y: centre, colour: signalColours.ramp, widthPx: 1.4, dash: [5, 3] });
  }
  series.push({ kind: 'points', x: analysis.points.map((point) => point.day), y: analysis.points.map((point) => point.value), colour: signalColours.ramp, sizePx: 6 });
  if (limits.high !== null) series.push({ kind: 'horizontal', at: limits.high, colour: chartInk.axis, dash: [2, 2], label: `upper limit ${limits.high.toPrecision(4)}` });
  if (limits.low !== null) series.push({ kind: 'horizontal', at: limits.low, colour: chartInk.axis, dash: [2, 2], label: `lower limit ${limits.low.toPrecision(4)}` });
  if (crossing?.crossingDay !== null && crossing?.crossingDay !== undefined) series.push({ kind: 'vertical', at: crossing.crossingDay, colour: signalColours.gate, label: `crossing ${crossing.crossingAt}` });
  return buildChart({
    title: `Drift of ${labels.label.toLowerCase()} across sessions, least-squares trend with its 95 % band`,
    widthPx: options.widthPx ?? 420,
    heightPx: options.heightPx ?? 240,
    xLabel: 'days since the first session',
    yLabel: `${labels.label} (${labels.unit})`,
    series,
  });
}

/** `highlight`: one unit's value marked on the fleet (a unit against its design's fleet). */
export function fleetHistogramFigure(figure: FleetFigure, options: { widthPx?: number; highlight?: { label: string; value: number } | null } = {}): Figure {
  const series: ChartSeries[] = [
    { kind: 'bars', from: figure.bins.map((bin) => bin.fromValue), to: figure.bins.map((bin) => bin.toValue), height: figure.bins.map((bin) => bin.count), colour: signalColours.ramp },
  ];
  if (figure.bins.some((bin) => bin.predicted !== null)) {
    series.push({ kind: 'line', x: figure.bins.map((bin) => (bin.fromValue + bin.toValue) / 2), y: figure.bins.map((bin) => bin.predicted ?? Number.NaN), colour: signalColours.control, widthPx: 1.8 });
  }
  if (figure.prediction) series.push({ kind: 'vertical', at: figure.prediction.nominal, colour: signalColours.control, dash: [4, 3], label: 'design' });
  if (options.highlight) series.push({ kind: 'vertical', at: options.highlight.value, colour: signalColours.gate, widthPx: 2, label: options.highlight.label });
  return buildChart({
    title: `Fleet: ${figure.label.toLowerCase()} over ${figure.values.length} units, with the Monte Carlo prediction`,
    widthPx: options.widthPx ?? 420,
    heightPx: 240,
    xLabel: `${figure.label} (${figure.unit})`,
    yLabel: 'units',
    series,
    legend: [{ label: 'units measured', colour: signalColours.ramp }, { label: 'Monte Carlo prediction', colour: signalColours.control }],
  });
}
