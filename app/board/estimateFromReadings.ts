/**
 * Inverse estimation: which current source explains the measured ramp. The slope is I_C/C (REFERENCES.md), so
 * from the ramp alone a current error and a capacitance error look the same; we state both readings:
 * - the effective V_EB that, with the parts as designed, gives the measured ramp (a V_EB shift moves the
 *   current through I_E = (V - V_TH - V_EB)/(R_E + R_TH/(beta+1)), REFERENCES.md: Malvino), and
 * - the capacitance that, with the designed current, gives the same ramp.
 * Both predict the same effect of changing the emitter resistor (the current scales as 1/R_E either way), so a
 * trim of R_E is safe under the ambiguity; a divider change is not (it moves V_TH, which the two readings treat
 * differently). Unclipped ramps are fitted on their rise (peak - floor); clipped ones on their slope.
 */
import type { BoardDesign } from './design';
import type { PartOverrides } from './parts';
import type { RampReadings } from './rampReadings';
import { predictRamp, type RampOptions, type RampPrediction } from './rampModel';

export interface BoardEstimate {
  basis: 'peak' | 'slope';
  /**
   * Which reading the predictions use: a V_EB shift while it stays within what a junction can plausibly do
   * (-0.5 V .. cut-off), else a capacitance scale (the current error is then too large for V_EB to explain).
   */
  explanation: 'veb' | 'capacitance';
  /** Charging current at the floor that explains the ramp (A). */
  chargingCurrentA: number;
  designCurrentA: number;
  currentErrorPct: number;
  /** Effective V_EB at the floor with the parts as designed (V). */
  vebV: number;
  /** Shift from the design's V_EB at the same current (V). */
  vebShiftV: number;
  /** Alternative reading: the capacitance that explains the ramp with the designed current (farad). */
  capacitanceFarad: number;
  capacitanceErrorPct: number;
  /** The model ramp under the chosen explanation, for predictions from here on. */
  prediction: RampPrediction;
  /** The V_EB shift and part values (cRamp under the capacitance explanation) to predict with. */
  modelShiftV: number;
  modelOverrides: PartOverrides;
  /** True when the fit hit the edge of the physically possible (the ramp cannot be explained by V_EB alone). */
  atLimit: boolean;
  ambiguity: string;
}

function measuredQuantity(basis: 'peak' | 'slope', prediction: RampPrediction): number {
  return basis === 'peak' ? prediction.peakV - prediction.floorV : prediction.slopeVPerS;
}

