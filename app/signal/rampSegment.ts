/**
 * One charging interval of the ramp, found inside the samples around one firing interval.
 * Levels follow IEEE 181 ideas applied to a ramp: the floor is the level before the rise (median, robust to noise),
 * the span runs from the floor to the peak, and the linear part lies between the 10 % and 90 % reference levels.
 * - slope: least-squares line over the linear part;
 * - start: where that line meets the floor (the ramp's start instant, free of the noise at the foot);
 * - peak: the level at the end of the charging interval, from a least-squares line through the last few samples
 *   before the reset, evaluated where the reset begins (so a low sample rate does not lose up to one sample's rise;
 *   where it begins within the last sample interval is taken from the reset's symmetry about the crossing);
 * - nonlinearity: largest deviation from the line over the linear part, in % of the peak;
 * - clipping: the ramp flattens before the interval ends (the current source saturates, REFERENCES.md): the slope
 *   over the last 10 % of the interval is below 40 % of the linear-part slope. An Early-effect ramp keeps most of its
 *   slope to the end (about 75 % for a strong Early effect), a saturated source none (our rule).
 */
import { fitIndexLine, type LineFit } from './leastSquares';

export interface RampSegment {
  floorV: number;
  peakV: number;
  /** Linear-part slope per sample interval (V); times the sample rate / 1000 gives V/ms. */
  slopeVPerSample: number;
  /** Start of charging (sub-sample position within the given values). */
  startIndex: number;
  /** End of charging: where the reset begins (sub-sample position). */
  endIndex: number;
  nonlinearityPct: number;
  clipped: boolean;
  /** Tail slope / linear-part slope, the clipping measure. */
  tailSlopeRatio: number;
  /** Samples in the linear-part fit: positions linearFrom .. linearTo - 1 of the given values. */
  fitSamples: number;
  linearFrom: number;
  linearTo: number;
}

export interface RampSegmentOptions {
  /** Where to look for the foot: the index of the firing interval's starting zero crossing in `values`. */
  windowStartIndex: number;
  /** Index of the interval's closing zero crossing in `values`. */
  windowEndIndex: number;
  /** The zero crossing that ends charging (closing crossing full-wave, the falling one half-wave), when known. */
  chargeEndCrossingIndex?: number;
  /** Smallest floor-to-peak rise that counts as a ramp (V). */
  minimumSpanV: number;
}

