/**
 * Drift of one figure of a unit across its sessions: the least-squares line against days since the first session
 * (regression.ts), and whether that line will cross a tolerance limit. The forecast is the inverse use of the fitted
 * line (Draper and Smith, Applied Regression Analysis, "inverse prediction"; from memory):
 *   central estimate: the day where intercept + slope day = limit;
 *   range: the days where the 95 % two-sided confidence band of the fitted line, fitted +- t(0.975, n-2) se(day),
 *          reaches the limit (earliest: the band edge nearer the limit; latest: the far edge, which may never reach it);
 *   confidence: the probability that the true slope points towards the limit, P(T < slope / se(slope)) with Student's t
 *          on n - 2 degrees of freedom (one-sided test of the slope's sign).
 * Our rule: warn when the central crossing falls within the horizon (default one year after the last session) and
 * that confidence is at least 90 %, or when the line is already beyond the limit at the last session. Sessions that
 * all lie within a day (a unit measured, trimmed and measured again) show a change, not a drift: no trend per day is
 * stated or forecast from them (our rule).
 */
import { fitLinear, fittedStandardError, studentTCdf, studentTQuantile, type LinearFit } from './regression';

export const msPerDay = 86_400_000;

export interface DriftSample {
  sessionId: number;
  startedAt: string;
  value: number | null;
}

export interface DriftLimits {
  low: number | null;
  high: number | null;
}

export interface DriftOptions {
  /** How far past the last session a crossing still counts (days). Default 365. */
  horizonDays?: number;
  /** Smallest slope-sign confidence that raises the warning. Default 0.9. */
  minimumConfidence?: number;
  /** Shortest time from the first session to the last over which a trend is stated (days). Default 1. */
  minimumSpanDays?: number;
  /** The figure's unit, for the sentence ("trend +0.0123 V per day"). */
  unit?: string;
}

export interface CrossingForecast {
  side: 'low' | 'high';
  limit: number;
  status: 'already-beyond' | 'predicted' | 'beyond-horizon' | 'moving-away' | 'flat';
  /** Days since the first session, central estimate; null when the line never reaches the limit ahead. */
  crossingDay: number | null;
  crossingAt: string | null;
  earliestAt: string | null;
  /** Null when the far edge of the band never reaches the limit within ten horizons. */
  latestAt: string | null;
  /** P(true slope points towards this limit); null with two sessions (no degrees of freedom). */
  confidence: number | null;
}

export interface DriftAnalysis {
  points: Array<{ sessionId: number; startedAt: string; day: number; value: number }>;
  originMs: number;
  fit: LinearFit | null;
  forecasts: CrossingForecast[];
  warning: boolean;
  /** One sentence for the record, or null with no trend to state. */
  message: string | null;
}

const isoDay = (originMs: number, day: number): string => new Date(originMs + day * msPerDay).toISOString().slice(0, 10);

/** First day in (fromDay, toDay] where f changes sign, by scanning then bisecting; null when it never does. */
function firstRoot(f: (day: number) => number, fromDay: number, toDay: number): number | null {
  const steps = 2000;
  let previousDay = fromDay;
  let previous = f(fromDay);
  if (previous === 0) return fromDay;
  for (let step = 1; step <= steps; step++) {
    const day = fromDay + ((toDay - fromDay) * step) / steps;
    const value = f(day);
    if (Math.sign(value) !== Math.sign(previous)) {
      let low = previousDay;
      let high = day;
      for (let i = 0; i < 60; i++) {
        const middle = (low + high) / 2;
        if (Math.sign(f(middle)) === Math.sign(previous)) low = middle;
        else high = middle;
      }
      return (low + high) / 2;
    }
    previousDay = day;
    previous = value;
  }
  return null;
}

function forecastOne(fit: LinearFit, side: 'low' | 'high', limit: number, lastDay: number, originMs: number, horizonDays: number): CrossingForecast {
  const direction = side === 'high' ? 1 : -1;
  const fitted = (day: number) => fit.intercept + fit.slope * day;
  const standardError = fit.slopeStandardError;
  const confidence = standardError === null || standardError === 0 ? null : studentTCdf((direction * fit.slope) / standardError, fit.n - 2);
  const base = { side, limit, confidence };
  if (direction * (fitted(lastDay) - limit) >= 0) {
    return { ...base, status: 'already-beyond', crossingDay: null, crossingAt: null, earliestAt: null, latestAt: null };
  }
  if (fit.slope === 0) return { ...base, status: 'flat', crossingDay: null, crossingAt: null, earliestAt: null, latestAt: null };
  const quantile = fit.n > 2 ? studentTQuantile(0.975, fit.n - 2) : 0;
  const band = (edge: 1 | -1) => (day: number) => fitted(day) + edge * direction * quantile * (fittedStandardError(fit, day) ?? 0) - limit;
  const searchTo = lastDay + 10 * horizonDays;
  const earliest = firstRoot(band(1), lastDay, searchTo);
  const latest = firstRoot(band(-1), lastDay, searchTo);
  if (direction * fit.slope < 0) {
    return { ...base, status: 'moving-away', crossingDay: null, crossingAt: null, earliestAt: earliest === null ? null : isoDay(originMs, earliest), latestAt: null };
  }
  const crossingDay = (limit - fit.intercept) / fit.slope;
  return {
    ...base,
    status: crossingDay - lastDay <= horizonDays ? 'predicted' : 'beyond-horizon',
    crossingDay,
    crossingAt: isoDay(originMs, crossingDay),
    earliestAt: earliest === null ? null : isoDay(originMs, earliest),
    latestAt: latest === null ? null : isoDay(originMs, latest),
  };
}

