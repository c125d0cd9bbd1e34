/**
 * Min-max decimation before data reaches the chart: the x range is cut into buckets (about one per device
 * pixel pair) and each bucket keeps its first, lowest, highest and last sample in their original order.
 * Peaks, glitches and gate pulses survive, which plain every-nth-sample thinning would lose (common practice
 * for drawing long records on a raster display). DOM-free so it is unit-tested in Node.
 */
export interface XYSeries {
  x: Float64Array;
  y: Float64Array;
}

export interface DecimateOptions {
  /** Number of buckets across [xMin, xMax); at most four points survive per bucket. */
  bucketCount: number;
  xMin: number;
  xMax: number;
  /**
   * Keep each bucket's first and last sample as well as its extremes (default true): exact joins between buckets.
   * Without them a bucket gives at most two points, half the drawing work, for faint background traces.
   */
  keepEnds?: boolean;
}

export function xyDecimateMinMax(series: XYSeries, options: DecimateOptions): XYSeries {
  const { bucketCount, xMin, xMax } = options;
  const perBucket = options.keepEnds === false ? 2 : 4;
  const length = Math.min(series.x.length, series.y.length);
  if (!(bucketCount >= 1) || !(xMax > xMin)) throw new TypeError('decimation needs bucketCount >= 1 and xMax > xMin');
  if (length <= bucketCount * perBucket) return { x: series.x.slice(0, length), y: series.y.slice(0, length) };

  const keptIndex = new Int32Array(bucketCount * 4);
  let keptCount = 0;
  const bucketWidth = (xMax - xMin) / bucketCount;
  let bucket = -1;
  let firstIndex = -1;
  let lastIndex = -1;
  let minIndex = -1;
  let maxIndex = -1;

  const flush = (): void => {
    if (firstIndex < 0) return;
    // The four candidates in sample order, without repeats.
    const candidates = perBucket === 4 ? [firstIndex, minIndex, maxIndex, lastIndex].sort((a, b) => a - b) : minIndex < maxIndex ? [minIndex, maxIndex] : [maxIndex, minIndex];
    let previous = -1;
    for (const index of candidates) {
      if (index !== previous) keptIndex[keptCount++] = index;
      previous = index;
    }
  };

  for (let index = 0; index < length; index++) {
    const x = series.x[index];
    const y = series.y[index];
    if (!Number.isFinite(x) || !Number.isFinite(y) || x < xMin || x >= xMax) continue;
    const pointBucket = Math.min(bucketCount - 1, Math.floor((x - xMin) / bucketWidth));
    if (pointBucket !== bucket) {
      flush();
      if (keptCount + 4 > keptIndex.length) break; // x went backwards too often: not a monotonic record
      bucket = pointBucket;
      firstIndex = minIndex = maxIndex = index;
    }
    lastIndex = index;
    if (y < series.y[minIndex]) minIndex = index;
    if (y > series.y[maxIndex]) maxIndex = index;
  }
  flush();

  const x = new Float64Array(keptCount);
  const y = new Float64Array(keptCount);
  for (let k = 0; k < keptCount; k++) {
    x[k] = series.x[keptIndex[k]];
    y[k] = series.y[keptIndex[k]];
  }
  return { x, y };
}
