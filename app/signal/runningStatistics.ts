/**
 * Constant-memory statistics for streams (an hour of cycles costs what a minute does).
 * Mean and variance by Welford's method (Welford 1962; Knuth, TAOCP vol. 2, 4.2.2).
 */
export class RunningStatistics {
  count = 0;
  private meanValue = 0;
  private sumSquaredDeviations = 0;
  min = Number.POSITIVE_INFINITY;
  max = Number.NEGATIVE_INFINITY;

  add(value: number): void {
    this.count += 1;
    const delta = value - this.meanValue;
    this.meanValue += delta / this.count;
    this.sumSquaredDeviations += delta * (value - this.meanValue);
    if (value < this.min) this.min = value;
    if (value > this.max) this.max = value;
  }

  get mean(): number | null {
    return this.count > 0 ? this.meanValue : null;
  }

  /** Sample standard deviation (n - 1), 0 for a single value, null for none. */
  get standardDeviation(): number | null {
    if (this.count === 0) return null;
    if (this.count === 1) return 0;
    return Math.sqrt(this.sumSquaredDeviations / (this.count - 1));
  }

  get minimum(): number | null {
    return this.count > 0 ? this.min : null;
  }

  get maximum(): number | null {
    return this.count > 0 ? this.max : null;
  }
}

/** Median of an array (average of the two middle values for an even count), null when empty. */
export function medianOf(values: ArrayLike<number>): number | null {
  if (values.length === 0) return null;
  const sorted = Float64Array.from(values).sort();
  const middle = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

/**
 * Median of a stream in bounded memory: exact up to `blockSize` values; beyond that each full block is reduced to
 * its median and the result is the median of the block medians, the part-filled block's median counted as one more
 * (our rule: memory grows by one number per `blockSize` values, 8192 by default, one number per ~80 s of half-cycles).
 */
export class StreamingMedian {
  private readonly blockSize: number;
  private readonly current: Float64Array;
  private filled = 0;
  private readonly blockMedians: number[] = [];
  count = 0;

  constructor(options: { blockSize?: number } = {}) {
    this.blockSize = Math.max(3, options.blockSize ?? 8192);
    this.current = new Float64Array(this.blockSize);
  }

  add(value: number): void {
    this.count += 1;
    this.current[this.filled++] = value;
    if (this.filled === this.blockSize) {
      this.blockMedians.push(medianOf(this.current) as number);
      this.filled = 0;
    }
  }

  get median(): number | null {
    if (this.blockMedians.length === 0) return medianOf(this.current.subarray(0, this.filled));
    const pool: number[] = [];
    for (const blockMedian of this.blockMedians) pool.push(blockMedian);
    if (this.filled > 0) pool.push(medianOf(this.current.subarray(0, this.filled)) as number);
    return medianOf(pool);
  }
}
