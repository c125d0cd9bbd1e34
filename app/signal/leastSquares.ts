/**
 * Straight-line least squares, y = slope x + intercept (ordinary least squares, any numerical-methods text).
 * Sums are taken about the means (two-pass), so large offsets such as absolute times in seconds lose no precision.
 */
export interface LineFit {
  slope: number;
  intercept: number;
  /** Points used. */
  count: number;
  /** Largest |y - fit(x)| over the points used. */
  maxAbsResidual: number;
  /** Root of the mean squared residual. */
  rmsResidual: number;
}

/**
 * Fits points `from`..`to - 1` of the two arrays. Needs at least two distinct x values, else returns null.
 * `residuals: false` leaves out the pass over the residuals (their figures are then 0), as in fitIndexLine.
 */
export function fitLine(x: ArrayLike<number>, y: ArrayLike<number>, options: { from?: number; to?: number; residuals?: boolean } = {}): LineFit | null {
  const from = Math.max(0, options.from ?? 0);
  const to = Math.min(x.length, y.length, options.to ?? x.length);
  const count = to - from;
  if (count < 2) return null;
  let meanX = 0;
  let meanY = 0;
  for (let i = from; i < to; i++) {
    meanX += x[i];
    meanY += y[i];
  }
  meanX /= count;
  meanY /= count;
  let sxx = 0;
  let sxy = 0;
  for (let i = from; i < to; i++) {
    const dx = x[i] - meanX;
    sxx += dx * dx;
    sxy += dx * (y[i] - meanY);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  let maxAbsResidual = 0;
  let sumSquares = 0;
  if (options.residuals ?? true) {
    for (let i = from; i < to; i++) {
      const residual = y[i] - (slope * x[i] + intercept);
      sumSquares += residual * residual;
      if (Math.abs(residual) > maxAbsResidual) maxAbsResidual = Math.abs(residual);
    }
  }
  return { slope, intercept, count, maxAbsResidual, rmsResidual: Math.sqrt(sumSquares / count) };
}

/**
 * The same fit, one point at a time in constant memory (Welford-style running co-moments), for streams:
 * mains frequency drift over an hour, crossing times, the transfer curve.
 */
export class LineAccumulator {
  count = 0;
  private meanX = 0;
  private meanY = 0;
  private comomentXX = 0;
  private comomentXY = 0;
  private comomentYY = 0;

  add(x: number, y: number): void {
    this.count += 1;
    const dx = x - this.meanX;
    this.meanX += dx / this.count;
    const dy = y - this.meanY;
    this.meanY += dy / this.count;
    // Welford's update: the second factor uses the new mean, which keeps the sums exact in exact arithmetic.
    this.comomentXX += dx * (x - this.meanX);
    this.comomentXY += dx * (y - this.meanY);
    this.comomentYY += dy * (y - this.meanY);
  }

  /** Slope and intercept, or null with fewer than two distinct x values. */
  fit(): { slope: number; intercept: number } | null {
    if (this.count < 2 || !(this.comomentXX > 0)) return null;
    const slope = this.comomentXY / this.comomentXX;
    return { slope, intercept: this.meanY - slope * this.meanX };
  }

  get xRange(): number {
    return this.count < 2 ? 0 : Math.sqrt((12 * this.comomentXX) / this.count);
  }

  get meanOfX(): number {
    return this.meanX;
  }

  get meanOfY(): number {
    return this.meanY;
  }

  /** Sum of squared residuals about the fitted line. */
  get residualSumOfSquares(): number {
    if (this.count < 2 || !(this.comomentXX > 0)) return 0;
    return Math.max(0, this.comomentYY - (this.comomentXY * this.comomentXY) / this.comomentXX);
  }
}

/**
 * The same fit with x = the sample position (from .. to - 1): the sums over x are closed-form (sum of (i - mean)^2 =
 * n (n^2 - 1) / 12), so one pass gives slope and intercept and a second, only when asked, the residuals.
 */
export function fitIndexLine(values: ArrayLike<number>, from: number, to: number, options: { residuals?: boolean } = {}): LineFit | null {
  const start = Math.max(0, from);
  const end = Math.min(values.length, to);
  const count = end - start;
  if (count < 2) return null;
  const centre = (start + end - 1) / 2;
  let sumY = 0;
  let sumXY = 0;
  for (let i = start; i < end; i++) {
    const y = values[i];
    sumY += y;
    sumXY += (i - centre) * y;
  }
  const sumXX = (count * (count * count - 1)) / 12;
  const slope = sumXY / sumXX;
  const intercept = sumY / count - slope * centre;
  let maxAbsResidual = 0;
  let sumSquares = 0;
  if (options.residuals) {
    for (let i = start; i < end; i++) {
      const residual = values[i] - (slope * i + intercept);
      sumSquares += residual * residual;
      if (Math.abs(residual) > maxAbsResidual) maxAbsResidual = Math.abs(residual);
    }
  }
  return { slope, intercept, count, maxAbsResidual, rmsResidual: Math.sqrt(sumSquares / count) };
}