export function analyzeRampSegment(values: ArrayLike<number>, options: RampSegmentOptions): RampSegment | null {
  const length = values.length;
  if (length < 4) return null;
  // Foot: lowest sample up to a quarter of the way into the interval (the reset straddles the zero crossing).
  const footSearchEnd = Math.min(length, Math.max(1, Math.ceil(options.windowStartIndex + (options.windowEndIndex - options.windowStartIndex) / 4)));
  let lowIndex = 0;
  for (let i = 1; i < footSearchEnd; i++) if (values[i] < values[lowIndex]) lowIndex = i;
  let maxIndex = lowIndex;
  for (let i = lowIndex + 1; i < length; i++) if (values[i] > values[maxIndex]) maxIndex = i;
  const lowV = values[lowIndex];
  const roughSpanV = values[maxIndex] - lowV;
  if (!(roughSpanV >= options.minimumSpanV)) return null;

  // Reset: first sample after the maximum below the 50 % level.
  const roughMesialV = lowV + roughSpanV / 2;
  let fallIndex = -1;
  for (let i = maxIndex + 1; i < length; i++) {
    if (values[i] < roughMesialV) {
      fallIndex = i;
      break;
    }
  }
  if (fallIndex < 0) return null;
  const fallCrossing = fallIndex - 1 + (values[fallIndex - 1] - roughMesialV) / (values[fallIndex - 1] - values[fallIndex]);
  let lastHighIndex = fallIndex - 1;
  const roughDistalV = lowV + 0.9 * roughSpanV;
  while (lastHighIndex > maxIndex && values[lastHighIndex] < roughDistalV) lastHighIndex -= 1;

  // Foot: the samples between the previous reset's fall and this rise (below the 50 % level). The rise is the last
  // up-crossing of the rough 10 % level in [lowIndex, maxIndex]: from the running minimum up to the last high sample
  // (built once, also for the passes below) when the last sample below the level comes before the maximum, which is
  // the usual case; else by the scan. Same answer either way.
  const roughProximalV = lowV + 0.1 * roughSpanV;
  const crossings = new UpCrossingFinder(values, 0, lastHighIndex);
  const lastBelowRough = crossings.lastBelow(roughProximalV);
  let riseIndex = lastBelowRough >= lowIndex && lastBelowRough < maxIndex ? lastBelowRough + 1 : lastUpCrossing(values, roughProximalV, lowIndex, maxIndex);
  if (riseIndex < 0) riseIndex = lowIndex + 1;
  let footStart = riseIndex - 1;
  while (footStart > 0 && values[footStart - 1] < roughMesialV) footStart -= 1;

  const chargingSamples = lastHighIndex - riseIndex;
  let endIndex = Math.min(fallCrossing, lastHighIndex + 1);
  const tailWidth = Math.max(3, Math.round(0.03 * chargingSamples));
  const tailFit = fitIndexLine(values, Math.max(riseIndex, lastHighIndex - tailWidth + 1), lastHighIndex + 1);
  // The level at a position: the tail's line, or the last high sample when the tail has no line.
  let peakV = tailFit ? tailFit.slope * endIndex + tailFit.intercept : values[lastHighIndex];

  // Two passes: the floor is the median of the foot samples up to the start the line gives, and the line's
  // 10 % level depends on the floor; starting from the lowest sample, the second pass is settled.
  let floorV = lowV;
  let fit: LineFit | null = null;
  let previousFit: LineFit | null = null;
  let linearFrom = riseIndex;
  let linearTo = riseIndex;
  let startIndex = riseIndex;
  let previousDistalV = Number.POSITIVE_INFINITY;
  for (let pass = 0; pass < 2; pass++) {
    const spanV = peakV - floorV;
    if (!(spanV >= options.minimumSpanV)) return null;
    // Linear part: from the last 10 % up-crossing before the end to the first 90 % up-crossing after it.
    const proximalV = floorV + 0.1 * spanV;
    const distalV = floorV + 0.9 * spanV;
    const previousFrom = linearFrom;
    const previousTo = linearTo;
    linearFrom = crossings.lastUpFrom(proximalV, footStart);
    if (linearFrom < 0) linearFrom = riseIndex;
    // The first 90 % crossing after the start. On the second pass with the same start and a level no lower, every
    // sample before the first pass's answer is below the old level and so below the new one: the search goes on
    // from there (the same answer, a ramp's length fewer samples looked at).
    linearTo = pass === 1 && linearFrom === previousFrom && distalV >= previousDistalV ? previousTo : linearFrom;
    while (linearTo <= lastHighIndex && values[linearTo] < distalV) linearTo += 1;
    previousDistalV = distalV;
    // Residuals only on the last pass: they give the nonlinearity. The same samples give the same line, so the
    // second pass refits only when the new floor moved the 10 % or 90 % crossing.
    const residuals = { residuals: pass === 1 };
    // (A cast: the compiler does not follow the assignment at the end of the previous pass.)
    const earlier = previousFit as LineFit | null;
    const sameSamples: boolean = pass === 1 && earlier !== null && linearFrom === previousFrom && linearTo === previousTo && earlier.count === linearTo - linearFrom;
    fit =
      sameSamples && earlier
        ? withResiduals(values, earlier, linearFrom, linearTo)
        : (fitIndexLine(values, linearFrom, linearTo, residuals) ?? fitIndexLine(values, linearFrom - 1, linearTo + 1, residuals));
    if (!fit || !(fit.slope > 0)) return null;
    previousFit = fit;
    startIndex = (floorV - fit.intercept) / fit.slope;
    floorV = median(values, footStart, Math.max(footStart + 1, Math.min(riseIndex, Math.floor(startIndex) + 1)));
    startIndex = (floorV - fit.intercept) / fit.slope;
  }
  if (!fit) return null;
  // The reset is symmetric about the zero crossing on the usual sync circuits (|sync| below a threshold holds the
  // capacitor): charging ends as long before the closing crossing as it started after the opening one. The fall is
  // only known to lie between the last high sample and the first low one, so the estimate is kept inside them.
  if (options.chargeEndCrossingIndex !== undefined && Number.isFinite(options.chargeEndCrossingIndex)) {
    const symmetricEnd = options.chargeEndCrossingIndex - (startIndex - options.windowStartIndex);
    endIndex = Math.min(fallIndex, Math.max(lastHighIndex, symmetricEnd));
    peakV = tailFit ? tailFit.slope * endIndex + tailFit.intercept : values[lastHighIndex];
  }

  // Clipping: slope over the last 10 % of the interval against the linear-part slope.
  const tailFrom = Math.max(linearFrom, Math.floor(endIndex - 0.1 * (endIndex - startIndex)));
  const clipFit = fitIndexLine(values, tailFrom, lastHighIndex + 1);
  const tailSlopeRatio = clipFit ? clipFit.slope / fit.slope : 1;
  return {
    floorV,
    peakV,
    slopeVPerSample: fit.slope,
    startIndex,
    endIndex,
    nonlinearityPct: (fit.maxAbsResidual / Math.abs(peakV)) * 100,
    clipped: tailSlopeRatio < 0.4,
    tailSlopeRatio,
    fitSamples: fit.count,
    linearFrom: fit.count === linearTo - linearFrom ? linearFrom : linearFrom - 1,
    linearTo: fit.count === linearTo - linearFrom ? linearTo : linearTo + 1,
  };
}

