/**
 * The control divider: +V_control -> rControlTop (fixed, limits the range) -> potControl -> 0 V, wiper to the
 * comparator. Its top end sets the largest control voltage, so the largest firing angle; the fixed resistor is
 * chosen so alpha cannot pass alphaMaxDeg (commissioning rule: alpha never reaches the next zero crossing,
 * REFERENCES.md, common practice).
 */
import type { BoardDesign } from './design';
import { alphaForControl, controlForAlpha } from './firingAngle';
import { boardPartValues } from './parts';
import type { RampOptions, RampPrediction } from './rampModel';
import { predictRamp } from './rampModel';

export interface ControlLimits {
  controlSupplyV: number;
  /** Wiper voltage at the pot's top end: V rPot/(rTop + rPot) (V). */
  controlMaxV: number;
  /** Alpha at controlMaxV; null when the pot reaches past the ramp's end (the board can stop firing). */
  alphaMaxDeg: number | null;
  /** Ramp voltage at the design's alphaMaxDeg (V), or null when alphaMaxDeg lies outside the ramp. */
  controlAtAlphaMaxV: number | null;
  /** Fixed top resistor that makes the pot's end fire exactly at alphaMaxDeg (ohm), or null when none can. */
  limitResistorOhm: number | null;
}

export function controlLimitsOf(design: BoardDesign, options: RampOptions & { prediction?: RampPrediction } = {}): ControlLimits {
  const prediction = options.prediction ?? predictRamp(design, options);
  const values = boardPartValues(design, options.partOverrides);
  const controlSupplyV = design.controlSupplyV ?? design.supplyV;
  const topOhm = values.rControlTopOhm ?? 0;
  const controlMaxV = (controlSupplyV * values.potControlOhm) / (topOhm + values.potControlOhm);
  const controlAtAlphaMaxV = controlForAlpha(design, design.alphaMaxDeg, { prediction });
  // V_max = V pot/(top + pot)  =>  top = pot (V / V_max - 1).
  const limitResistorOhm =
    controlAtAlphaMaxV !== null && controlAtAlphaMaxV > 0 && controlAtAlphaMaxV < controlSupplyV
      ? values.potControlOhm * (controlSupplyV / controlAtAlphaMaxV - 1)
      : null;
  return { controlSupplyV, controlMaxV, alphaMaxDeg: alphaForControl(design, controlMaxV, { prediction }), controlAtAlphaMaxV, limitResistorOhm };
}