export function analyseDrift(samples: readonly DriftSample[], limits: DriftLimits, options: DriftOptions = {}): DriftAnalysis {
  const horizonDays = options.horizonDays ?? 365;
  const minimumConfidence = options.minimumConfidence ?? 0.9;
  const known = samples.filter((sample): sample is DriftSample & { value: number } => sample.value !== null && Number.isFinite(sample.value));
  const originMs = known.length > 0 ? Math.min(...known.map((sample) => Date.parse(sample.startedAt))) : 0;
  const points = known.map((sample) => ({ sessionId: sample.sessionId, startedAt: sample.startedAt, day: (Date.parse(sample.startedAt) - originMs) / msPerDay, value: sample.value }));
  const fit = fitLinear(points.map((point) => point.day), points.map((point) => point.value));
  if (!fit) return { points, originMs, fit: null, forecasts: [], warning: false, message: null };
  const lastDay = Math.max(...points.map((point) => point.day));
  const minimumSpanDays = options.minimumSpanDays ?? 1;
  if (lastDay < minimumSpanDays) {
    const hours = lastDay * 24;
    const span = hours < 1 ? `${Math.round(hours * 60)} min` : `${hours.toFixed(1)} h`;
    const message = `${fit.n} sessions within ${span}: too short a time to tell a drift (a trend needs sessions at least ${minimumSpanDays === 1 ? 'a day' : `${minimumSpanDays} days`} apart).`;
    return { points, originMs, fit: null, forecasts: [], warning: false, message };
  }
  const forecasts: CrossingForecast[] = [];
  if (limits.high !== null) forecasts.push(forecastOne(fit, 'high', limits.high, lastDay, originMs, horizonDays));
  if (limits.low !== null) forecasts.push(forecastOne(fit, 'low', limits.low, lastDay, originMs, horizonDays));
  const alarming = forecasts.find((forecast) => forecast.status === 'already-beyond' || (forecast.status === 'predicted' && (forecast.confidence ?? 0) >= minimumConfidence));
  return { points, originMs, fit, forecasts, warning: alarming !== undefined, message: describeDrift(fit, forecasts, alarming ?? null, options.unit) };
}

function percent(value: number | null): string {
  if (value === null) return 'unknown (two sessions give no uncertainty)';
  // Never print a certainty the fit cannot give: beyond four nines say so rather than round to 100 %.
  if (value > 0.9999) return 'above 99.99 %';
  return `${(100 * value).toFixed(value > 0.999 ? 2 : 1)} %`;
}

function describeDrift(fit: LinearFit, forecasts: readonly CrossingForecast[], alarming: CrossingForecast | null, unit: string | undefined): string {
  const perDay = unit ? ` ${unit} per day` : ' per day';
  const se = fit.slopeStandardError === null ? '' : ` (standard error ${fit.slopeStandardError.toPrecision(2)}${perDay})`;
  const trend = `trend ${fit.slope >= 0 ? '+' : ''}${fit.slope.toPrecision(3)}${perDay}${se} over ${fit.n} sessions`;
  const withUnit = (value: number): string => `${value.toPrecision(4)}${unit ? ` ${unit}` : ''}`;
  const chosen = alarming ?? forecasts.find((forecast) => forecast.status === 'predicted' || forecast.status === 'beyond-horizon') ?? null;
  if (!chosen) return `${trend}; no tolerance limit ahead of the line.`;
  const limitWord = chosen.side === 'high' ? 'upper' : 'lower';
  if (chosen.status === 'already-beyond') return `${trend}; the line is already beyond the ${limitWord} limit ${withUnit(chosen.limit)} at the last session.`;
  const range = chosen.earliestAt === null ? '' : ` (95 % band: ${chosen.earliestAt} to ${chosen.latestAt ?? 'not within ten horizons'})`;
  const verb = chosen.status === 'predicted' ? 'will cross' : 'would cross, beyond the horizon,';
  return `${trend}; the line ${verb} the ${limitWord} limit ${withUnit(chosen.limit)} around ${chosen.crossingAt}${range}; confidence that the trend points that way: ${percent(chosen.confidence)}.`;
}
