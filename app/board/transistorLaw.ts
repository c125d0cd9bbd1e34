/**
 * The ramp transistor of a design as a junction law, and its drift with temperature.
 * V_EB falls about 2 mV per kelvin at constant current (REFERENCES.md: Sedra and Smith).
 *
 * A design states V_EB, beta and the Early voltage at its own operating point; the rest of the Gummel-Poon law
 * (operatingPoint.ts) is the shape below, typical of small-signal silicon transistors. Each value and its source:
 * - NF 1: an ideal diode law, V_EB up V_T ln 10 (about 59 mV at 25 C) per decade of current (from memory: small-
 *   signal transistors measure 1.00-1.01).
 * - NE 1.5 and a recombination share of 20 % of the base current at the design's current: beta falls about a fifth
 *   for a tenfold smaller current and rises a little above it (from memory: small-signal gain curves peak at a few
 *   milliamperes and fall toward the microamperes; NE is usually 1.5-2).
 * - IKF 0.1 A: high injection, beta falling above tens of milliamperes (from memory); idle at ramp currents.
 * - RB 10 ohm, RE 0.5 ohm: ohmic base and emitter resistance (from memory: ohms to tens of ohms, and under an ohm).
 * The reference decks (tests/reference/firingBoardDeck.ts) give ngspice the same parameters by their SPICE names.
 */
import type { BoardDesign } from './design';
import { type BiasNetwork, type TransistorLaw, type TransistorShape, calibrateTransistorLaw, thermalVoltageAt } from './operatingPoint';
import { boardPartValues, type PartOverrides } from './parts';

/** The temperature at which the design's vebV holds (datasheet convention, common practice). */
export const nominalTemperatureC = 25;
/** dV_EB/dT at constant current (REFERENCES.md: Sedra and Smith, about -2 mV/K). */
export const vebDriftVPerK = -0.002;

/** The law's shape beyond what a design states (header comment: values and sources). */
export const smallSignalShape: TransistorShape = {
  emissionCoefficient: 1,
  recombinationEmission: 1.5,
  recombinationShare: 0.2,
  kneeCurrentA: 0.1,
  baseOhm: 10,
  emitterOhm: 0.5,
};

export interface TransistorConditions {
  /** Extra V_EB at the same current (V): a different transistor fitted, or an estimate from a measured ramp. */
  vebShiftV?: number;
  /** Board temperature (C); V_EB drifts by vebDriftVPerK from nominalTemperatureC. */
  temperatureC?: number;
  /** Current gain of the fitted transistor at the design's operating point, when it is not the design's. */
  beta?: number;
}

export function biasNetworkOf(design: BoardDesign, overrides: PartOverrides = {}): BiasNetwork {
  const values = boardPartValues(design, overrides);
  return { supplyV: design.supplyV, rEmitterOhm: values.rEmitterOhm, rBiasTopOhm: values.rBiasTopOhm, rBiasBottomOhm: values.rBiasBottomOhm };
}

/**
 * The law is calibrated on the design's nominal parts (V_EB = vebV and beta there, ramp at 0 V), so overriding a
 * resistor keeps the same transistor. A V_EB shift s scales IS by exp(-s/(NF V_T)) and ISE by exp(-s/(NE V_T)):
 * the same currents then need s more V_EB. Another beta scales both base-current terms alike.
 */
export function transistorLawOf(design: BoardDesign, conditions: TransistorConditions = {}): TransistorLaw {
  const temperatureC = conditions.temperatureC ?? nominalTemperatureC;
  const thermalV = thermalVoltageAt(temperatureC);
  const nominal = calibrateTransistorLaw(biasNetworkOf(design), design.transistor, smallSignalShape, thermalV);
  const shiftV = (conditions.vebShiftV ?? 0) + vebDriftVPerK * (temperatureC - nominalTemperatureC);
  const gainScale = (conditions.beta ?? design.transistor.beta) / design.transistor.beta;
  return {
    ...nominal,
    saturationCurrentA: nominal.saturationCurrentA * Math.exp(-shiftV / (nominal.emissionCoefficient * thermalV)),
    recombinationCurrentA: (nominal.recombinationCurrentA * Math.exp(-shiftV / (nominal.recombinationEmission * thermalV))) / gainScale,
    idealBeta: nominal.idealBeta * gainScale,
  };
}
