/**
 * Zero crossings of the sync signal, block by block in constant memory.
 * - The DC offset is the mean over the last whole cycle (rising crossing to rising crossing), so a
 *   transformer's or logger's offset does not shift the crossings and partial cycles do not bias it.
 * - Hysteresis: a crossing counts only when the signal passes from below -band to above +band (or back),
 *   band = 30 % of the amplitude by default, so noise near zero never makes extra crossings (common practice).
 * - The instant is the zero of a least-squares line through the samples inside the band plus the two bracketing
 *   samples outside it: near a zero crossing a sine is close to a straight line and odd about the crossing, so the
 *   fit is unbiased and uses every sample the band holds; with only the two bracketing samples it is plain linear
 *   interpolation (IEEE 181 crossing instants).
 */
export type CrossingDirection = 'rising' | 'falling';

export interface ZeroCrossing {
  /** Sub-sample position in the stream's sample numbering (see `push`). */
  index: number;
  direction: CrossingDirection;
}

export interface SyncLevels {
  offsetV: number;
  amplitudeV: number;
}

export interface ZeroCrossingOptions {
  /** Half-width of the hysteresis band as a fraction of the amplitude (default 0.3). */
  bandFraction?: number;
  /** Longest run of samples kept inside the band (a dead sync must not grow memory): default 20000. */
  maxBandSamples?: number;
}

export class ZeroCrossingTracker {
  private offsetV: number;
  private amplitudeV: number;
  private readonly bandFraction: number;
  private readonly maxBandSamples: number;
  private state: 'unknown' | 'low' | 'high' = 'unknown';
  // Samples inside the band since the signal last left it, as (index, value - offset at entry).
  private bandIndex: Float64Array;
  private bandValue: Float64Array;
  private bandCount = 0;
  private entryIndex = Number.NaN;
  private entryValue = Number.NaN;
  // Whole-cycle sums for the offset and amplitude of the next cycle.
  private cycleSumV = 0;
  private cycleCount = 0;
  private cycleMinV = Number.POSITIVE_INFINITY;
  private cycleMaxV = Number.NEGATIVE_INFINITY;
  private seenRising = false;

  constructor(levels: SyncLevels, options: ZeroCrossingOptions = {}) {
    this.offsetV = levels.offsetV;
    this.amplitudeV = levels.amplitudeV;
    this.bandFraction = options.bandFraction ?? 0.3;
    this.maxBandSamples = options.maxBandSamples ?? 20000;
    this.bandIndex = new Float64Array(64);
    this.bandValue = new Float64Array(64);
  }

  get levels(): SyncLevels {
    return { offsetV: this.offsetV, amplitudeV: this.amplitudeV };
  }

  /** Forgets the partial state (after a gap); keeps the offset and amplitude learned so far. */
  restart(): void {
    this.state = 'unknown';
    this.bandCount = 0;
    this.entryIndex = Number.NaN;
    this.cycleSumV = 0;
    this.cycleCount = 0;
    this.cycleMinV = Number.POSITIVE_INFINITY;
    this.cycleMaxV = Number.NEGATIVE_INFINITY;
    this.seenRising = false;
  }

  /** Feeds samples numbered `firstIndex`, `firstIndex + 1`, ... and returns the crossings they complete. */
  push(values: ArrayLike<number>, firstIndex: number): ZeroCrossing[] {
    const crossings: ZeroCrossing[] = [];
    for (let i = 0; i < values.length; i++) {
      const value = values[i];
      const index = firstIndex + i;
      this.cycleSumV += value;
      this.cycleCount += 1;
      if (value < this.cycleMinV) this.cycleMinV = value;
      if (value > this.cycleMaxV) this.cycleMaxV = value;
      const bandV = this.bandFraction * this.amplitudeV;
      const deviation = value - this.offsetV;
      if (deviation > bandV) {
        if (this.state === 'low') {
          crossings.push({ index: this.crossingIndex(index, deviation), direction: 'rising' });
          this.closeCycle();
        }
        this.state = 'high';
        this.leaveBand(index, deviation);
      } else if (deviation < -bandV) {
        if (this.state === 'high') crossings.push({ index: this.crossingIndex(index, deviation), direction: 'falling' });
        this.state = 'low';
        this.leaveBand(index, deviation);
      } else {
        this.enterBand(index, deviation);
      }
    }
    return crossings;
  }

  private leaveBand(index: number, deviation: number): void {
    this.bandCount = 0;
    this.entryIndex = index;
    this.entryValue = deviation;
  }

