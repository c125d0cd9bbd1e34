/**
 * The control range a board design allows, in one definition that the transfer sweep, the Transfer step and the
 * Limits step all use (so following the default sweep never makes the Limits step fail):
 * - low end: the control voltage that fires at the design's smallest alpha (alphaMinDeg). The control divider has
 *   no fixed resistor at the bottom, so this end is kept by whatever drives the control input; below it the board
 *   fires earlier than the design allows;
 * - high end: the top of the control potentiometer, where the fixed resistor above it (rControlTop) stops alpha
 *   (controlDivider.ts): the board's own limit, which the Limits step checks against alphaMaxDeg.
 * A sweep has "seen" an end when its control came within `endMarginV` of it: the control change that moves alpha by
 * the design's alpha tolerance on the model's line (our rule: short of the end by less than the tolerance, the
 * alpha there cannot hide a miss the tolerance would catch). Without a control channel the same is asked of alpha.
 * Cycles fired below the low end are outside the range the design allows: the Limits step leaves them out (the
 * board has no stop there), and says how many it left out.
 */
import type { BoardDesign } from './design';
import { controlLimitsOf } from './controlDivider';
import { alphaForControl, controlForAlpha } from './firingAngle';
import { predictRamp, type RampPrediction } from './rampModel';

export interface ControlRange {
  lowV: number;
  highV: number;
  /** The board model's alpha at each end (deg); null where the ramp never reaches the control voltage. */
  alphaAtLowDeg: number | null;
  alphaAtHighDeg: number | null;
  /** How close a sweep must come to an end to have seen it (V), and the same in alpha (deg: the alpha tolerance). */
  endMarginV: number;
  endMarginDeg: number;
}

export function controlRangeOf(design: BoardDesign, options: { prediction?: RampPrediction } = {}): ControlRange {
  const prediction = options.prediction ?? predictRamp(design);
  const { controlMaxV } = controlLimitsOf(design, { prediction });
  // alphaMinDeg before the ramp starts: the lowest control that still fires (just above the ramp floor).
  const floorStepV = 0.02 * (controlMaxV - prediction.floorV);
  const lowV = Math.min(controlForAlpha(design, design.alphaMinDeg, { prediction }) ?? prediction.floorV + floorStepV, controlMaxV);
  const highV = controlMaxV;
  const alphaAtLowDeg = alphaForControl(design, lowV, { prediction });
  const alphaAtHighDeg = alphaForControl(design, highV, { prediction });
  const endMarginDeg = design.tolerances.alphaDeg;
  const alphaSpanDeg = alphaAtLowDeg !== null && alphaAtHighDeg !== null ? alphaAtHighDeg - alphaAtLowDeg : 0;
  // Volts per degree on the line through the two ends; a range the model cannot span falls back to 2 % of it.
  const endMarginV = alphaSpanDeg > endMarginDeg ? ((highV - lowV) * endMarginDeg) / alphaSpanDeg : 0.02 * Math.max(0, highV - lowV);
  return { lowV, highV, alphaAtLowDeg, alphaAtHighDeg, endMarginV, endMarginDeg };
}

/** What a sweep has covered: its control and alpha extremes (null where nothing was seen). */
export interface SweepExtent {
  controlMinV: number | null;
  controlMaxV: number | null;
  alphaMinDeg: number | null;
  alphaMaxDeg: number | null;
}

/**
 * Which ends of the range a sweep reached: by its control voltage when it was measured, else by the alpha the
 * model gives at each end.
 */
export function controlEndsSeen(range: ControlRange, sweep: SweepExtent): { low: boolean; high: boolean } {
  if (sweep.controlMinV !== null && sweep.controlMaxV !== null) {
    return { low: sweep.controlMinV <= range.lowV + range.endMarginV, high: sweep.controlMaxV >= range.highV - range.endMarginV };
  }
  return {
    low: sweep.alphaMinDeg !== null && range.alphaAtLowDeg !== null && sweep.alphaMinDeg <= range.alphaAtLowDeg + range.endMarginDeg,
    high: sweep.alphaMaxDeg !== null && range.alphaAtHighDeg !== null && sweep.alphaMaxDeg >= range.alphaAtHighDeg - range.endMarginDeg,
  };
}

/**
 * False for a control voltage below the range's low end: the design does not allow the board to be fired there.
 * A quarter of the end margin is given (a quarter of the alpha tolerance): the noise on a control held at the very
 * end must not drop its own cycles.
 */
export function controlWithinRange(range: ControlRange, controlV: number): boolean {
  return controlV >= range.lowV - range.endMarginV / 4;
}