/**
 * `lastUpCrossing` over one fixed range for several levels (the two passes ask with slightly different floors):
 * the running minimum from the right end lets each question be answered by bisection. When the range's last sample
 * is at or above the level, the last up-crossing is one past the last sample below the level, and that sample is the
 * last whose running minimum (to the end) is below the level. Otherwise it falls back to the scan; same answers.
 */
let suffixScratch = new Float64Array(1024);

export class UpCrossingFinder {
  private readonly low: number;
  private readonly high: number;
  private readonly suffixMin: Float64Array;

  constructor(
    private readonly values: ArrayLike<number>,
    private readonly from: number,
    private readonly to: number,
  ) {
    this.low = Math.max(0, from);
    this.high = Math.min(to, values.length - 1);
    const low = this.low;
    const high = this.high;
    const count = Math.max(0, high - low);
    if (suffixScratch.length < count) suffixScratch = new Float64Array(count * 2);
    // Locals in the loop (a field read per sample costs more than the comparison).
    const suffixMin = suffixScratch;
    this.suffixMin = suffixMin;
    let minimum = Number.POSITIVE_INFINITY;
    for (let j = high - 1; j >= low; j--) {
      const value = values[j];
      if (value < minimum) minimum = value;
      suffixMin[j - low] = minimum;
    }
  }

  lastUp(levelV: number): number {
    return this.lastUpFrom(levelV, this.from);
  }

  /** `lastUpCrossing` over [from, to] for a `from` at or after the finder's own. */
  lastUpFrom(levelV: number, from: number): number {
    const { values, high } = this;
    const low = Math.max(0, from);
    if (!(high > low) || !(values[high] >= levelV)) return lastUpCrossing(values, levelV, from, this.to);
    const below = this.lastBelow(levelV);
    return below < low ? -1 : below + 1;
  }

  /** The last position in [low, high - 1] whose sample is below the level, or -1 (bisection on the running minimum). */
  lastBelow(levelV: number): number {
    const { low, high } = this;
    // Largest j in [low, high - 1] with suffixMin below the level (suffixMin does not decrease with j).
    if (!(high > low) || !(this.suffixMin[0] < levelV)) return -1;
    let left = low;
    let right = high - 1;
    while (left < right) {
      const middle = (left + right + 1) >> 1;
      if (this.suffixMin[middle - low] < levelV) left = middle;
      else right = middle - 1;
    }
    return left;
  }
}

/** Index of the first sample above `levelV` after the last crossing up through it in [from, to], or -1. */
export function lastUpCrossing(values: ArrayLike<number>, levelV: number, from: number, to: number): number {
  for (let i = Math.min(to, values.length - 1); i > Math.max(0, from); i--) {
    if (values[i] >= levelV && values[i - 1] < levelV) return i;
  }
  return -1;
}

/** Scratch for the foot samples: a foot is a few dozen samples, so it is sorted in place by insertion. */
let footScratch = new Float64Array(256);

function median(values: ArrayLike<number>, from: number, to: number): number {
  const count = Math.max(1, to - from);
  if (count > 64) {
    const part = new Float64Array(count);
    for (let i = 0; i < count; i++) part[i] = values[from + i];
    part.sort();
    return middleOf(part, count);
  }
  if (footScratch.length < count) footScratch = new Float64Array(count);
  const part = footScratch;
  for (let i = 0; i < count; i++) {
    const value = values[from + i];
    let j = i - 1;
    // NaN never reaches here (the analyzer cuts invalid samples), so plain comparisons order the values as sort() does.
    while (j >= 0 && part[j] > value) {
      part[j + 1] = part[j];
      j--;
    }
    part[j + 1] = value;
  }
  return middleOf(part, count);
}

function middleOf(sorted: Float64Array, count: number): number {
  const middle = count >> 1;
  return count % 2 === 1 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

/** The residual figures of a line already fitted to positions from .. to - 1. */
function withResiduals(values: ArrayLike<number>, fit: LineFit, from: number, to: number): LineFit {
  let maxAbsResidual = 0;
  let sumSquares = 0;
  for (let i = from; i < to; i++) {
    const residual = values[i] - (fit.slope * i + fit.intercept);
    sumSquares += residual * residual;
    if (Math.abs(residual) > maxAbsResidual) maxAbsResidual = Math.abs(residual);
  }
  return { ...fit, maxAbsResidual, rmsResidual: Math.sqrt(sumSquares / fit.count) };
}