export function estimateFromReadings(design: BoardDesign, readings: RampReadings, options: Pick<RampOptions, 'partOverrides'> = {}): BoardEstimate {
  const nominal = predictRamp(design, options);
  const basis: 'peak' | 'slope' = readings.clipped ? 'slope' : 'peak';
  const wanted = basis === 'peak' ? readings.peakV - readings.floorV : readings.slopeVPerMs * 1000;
  // The shift that leaves the junction just able to conduct bounds the search above; -0.5 V below.
  const upperShiftV = design.supplyV - nominal.theveninV - design.transistor.vebV - 1e-3;
  let lowShiftV = -0.5;
  let highShiftV = Math.max(upperShiftV, lowShiftV + 1e-3);
  const at = (shiftV: number): RampPrediction => predictRamp(design, { ...options, vebShiftV: shiftV });
  const lowValue = measuredQuantity(basis, at(lowShiftV));
  const highValue = measuredQuantity(basis, at(highShiftV));
  let atLimit = false;
  if (!(wanted > 0) || wanted >= lowValue || wanted <= highValue) atLimit = true;
  // The ramp falls monotonically as V_EB rises: bisection, 50 halvings of a < 15 V span reach sub-microvolt.
  for (let iteration = 0; iteration < 50; iteration += 1) {
    const middle = 0.5 * (lowShiftV + highShiftV);
    if (measuredQuantity(basis, at(middle)) > wanted) lowShiftV = middle;
    else highShiftV = middle;
  }
  const vebShiftV = 0.5 * (lowShiftV + highShiftV);
  const shifted = at(vebShiftV);
  const capacitanceFarad = fitCapacitance(design, basis, wanted, options.partOverrides ?? {}, nominal.capacitanceFarad);
  const ratio = capacitanceFarad / nominal.capacitanceFarad;
  // Far outside the transistor law's reach (a shift of tens of volts) the model has no operating point: the
  // capacitance reading is then the one that still explains the ramp.
  const explanation = atLimit || !Number.isFinite(shifted.chargingCurrentA) || !Number.isFinite(shifted.vebV) ? 'capacitance' : 'veb';
  const modelOverrides: PartOverrides = explanation === 'veb' ? { ...options.partOverrides } : { ...options.partOverrides, cRamp: capacitanceFarad };
  const modelShiftV = explanation === 'veb' ? vebShiftV : 0;
  const prediction = explanation === 'veb' ? shifted : predictRamp(design, { partOverrides: modelOverrides });
  // Charging current that explains the ramp: slope times the fitted part's capacitance (I_C = C dv/dt, REFERENCES.md).
  const chargingCurrentA = explanation === 'veb' ? shifted.chargingCurrentA : (nominal.chargingCurrentA * nominal.capacitanceFarad) / capacitanceFarad;
  const currentErrorPct = (chargingCurrentA / nominal.chargingCurrentA - 1) * 100;
  // Effective V_EB by Malvino's formula solved for V_EB: V_EB = V - V_TH - I_E (R_E + R_TH/(beta+1)) (REFERENCES.md).
  const beta = design.transistor.beta;
  const rEmitterOhm = options.partOverrides?.rEmitter ?? design.parts.rEmitter.ohm;
  const vebV =
    explanation === 'veb'
      ? shifted.vebV
      : design.supplyV - nominal.theveninV - ((chargingCurrentA * (beta + 1)) / beta) * (rEmitterOhm + nominal.theveninOhm / (beta + 1));
  return {
    basis,
    explanation,
    chargingCurrentA,
    designCurrentA: nominal.chargingCurrentA,
    currentErrorPct,
    vebV,
    vebShiftV: vebV - nominal.vebV,
    capacitanceFarad,
    capacitanceErrorPct: (ratio - 1) * 100,
    prediction,
    modelShiftV,
    modelOverrides,
    atLimit,
    ambiguity:
      explanation === 'veb'
        ? `the ramp fits a charging current ${signed(currentErrorPct)} % from design (effective V_EB ${vebV.toFixed(3)} V) ` +
          `or, equally, a ramp capacitor ${signed((ratio - 1) * 100)} % from its value: the ramp alone cannot tell them apart`
        : `the ramp needs a charging current ${signed(currentErrorPct)} % from design, more than a V_EB error can explain: ` +
          `a ramp capacitor ${signed((ratio - 1) * 100)} % from its value, or a wrong emitter resistor, fits it; the ramp alone cannot tell them apart`,
  };
}

/** The ramp capacitance that gives the measured rise or slope with the designed current (bisection on log C). */
function fitCapacitance(design: BoardDesign, basis: 'peak' | 'slope', wanted: number, overrides: PartOverrides, nominalFarad: number): number {
  if (!(wanted > 0)) return Infinity;
  let lowLog = Math.log(nominalFarad / 100);
  let highLog = Math.log(nominalFarad * 100);
  for (let iteration = 0; iteration < 60; iteration += 1) {
    const middle = 0.5 * (lowLog + highLog);
    const value = measuredQuantity(basis, predictRamp(design, { partOverrides: { ...overrides, cRamp: Math.exp(middle) } }));
    // More capacitance, less ramp.
    if (value > wanted) lowLog = middle;
    else highLog = middle;
  }
  return Math.exp(0.5 * (lowLog + highLog));
}

function signed(value: number): string {
  return `${value >= 0 ? '+' : ''}${value.toFixed(1)}`;
}
