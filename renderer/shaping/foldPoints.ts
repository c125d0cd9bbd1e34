/**
 * From the contract's folded cycles to chart points: one array per signal role holding every older cycle,
 * separated by a gap point (NaN breaks the line in the chart), and the newest cycle on its own so it can be drawn
 * stronger. Each trace goes through min-max decimation first (peaks survive). DOM-free for unit tests.
 */
import type { FoldCycle, FoldTrace } from '../../app/contract/readings';
import { xyDecimateMinMax } from './decimateMinMax';

export interface Point {
  x: number;
  y: number;
}

export type FoldRole = 'sync' | 'ramp' | 'gate' | 'control';
export const foldRoles: readonly FoldRole[] = ['sync', 'ramp', 'gate', 'control'];

export interface FoldPoints {
  older: Record<FoldRole, Point[]>;
  newest: Record<FoldRole, Point[]>;
  /** Every firing point of the shown cycles (degrees), oldest first. */
  firingDeg: number[];
  /** Zero crossings of the newest cycle (degrees). */
  zeroCrossingsDeg: number[];
  /** Lowest and highest volts over all shown traces, for a scale that only grows. */
  lowV: number;
  highV: number;
  cycles: number;
}

const gap: Point = { x: Number.NaN, y: Number.NaN };

export function foldTracePoints(trace: FoldTrace, bucketCount: number): Point[] {
  const decimated = xyDecimateMinMax({ x: Float64Array.from(trace.deg), y: Float64Array.from(trace.v) }, { bucketCount, xMin: 0, xMax: 360.000001 });
  const points: Point[] = new Array(decimated.x.length);
  for (let index = 0; index < decimated.x.length; index++) points[index] = { x: decimated.x[index], y: decimated.y[index] };
  return points;
}

/** `bucketCount` per cycle: about half the plot's width in pixels keeps every peak and costs little to draw. */
export function foldCyclesPoints(cycles: readonly FoldCycle[], options: { bucketCount: number; maxCycles?: number }): FoldPoints {
  const shown = cycles.slice(-(options.maxCycles ?? 20));
  const empty = (): Record<FoldRole, Point[]> => ({ sync: [], ramp: [], gate: [], control: [] });
  const result: FoldPoints = { older: empty(), newest: empty(), firingDeg: [], zeroCrossingsDeg: [], lowV: Number.POSITIVE_INFINITY, highV: Number.NEGATIVE_INFINITY, cycles: shown.length };
  shown.forEach((cycle, index) => {
    const isNewest = index === shown.length - 1;
    for (const role of foldRoles) {
      const trace = cycle[role];
      if (!trace || trace.deg.length === 0) continue;
      for (const volts of trace.v) {
        if (volts < result.lowV) result.lowV = volts;
        if (volts > result.highV) result.highV = volts;
      }
      const points = foldTracePoints(trace, options.bucketCount);
      if (isNewest) result.newest[role] = points;
      else {
        const target = result.older[role];
        if (target.length > 0) target.push(gap);
        for (const point of points) target.push(point);
      }
    }
    result.firingDeg.push(...cycle.firingDeg);
    if (isNewest) result.zeroCrossingsDeg = [...cycle.zeroCrossingsDeg];
  });
  return result;
}

/**
 * A volts range for the fold's fixed scale: rounded out to whole volts with a little margin, and never smaller
 * than the range already shown, so the scale does not jump from frame to frame.
 */
export function growScale(current: { lowV: number; highV: number } | null, lowV: number, highV: number): { lowV: number; highV: number } {
  if (!Number.isFinite(lowV) || !Number.isFinite(highV)) return current ?? { lowV: -1, highV: 1 };
  const margin = Math.max(0.5, (highV - lowV) * 0.05);
  const wantedLow = Math.floor(lowV - margin);
  const wantedHigh = Math.ceil(highV + margin);
  if (!current) return { lowV: wantedLow, highV: wantedHigh };
  return { lowV: Math.min(current.lowV, wantedLow), highV: Math.max(current.highV, wantedHigh) };
}
