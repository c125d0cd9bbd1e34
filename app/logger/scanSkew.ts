/**
 * A logger with one multiplexed ADC converts its channels one after another, so within a frame each channel is
 * sampled a little later than the first (greeting `skew=`, fractions of the sample period). The host puts every
 * channel back on the frame's instants by linear interpolation between the channel's own neighbouring samples:
 * a sample taken at (n + f) T stands next to the one at (n - 1 + f) T, and the value at n T lies a fraction 1 - f
 * of the way from the earlier to the later. Exact for straight stretches (a ramp), and a step edge lands at its
 * true instant on average instead of f of a sample late.
 */

/** Moves `volts` (one channel of one block) onto the frame instants, in place. `previousV`: the channel's last value in the block before, when it follows directly. */
export function alignToFrame(volts: Float64Array, skew: number, previousV: number | null): void {
  if (!(skew > 0) || volts.length === 0) return;
  const length = volts.length;
  // The first sample needs the one before it: the previous block's last, or else the line through its next one.
  const first = previousV !== null ? skew * previousV + (1 - skew) * volts[0] : length > 1 ? volts[0] - skew * (volts[1] - volts[0]) : volts[0];
  for (let index = length - 1; index >= 1; index--) volts[index] = skew * volts[index - 1] + (1 - skew) * volts[index];
  volts[0] = first;
}
