/**
 * What the bench measures on a board's ramp (and, optionally, its alpha limit), as the board model needs it.
 * A small interface of its own so the model does not depend on the analysis code: the analysis JSON's
 * `ramp` object (issue 2) fits it as it is.
 */
export interface RampReadings {
  /** Ramp level at its start, after the reset (V). */
  floorV: number;
  /** Ramp at the end of the charging interval, median over cycles (V). */
  peakV: number;
  /** Least-squares slope over the ramp's linear part (V/ms). */
  slopeVPerMs: number;
  /** Ramp start after the zero crossing (electrical degrees). */
  startDelayDeg?: number;
  /** The ramp flattened before the half-cycle ended (current source saturated). */
  clipped: boolean;
  /**
   * Largest alpha measured (degrees), e.g. with the control pot at its end. Only a value past the design's
   * alphaMaxDeg is acted on: a lower one may just mean the pot was not turned to its end.
   */
  alphaMaxDeg?: number | null;
}
