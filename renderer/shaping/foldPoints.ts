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

export function foldTracePoints(trace: FoldTrace, bucketCount: number, keepEnds = true): Point[] {
  const decimated = xyDecimateMinMax({ x: Float64Array.from(trace.deg), y: Float64Array.from(trace.v) }, { bucketCount, xMin: 0, xMax: 360.000001, keepEnds });
  const points: Point[] = new Array(decimated.x.length);
  for (let index = 0; index < decimated.x.length; index++) points[index] = { x: decimated.x[index], y: decimated.y[index] };
  return points;
}

export interface FoldResolution {
  /** Buckets for the newest cycle: about half the plot's width in pixels, every sample's peak kept. */
  bucketCount: number;
  /** Buckets for the faint earlier cycles (default an eighth of bucketCount, extremes only): they show spread, not detail. */
  olderBucketCount?: number;
  maxCycles?: number;
}

interface CyclePoints {
  fine: Record<FoldRole, Point[]>;
  coarse: Record<FoldRole, Point[]>;
  lowV: number;
  highV: number;
}

const emptyRoles = (): Record<FoldRole, Point[]> => ({ sync: [], ramp: [], gate: [], control: [] });

function cyclePoints(cycle: FoldCycle, resolution: FoldResolution, withFine: boolean): CyclePoints {
  const result: CyclePoints = { fine: emptyRoles(), coarse: emptyRoles(), lowV: Number.POSITIVE_INFINITY, highV: Number.NEGATIVE_INFINITY };
  const olderBuckets = resolution.olderBucketCount ?? Math.max(50, Math.round(resolution.bucketCount / 8));
  for (const role of foldRoles) {
    const trace = cycle[role];
    if (!trace || trace.deg.length === 0) continue;
    for (const volts of trace.v) {
      if (volts < result.lowV) result.lowV = volts;
      if (volts > result.highV) result.highV = volts;
    }
    if (withFine) result.fine[role] = foldTracePoints(trace, resolution.bucketCount);
    result.coarse[role] = foldTracePoints(trace, olderBuckets, false);
  }
  return result;
}

/**
 * Folded cycles to chart points. A cache keeps each cycle's points by its running index, so a new frame costs the
 * decimation of the one new cycle, not of all twenty.
 */
export class FoldPointsCache {
  private cache = new Map<string, CyclePoints>();
  private resolutionKey = '';

  points(cycles: readonly FoldCycle[], resolution: FoldResolution): FoldPoints {
    const key = `${resolution.bucketCount}/${resolution.olderBucketCount ?? ''}`;
    if (key !== this.resolutionKey) {
      this.cache.clear();
      this.resolutionKey = key;
    }
    const shown = cycles.slice(-(resolution.maxCycles ?? 20));
    const result: FoldPoints = { older: emptyRoles(), newest: emptyRoles(), firingDeg: [], zeroCrossingsDeg: [], lowV: Number.POSITIVE_INFINITY, highV: Number.NEGATIVE_INFINITY, cycles: shown.length };
    const next = new Map<string, CyclePoints>();
    shown.forEach((cycle, position) => {
      const isNewest = position === shown.length - 1;
      // Index and start time together: a restarted stream counts from 0 again.
      const cycleKey = `${cycle.index}@${cycle.startS}`;
      let entry = this.cache.get(cycleKey);
      if (!entry || (isNewest && entry.fine.ramp.length === 0 && cycle.ramp.deg.length > 0)) entry = cyclePoints(cycle, resolution, isNewest);
      next.set(cycleKey, entry);
      result.lowV = Math.min(result.lowV, entry.lowV);
      result.highV = Math.max(result.highV, entry.highV);
      for (const role of foldRoles) {
        if (isNewest) result.newest[role] = entry.fine[role];
        else if (entry.coarse[role].length > 0) {
          const target = result.older[role];
          if (target.length > 0) target.push(gap);
          for (const point of entry.coarse[role]) target.push(point);
        }
      }
      result.firingDeg.push(...cycle.firingDeg);
      if (isNewest) result.zeroCrossingsDeg = [...cycle.zeroCrossingsDeg];
    });
    this.cache = next;
    return result;
  }
}

/** One-off conversion (no cache). */
export function foldCyclesPoints(cycles: readonly FoldCycle[], resolution: FoldResolution): FoldPoints {
  return new FoldPointsCache().points(cycles, resolution);
}

/**
 * A volts range for the fold's fixed scale: rounded out to whole volts with a little margin, and never smaller
 * than the range already shown, so the scale does not jump from frame to frame.
 */
export function growScale(current: { lowV: number; highV: number } | null, lowV: number, highV: number): { lowV: number; highV: number } {
  if (!Number.isFinite(lowV) || !Number.isFinite(highV)) return current ?? { lowV: -1, highV: 1 };
  const margin = Math.max(0.5, (highV - lowV) * 0.05);
  // Round out to a step that gives clean ticks: 5 V for mains-sized swings, 2 V or 1 V for small ones.
  const span = highV - lowV + 2 * margin;
  const step = span > 20 ? 5 : span > 8 ? 2 : 1;
  const wantedLow = Math.floor((lowV - margin) / step) * step;
  const wantedHigh = Math.ceil((highV + margin) / step) * step;
  if (!current) return { lowV: wantedLow, highV: wantedHigh };
  return { lowV: Math.min(current.lowV, wantedLow), highV: Math.max(current.highV, wantedHigh) };
}
