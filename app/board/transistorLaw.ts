/**
 * The ramp transistor of a design as a junction law, and its drift with temperature.
 * V_EB falls about 2 mV per kelvin at constant current (REFERENCES.md: Sedra and Smith).
 */
import type { BoardDesign } from './design';
import { type BiasNetwork, type TransistorLaw, saturationCurrentFor, thermalVoltageAt } from './operatingPoint';
import { boardPartValues, type PartOverrides } from './parts';

/** The temperature at which the design's vebV holds (datasheet convention, common practice). */
export const nominalTemperatureC = 25;
/** dV_EB/dT at constant current (REFERENCES.md: Sedra and Smith, about -2 mV/K). */
export const vebDriftVPerK = -0.002;

export interface TransistorConditions {
  /** Extra V_EB at the same current (V): a different transistor fitted, or an estimate from a measured ramp. */
  vebShiftV?: number;
  /** Board temperature (C); V_EB drifts by vebDriftVPerK from nominalTemperatureC. */
  temperatureC?: number;
  /** Current gain of the fitted transistor, when it is not the design's (the junction law I_S stays the design's). */
  beta?: number;
}

export function biasNetworkOf(design: BoardDesign, overrides: PartOverrides = {}): BiasNetwork {
  const values = boardPartValues(design, overrides);
  return { supplyV: design.supplyV, rEmitterOhm: values.rEmitterOhm, rBiasTopOhm: values.rBiasTopOhm, rBiasBottomOhm: values.rBiasBottomOhm };
}

/**
 * I_S is fixed by the design's nominal parts (V_EB = vebV there, ramp at 0 V), so overriding a resistor keeps
 * the same transistor. A V_EB shift s scales I_S by exp(-s/V_T): the same current then needs s more V_EB.
 */
export function transistorLawOf(design: BoardDesign, conditions: TransistorConditions = {}): TransistorLaw {
  const temperatureC = conditions.temperatureC ?? nominalTemperatureC;
  const thermalV = thermalVoltageAt(temperatureC);
  const { vebV, beta, earlyV } = design.transistor;
  const nominalI = saturationCurrentFor(biasNetworkOf(design), vebV, beta, earlyV, thermalV);
  const shiftV = (conditions.vebShiftV ?? 0) + vebDriftVPerK * (temperatureC - nominalTemperatureC);
  return { saturationCurrentA: nominalI * Math.exp(-shiftV / thermalV), beta: conditions.beta ?? beta, earlyV, thermalV };
}
