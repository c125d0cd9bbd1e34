/**
 * Zero crossings of the sync signal, block by block in constant memory.
 * - The DC offset is the mean over the last whole cycle (rising crossing to rising crossing), so a
 *   transformer's or logger's offset does not shift the crossings and partial cycles do not bias it.
 * - Hysteresis: a crossing counts only when the signal passes from below -band to above +band (or back),
 *   band = 30 % of the amplitude by default, so noise near zero never makes extra crossings (common practice).
 * - The instant is the zero of a least-squares fit through the samples inside the band plus the two bracketing
 *   samples outside it, so every sample the band holds counts. Near its zero crossing a sine is odd:
 *   y = a + b u + c u^3 + O(u^5) about the crossing, so a line is fitted first and then the odd cubic about the line's
 *   zero; a line alone is biased by the cubic term whenever the sampled window is not symmetric. With four samples or
 *   fewer the line is kept, and with only the two bracketing samples it is plain linear interpolation (IEEE 181
 *   crossing instants).
 */
import { fitLine } from './leastSquares';

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
  private cycleMinV = Number.POSITIVE_INFINITY;
  private cycleMaxV = Number.NEGATIVE_INFINITY;
  private lastRisingIndex = Number.NaN;

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
    this.cycleMinV = Number.POSITIVE_INFINITY;
    this.cycleMaxV = Number.NEGATIVE_INFINITY;
    this.lastRisingIndex = Number.NaN;
  }

  /** Feeds samples numbered `firstIndex`, `firstIndex + 1`, ... and returns the crossings they complete. */
  push(values: ArrayLike<number>, firstIndex: number): ZeroCrossing[] {
    const crossings: ZeroCrossing[] = [];
    // Offset and band change only at a rising crossing; keep them in locals between crossings (the hot loop).
    let offsetV = this.offsetV;
    let bandV = this.bandFraction * this.amplitudeV;
    let cycleSumV = this.cycleSumV;
    let cycleMinV = this.cycleMinV;
    let cycleMaxV = this.cycleMaxV;
    // Most samples lie outside the band on the side already known: such a sample only becomes the band's entry
    // sample, so its position is kept here and handed to leaveBand when the band is entered (or the block ends).
    let state = this.state;
    let outside = -1;
    for (let i = 0; i < values.length; i++) {
      const value = values[i];
      cycleSumV += value;
      if (value < cycleMinV) cycleMinV = value;
      if (value > cycleMaxV) cycleMaxV = value;
      const deviation = value - offsetV;
      if (deviation > bandV) {
        if (state === 'high') {
          outside = i;
          continue;
        }
        if (outside >= 0) this.leaveBand(firstIndex + outside, values[outside] - offsetV);
        outside = -1;
        if (state === 'low') {
          const index = firstIndex + i;
          const crossing = this.crossingIndex(index, deviation);
          crossings.push({ index: crossing, direction: 'rising' });
          this.cycleSumV = cycleSumV;
          this.cycleMinV = cycleMinV;
          this.cycleMaxV = cycleMaxV;
          this.closeCycle(crossing, deviation);
          offsetV = this.offsetV;
          bandV = this.bandFraction * this.amplitudeV;
          cycleSumV = this.cycleSumV;
          cycleMinV = this.cycleMinV;
          cycleMaxV = this.cycleMaxV;
          state = 'high';
          this.leaveBand(index, value - offsetV);
        } else {
          state = 'high';
          this.leaveBand(firstIndex + i, deviation);
        }
      } else if (deviation < -bandV) {
        if (state === 'low') {
          outside = i;
          continue;
        }
        if (outside >= 0) this.leaveBand(firstIndex + outside, values[outside] - offsetV);
        outside = -1;
        if (state === 'high') crossings.push({ index: this.crossingIndex(firstIndex + i, deviation), direction: 'falling' });
        state = 'low';
        this.leaveBand(firstIndex + i, deviation);
      } else {
        if (outside >= 0) this.leaveBand(firstIndex + outside, values[outside] - offsetV);
        outside = -1;
        this.state = state;
        this.enterBand(firstIndex + i, deviation);
        state = this.state;
      }
    }
    if (outside >= 0) this.leaveBand(firstIndex + outside, values[outside] - offsetV);
    this.state = state;
    this.cycleSumV = cycleSumV;
    this.cycleMinV = cycleMinV;
    this.cycleMaxV = cycleMaxV;
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

  /** Zero of the least-squares fit through entry sample, band samples and exit sample (see the file comment). */
  private crossingIndex(exitIndex: number, exitValue: number): number {
    const hasEntry = Number.isFinite(this.entryIndex);
    const count = this.bandCount + 1 + (hasEntry ? 1 : 0);
    // Positions relative to the exit sample, so a long stream's large sample numbers cost no precision.
    if (fitX.length < count) {
      fitX = new Float64Array(count * 2);
      fitY = new Float64Array(count * 2);
    }
    const x = fitX;
    const y = fitY;
    let n = 0;
    if (hasEntry) {
      x[n] = this.entryIndex - exitIndex;
      y[n++] = this.entryValue;
    }
    for (let k = 0; k < this.bandCount; k++) {
      x[n] = this.bandIndex[k] - exitIndex;
      y[n++] = this.bandValue[k];
    }
    x[n] = 0;
    y[n] = exitValue;
    const zero = oddCubicZero(x, y, count);
    if (zero !== null && zero >= x[0] && zero <= 0) return exitIndex + zero;
    // Fallback: interpolate between the last sample before the exit and the exit sample.
    const beforeValue = count > 1 ? y[count - 2] : 0;
    const beforeIndex = count > 1 ? x[count - 2] : -1;
    const fraction = beforeValue === exitValue ? 0.5 : -beforeValue / (exitValue - beforeValue);
    return exitIndex + beforeIndex + Math.min(1, Math.max(0, fraction)) * -beforeIndex;
  }

  /**
   * At each rising crossing the mean over the whole cycle just ended becomes the offset (DC removed over whole
   * cycles). The mean is taken between the two crossing instants, not between whole samples: each sample stands for
   * one sample interval (rectangle rule) and the fractions of an interval at either end, where the signal is at the
   * offset by definition of the crossing, are added at the offset. Otherwise a cycle of about 200 samples would carry
   * up to half a sample's worth of the sine's slope into the offset, which moves the next crossings.
   */
  private closeCycle(crossing: number, exitDeviation: number): void {
    // Samples after the crossing (the band samples past it and the exit sample) belong to the next cycle.
    const boundary = Math.floor(crossing);
    let tailV = exitDeviation + this.offsetV;
    for (let k = this.bandCount - 1; k >= 0 && this.bandIndex[k] > boundary; k--) {
      tailV += this.bandValue[k] + this.offsetV;
    }
    if (Number.isFinite(this.lastRisingIndex)) {
      const start = this.lastRisingIndex;
      const lengthSamples = crossing - start;
      const wholeSumV = this.cycleSumV - tailV;
      const endCorrection = Math.ceil(start) - 0.5 - start + (crossing - boundary - 0.5);
      if (lengthSamples > 2) {
        this.offsetV = (wholeSumV + endCorrection * this.offsetV) / lengthSamples;
        this.amplitudeV = (this.cycleMaxV - this.cycleMinV) / 2;
      }
    }
    this.lastRisingIndex = crossing;
    this.cycleSumV = tailV;
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

/** Scratch for the points of one crossing's fit (a band holds about a fifth of a cycle's samples). */
let fitX = new Float64Array(256);
let fitY = new Float64Array(256);

/**
 * Zero of a line fit through the first `count` points, refined by a fit of a + b u + c u^3 about it (Newton on the
 * cubic); null when degenerate.
 */
function oddCubicZero(x: Float64Array, y: Float64Array, count: number): number | null {
  const line = fitLine(x, y, { to: count, residuals: false });
  if (!line || line.slope === 0) return null;
  const lineZero = -line.intercept / line.slope;
  if (count < 5) return lineZero;
  // Normal equations of [1, u, u^3] with u = x - lineZero.
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let s4 = 0;
  let s6 = 0;
  let r0 = 0;
  let r1 = 0;
  let r3 = 0;
  for (let i = 0; i < count; i++) {
    const u = x[i] - lineZero;
    const u2 = u * u;
    const u3 = u2 * u;
    s0 += 1;
    s1 += u;
    s2 += u2;
    s3 += u3;
    s4 += u2 * u2;
    s6 += u3 * u3;
    r0 += y[i];
    r1 += u * y[i];
    r3 += u3 * y[i];
  }
  // Matrix [[n, S1, S3], [S1, S2, S4], [S3, S4, S6]] solved by Cramer's rule (3x3, well scaled by centring): each
  // unknown is the determinant with its column replaced by the right-hand side, over the matrix's determinant.
  const a11 = s0, a12 = s1, a13 = s3, a22 = s2, a23 = s4, a33 = s6;
  const determinant = a11 * (a22 * a33 - a23 * a23) - a12 * (a12 * a33 - a23 * a13) + a13 * (a12 * a23 - a22 * a13);
  if (!(Math.abs(determinant) > 0)) return lineZero;
  const a = (r0 * (a22 * a33 - a23 * a23) - a12 * (r1 * a33 - a23 * r3) + a13 * (r1 * a23 - a22 * r3)) / determinant;
  const b = (a11 * (r1 * a33 - a23 * r3) - r0 * (a12 * a33 - a23 * a13) + a13 * (a12 * r3 - r1 * a13)) / determinant;
  const c = (a11 * (a22 * r3 - r1 * a23) - a12 * (a12 * r3 - r1 * a13) + r0 * (a12 * a23 - a22 * a13)) / determinant;
  let u = -a / b;
  for (let iteration = 0; iteration < 4; iteration++) u -= (a + b * u + c * u * u * u) / (b + 3 * c * u * u);
  return Number.isFinite(u) ? lineZero + u : lineZero;
}
