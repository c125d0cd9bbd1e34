/**
 * Drift of one figure across a unit's sessions: the ordinary least-squares line of the figure against days since the
 * unit's first session, with the slope's standard error sqrt(sum of squared residuals / (n - 2) / Sxx)
 * (common practice: simple linear regression).
 */
import type { DriftTrend } from './logbookTypes';

const msPerDay = 86_400_000;

export function driftTrend(points: ReadonlyArray<{ atMs: number; value: number | null }>): DriftTrend | null {
  const known = points.filter((point): point is { atMs: number; value: number } => point.value !== null && Number.isFinite(point.value));
  if (known.length < 2) return null;
  const originMs = Math.min(...known.map((point) => point.atMs));
  const days = known.map((point) => (point.atMs - originMs) / msPerDay);
  const values = known.map((point) => point.value);
  const n = known.length;
  const meanDay = days.reduce((a, b) => a + b, 0) / n;
  const meanValue = values.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i += 1) {
    sxx += (days[i] - meanDay) ** 2;
    sxy += (days[i] - meanDay) * (values[i] - meanValue);
  }
  if (sxx === 0) return null; // all sessions at the same instant: no trend to speak of
  const perDay = sxy / sxx;
  const intercept = meanValue - perDay * meanDay;
  let perDayStandardError: number | null = null;
  if (n > 2) {
    let residuals = 0;
    for (let i = 0; i < n; i += 1) residuals += (values[i] - (intercept + perDay * days[i])) ** 2;
    perDayStandardError = Math.sqrt(residuals / (n - 2) / sxx);
  }
  return { perDay, perDayStandardError, intercept, sessions: n };
}
