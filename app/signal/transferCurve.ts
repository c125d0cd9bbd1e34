/**
 * The transfer curve (firing angle against control voltage) in constant memory: a running least-squares line
 * (gain deg/V, offset deg) and the convex hull of the points. The largest |residual| from any line is reached at a
 * vertex of the hull (|residual| is convex in the point), so the max deviation from linear is exact without keeping
 * every point; a hull of noisy near-linear points stays small.
 * Points on a smooth curved transfer (an Early-effect ramp) can all lie on the hull, so it is capped: past
 * `maxHullVertices` the flattest vertices (least height above the chord of their neighbours) are dropped down to
 * half the cap. The max deviation may then read a little low; the largest height dropped in one step is kept in
 * `thinningErrorDeg` as an estimate of how much (our rule; not a strict bound, since drops next to each other can
 * add up, but for a dense sweep the heights are far below the firing jitter).
 * The hull holds control voltages to the nearest nanovolt, far below any logger's resolution: a control a hair above
 * zero (5e-324 V, met by a property test) made the hull's cross products underflow to zero, and a vertex was dropped
 * as collinear. The line fit keeps the values as given.
 */
import { LineAccumulator } from './leastSquares';

export interface TransferFitReading {
  points: number;
  gainDegPerV: number;
  offsetDeg: number;
  maxDeviationDeg: number;
  controlMinV: number;
  controlMaxV: number;
  /** Estimate of how much the hull cap may have lowered maxDeviationDeg (0 while the hull was never thinned). */
  thinningErrorDeg: number;
}

interface Point {
  x: number;
  y: number;
}

/** A hull point: `x` the control to the nearest nanovolt (the geometry), `controlV` as given (the residual). */
interface HullPoint extends Point {
  controlV: number;
}

export class TransferCurveAccumulator {
  private readonly line = new LineAccumulator();
  private hull: HullPoint[] = [];
  private controlMinV = Number.POSITIVE_INFINITY;
  private controlMaxV = Number.NEGATIVE_INFINITY;
  private readonly maxHullVertices: number;
  private thinningErrorDeg = 0;

  constructor(options: { maxHullVertices?: number } = {}) {
    this.maxHullVertices = Math.max(8, options.maxHullVertices ?? 256);
  }

  get hullSize(): number {
    return this.hull.length;
  }

  get points(): number {
    return this.line.count;
  }

  add(controlV: number, alphaDeg: number): void {
    if (!Number.isFinite(controlV) || !Number.isFinite(alphaDeg)) return;
    this.line.add(controlV, alphaDeg);
    if (controlV < this.controlMinV) this.controlMinV = controlV;
    if (controlV > this.controlMaxV) this.controlMaxV = controlV;
    const point = { x: Math.round(controlV * 1e9) / 1e9, y: alphaDeg, controlV };
    if (this.hull.length >= 3 && insideConvex(this.hull, point)) return;
    this.hull = convexHull([...this.hull, point]);
    if (this.hull.length > this.maxHullVertices) this.thin();
  }

  /** Drops the flattest vertices until half the cap remains; remembers the largest vertical height dropped. */
  private thin(): void {
    const target = this.maxHullVertices >> 1;
    while (this.hull.length > target) {
      let flattest = -1;
      let flattestHeight = Number.POSITIVE_INFINITY;
      const count = this.hull.length;
      for (let i = 0; i < count; i++) {
        const before = this.hull[(i + count - 1) % count];
        const vertex = this.hull[i];
        const after = this.hull[(i + 1) % count];
        // Extreme control voltages stay: they set the range.
        if (vertex.controlV === this.controlMinV || vertex.controlV === this.controlMaxV || after.x === before.x) continue;
        const chordY = before.y + ((vertex.x - before.x) * (after.y - before.y)) / (after.x - before.x);
        const height = Math.abs(vertex.y - chordY);
        if (height < flattestHeight) {
          flattestHeight = height;
          flattest = i;
        }
      }
      if (flattest < 0) break;
      this.thinningErrorDeg = Math.max(this.thinningErrorDeg, flattestHeight);
      this.hull.splice(flattest, 1);
    }
  }

  /**
   * Null until there are 3 points spread over at least `minimumRangeV` of control (default 0.05 V):
   * a gain fitted to a fixed control voltage means nothing.
   */
  reading(options: { minimumRangeV?: number } = {}): TransferFitReading | null {
    const fit = this.line.fit();
    if (!fit || this.line.count < 3 || this.controlMaxV - this.controlMinV < (options.minimumRangeV ?? 0.05)) return null;
    let maxDeviationDeg = 0;
    for (const vertex of this.hull) {
      maxDeviationDeg = Math.max(maxDeviationDeg, Math.abs(vertex.y - (fit.slope * vertex.controlV + fit.intercept)));
    }
    return {
      points: this.line.count,
      gainDegPerV: fit.slope,
      offsetDeg: fit.intercept,
      maxDeviationDeg,
      controlMinV: this.controlMinV,
      controlMaxV: this.controlMaxV,
      thinningErrorDeg: this.thinningErrorDeg,
    };
  }
}

function cross(o: Point, a: Point, b: Point): number {
  return (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
}

/** Andrew's monotone chain; counter-clockwise, collinear points dropped. */
export function convexHull<P extends Point>(points: readonly P[]): P[] {
  const sorted = [...points].sort((a, b) => a.x - b.x || a.y - b.y);
  if (sorted.length < 3) return sorted;
  const lower: P[] = [];
  for (const point of sorted) {
    while (lower.length >= 2 && cross(lower[lower.length - 2], lower[lower.length - 1], point) <= 0) lower.pop();
    lower.push(point);
  }
  const upper: P[] = [];
  for (let i = sorted.length - 1; i >= 0; i--) {
    const point = sorted[i];
    while (upper.length >= 2 && cross(upper[upper.length - 2], upper[upper.length - 1], point) <= 0) upper.pop();
    upper.push(point);
  }
  lower.pop();
  upper.pop();
  return lower.concat(upper);
}

function insideConvex(hull: readonly Point[], point: Point): boolean {
  for (let i = 0; i < hull.length; i++) {
    if (cross(hull[i], hull[(i + 1) % hull.length], point) < 0) return false;
  }
  return true;
}
