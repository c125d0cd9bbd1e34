/**
 * Firing angle from the control voltage: the comparator fires where the ramp crosses the control voltage
 * (ramp-and-comparator firing, common practice). Angles are electrical degrees from the mains zero crossing that
 * starts the half-cycle: the ramp starts half the reset time after the sync crossing, and the sync lags the mains
 * by syncPhaseDeg, so alpha = syncPhaseDeg + 360 f (startDelay + time for the ramp to reach the control voltage).
 */
import type { BoardDesign } from './design';
import { predictRamp, type RampOptions, type RampPrediction, rampVoltageAt, timeToReachV } from './rampModel';

function predictionOf(design: BoardDesign, prediction: RampPrediction | undefined, options: RampOptions): RampPrediction {
  return prediction ?? predictRamp(design, options);
}

function degreesPerSecond(design: BoardDesign): number {
  return 360 * design.mainsHz;
}

/** Alpha at which the board fires for a control voltage, or null when the ramp never reaches it (no pulse). */
export function alphaForControl(design: BoardDesign, controlV: number, options: RampOptions & { prediction?: RampPrediction } = {}): number | null {
  const prediction = predictionOf(design, options.prediction, options);
  // At or below the floor the comparator is already high when the ramp starts: no edge, so no pulse (the deck agrees).
  if (controlV <= prediction.floorV) return null;
  const elapsedS = timeToReachV(prediction, controlV);
  if (elapsedS === null) return null;
  return design.syncPhaseDeg + degreesPerSecond(design) * (prediction.startDelayS + elapsedS);
}

/** Control voltage that fires the board at `alphaDeg`, or null when alpha lies outside the ramp. */
export function controlForAlpha(design: BoardDesign, alphaDeg: number, options: RampOptions & { prediction?: RampPrediction } = {}): number | null {
  const prediction = predictionOf(design, options.prediction, options);
  const elapsedS = (alphaDeg - design.syncPhaseDeg) / degreesPerSecond(design) - prediction.startDelayS;
  if (elapsedS < 0 || elapsedS > prediction.chargingIntervalS) return null;
  return rampVoltageAt(prediction, elapsedS);
}

/** The alpha range the ramp spans: from its start to its end (degrees from the mains zero crossing). */
export function alphaRangeOf(design: BoardDesign, prediction: RampPrediction): { startDeg: number; endDeg: number } {
  const startDeg = design.syncPhaseDeg + degreesPerSecond(design) * prediction.startDelayS;
  return { startDeg, endDeg: startDeg + degreesPerSecond(design) * prediction.chargingIntervalS };
}
