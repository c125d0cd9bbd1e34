/**
 * Transfer curve helpers: the fitted and ideal lines as two-point segments over the control range, the plot's
 * fixed ranges, and the points as CSV for export. DOM-free for unit tests.
 */
import type { TransferFit, TransferPoint } from '../../app/contract/readings';
import type { Point } from './foldPoints';

/** alpha = offset + gain * control, drawn across [fromV, toV]. */
export function fitLinePoints(fit: TransferFit, fromV: number, toV: number): Point[] {
  return [
    { x: fromV, y: fit.offsetDeg + fit.gainDegPerV * fromV },
    { x: toV, y: fit.offsetDeg + fit.gainDegPerV * toV },
  ];
}

/** A control-volts range that holds every point and the ideal line, rounded out to half volts. */
export function transferRangeV(points: readonly { controlV: number }[], fallback: { fromV: number; toV: number }): { fromV: number; toV: number } {
  if (points.length === 0) return fallback;
  let low = Number.POSITIVE_INFINITY;
  let high = Number.NEGATIVE_INFINITY;
  for (const point of points) {
    low = Math.min(low, point.controlV);
    high = Math.max(high, point.controlV);
  }
  return { fromV: Math.floor(Math.min(low, fallback.fromV) * 2) / 2, toV: Math.ceil(Math.max(high, fallback.toV) * 2) / 2 };
}

/** CSV with a header naming each column and its unit, one row per point (RFC 4180 line ends). */
export function transferPointsCsv(points: readonly TransferPoint[]): string {
  const rows = ['t_s,control_V,alpha_deg', ...points.map((point) => `${point.t},${point.controlV},${point.alphaDeg}`)];
  return `${rows.join('\r\n')}\r\n`;
}

export function toPoints(points: readonly TransferPoint[]): Point[] {
  return points.map((point) => ({ x: point.controlV, y: point.alphaDeg }));
}
