/**
 * Fleet view of a board design: how one figure (ramp peak, alpha gain) spreads over all units built to it, as a
 * histogram, with the board model's Monte Carlo prediction (app/board/toleranceAnalysis.ts) overlaid as the count
 * each bin should hold: units x (Phi((to - mean)/sd) - Phi((from - mean)/sd)), a normal curve with the Monte Carlo
 * mean and standard deviation (common practice for comparing a histogram with a model).
 * Alpha gain is not in the tolerance report, so its prediction is carried over from the ramp peak to first order:
 * gain is inverse to the ramp slope, and the peak is the slope times the charging time, so
 * gain mean = nominal gain x nominal peak / mean peak and sd(gain) / gain = sd(peak) / peak (first-order error
 * propagation, common practice).
 */
import type { Spread } from '../board/toleranceAnalysis';
import { normalCdf } from './regression';

export interface HistogramBin {
  fromValue: number;
  toValue: number;
  count: number;
  /** Units the prediction expects in this bin; null without a prediction. */
  predicted: number | null;
}

export interface FleetFigure {
  key: 'rampPeakV' | 'alphaGainDegPerV';
  label: string;
  unit: string;
  values: number[];
  prediction: { mean: number; standardDeviation: number; nominal: number } | null;
  bins: HistogramBin[];
  /** Units beyond the prediction's mean +- 3 sd: worth a look (our rule). */
  outliers: number;
}

/** Bin edges over the values and the prediction's +-3 sd, `binCount` equal bins (default: Sturges' rule, ceil(log2 n) + 1, at least 12). */
export function histogramBins(values: readonly number[], prediction: FleetFigure['prediction'], options: { binCount?: number } = {}): HistogramBin[] {
  const finite = values.filter(Number.isFinite);
  const candidates = [...finite];
  if (prediction && prediction.standardDeviation > 0) candidates.push(prediction.mean - 3 * prediction.standardDeviation, prediction.mean + 3 * prediction.standardDeviation);
  if (candidates.length === 0) return [];
  let low = Math.min(...candidates);
  let high = Math.max(...candidates);
  if (high === low) {
    low -= Math.abs(low) * 0.01 || 0.01;
    high += Math.abs(high) * 0.01 || 0.01;
  }
  // At least 12 bins: the span includes the prediction's +-3 sd, often far wider than a good fleet's own spread.
  const binCount = options.binCount ?? Math.max(12, Math.ceil(Math.log2(Math.max(finite.length, 1))) + 1);
  const width = (high - low) / binCount;
  const bins: HistogramBin[] = [];
  for (let index = 0; index < binCount; index++) {
    const fromValue = low + index * width;
    const toValue = index === binCount - 1 ? high : low + (index + 1) * width;
    const predicted = prediction && prediction.standardDeviation > 0
      ? finite.length * (normalCdf((toValue - prediction.mean) / prediction.standardDeviation) - normalCdf((fromValue - prediction.mean) / prediction.standardDeviation))
      : null;
    bins.push({ fromValue, toValue, count: 0, predicted });
  }
  for (const value of finite) {
    const index = Math.min(binCount - 1, Math.max(0, Math.floor((value - low) / width)));
    bins[index].count += 1;
  }
  return bins;
}

export function fleetFigure(key: FleetFigure['key'], values: readonly number[], prediction: FleetFigure['prediction'], options: { binCount?: number } = {}): FleetFigure {
  const label = key === 'rampPeakV' ? 'Ramp peak' : 'Alpha gain';
  const unit = key === 'rampPeakV' ? 'V' : 'deg/V';
  const outliers = prediction && prediction.standardDeviation > 0 ? values.filter((value) => Math.abs(value - prediction.mean) > 3 * prediction.standardDeviation).length : 0;
  return { key, label, unit, values: [...values], prediction, bins: histogramBins(values, prediction, options), outliers };
}

/** The alpha-gain prediction carried over from the Monte Carlo ramp peak (first order, see the file comment). */
export function gainPredictionFromPeak(peak: Spread, nominalGainDegPerV: number): FleetFigure['prediction'] {
  if (!(peak.mean > 0) || !(peak.nominal > 0)) return null;
  return {
    nominal: nominalGainDegPerV,
    mean: (nominalGainDegPerV * peak.nominal) / peak.mean,
    standardDeviation: Math.abs(nominalGainDegPerV) * (peak.standardDeviation / peak.nominal),
  };
}