  private enterBand(index: number, deviation: number): void {
    if (this.bandCount >= this.maxBandSamples) {
      // Stuck inside the band (a dead or tiny sync): drop the run rather than grow.
      this.bandCount = 0;
      this.entryIndex = Number.NaN;
      this.state = 'unknown';
      return;
    }
    if (this.bandCount === this.bandIndex.length) {
      const grownIndex = new Float64Array(this.bandIndex.length * 2);
      grownIndex.set(this.bandIndex);
      this.bandIndex = grownIndex;
      const grownValue = new Float64Array(this.bandValue.length * 2);
      grownValue.set(this.bandValue);
      this.bandValue = grownValue;
    }
    this.bandIndex[this.bandCount] = index;
    this.bandValue[this.bandCount] = deviation;
    this.bandCount += 1;
  }

  /** Zero of the least-squares line through entry sample, band samples and exit sample. */
  private crossingIndex(exitIndex: number, exitValue: number): number {
    const hasEntry = Number.isFinite(this.entryIndex);
    let count = 0;
    let meanX = 0;
    let meanY = 0;
    const forEachPoint = (pass: (x: number, y: number) => void): void => {
      if (hasEntry) pass(this.entryIndex, this.entryValue);
      for (let k = 0; k < this.bandCount; k++) pass(this.bandIndex[k], this.bandValue[k]);
      pass(exitIndex, exitValue);
    };
    // Indices are taken relative to the exit sample so a long stream's large sample numbers cost no precision.
    forEachPoint((x, y) => {
      count += 1;
      meanX += x - exitIndex;
      meanY += y;
    });
    meanX /= count;
    meanY /= count;
    let sxx = 0;
    let sxy = 0;
    forEachPoint((x, y) => {
      const dx = x - exitIndex - meanX;
      sxx += dx * dx;
      sxy += dx * (y - meanY);
    });
    const lastInsideIndex = this.bandCount > 0 ? this.bandIndex[this.bandCount - 1] : hasEntry ? this.entryIndex : exitIndex - 1;
    const firstIndex = hasEntry ? this.entryIndex : this.bandCount > 0 ? this.bandIndex[0] : exitIndex - 1;
    if (sxx > 0 && sxy !== 0) {
      const zero = exitIndex + meanX - meanY / (sxy / sxx);
      if (zero >= firstIndex && zero <= exitIndex) return zero;
    }
    // Fallback: interpolate between the last sample before the exit and the exit sample.
    const beforeValue = this.bandCount > 0 ? this.bandValue[this.bandCount - 1] : hasEntry ? this.entryValue : 0;
    const fraction = beforeValue === exitValue ? 0.5 : -beforeValue / (exitValue - beforeValue);
    return lastInsideIndex + Math.min(1, Math.max(0, fraction)) * (exitIndex - lastInsideIndex);
  }

  /** At each rising crossing: the mean over the whole cycle just ended becomes the offset (DC removed over whole cycles). */
  private closeCycle(): void {
    if (this.seenRising && this.cycleCount > 0) {
      this.offsetV = this.cycleSumV / this.cycleCount;
      this.amplitudeV = (this.cycleMaxV - this.cycleMinV) / 2;
    }
    this.seenRising = true;
    this.cycleSumV = 0;
    this.cycleCount = 0;
    this.cycleMinV = Number.POSITIVE_INFINITY;
    this.cycleMaxV = Number.NEGATIVE_INFINITY;
  }
}

/**
 * First levels for a sync record: mid-range offset and half the peak-to-peak amplitude, then the offset refined
 * to the mean over the whole cycles between the first and last rising crossings the record holds.
 */
export function estimateSyncLevels(values: ArrayLike<number>): SyncLevels | null {
  let minV = Number.POSITIVE_INFINITY;
  let maxV = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < values.length; i++) {
    if (values[i] < minV) minV = values[i];
    if (values[i] > maxV) maxV = values[i];
  }
  if (!(maxV > minV)) return null;
  const rough: SyncLevels = { offsetV: (maxV + minV) / 2, amplitudeV: (maxV - minV) / 2 };
  const rising = new ZeroCrossingTracker(rough)
    .push(values, 0)
    .filter((crossing) => crossing.direction === 'rising');
  if (rising.length < 2) return rough;
  const from = Math.ceil(rising[0].index);
  const to = Math.ceil(rising[rising.length - 1].index);
  let sumV = 0;
  for (let i = from; i < to; i++) sumV += values[i];
  return { offsetV: sumV / (to - from), amplitudeV: rough.amplitudeV };
}
