/**
 * Physics checks of a board design that the schema alone cannot make: a divider that cuts the transistor off,
 * a ramp target the supply or the source's compliance cannot reach, an alpha limit past the end of the ramp.
 * Errors make the design unusable; warnings are shown to the technician beside it.
 */
import { controlLimitsOf } from './controlDivider';
import { alphaRangeOf } from './firingAngle';
import type { BoardDesign } from './design';
import { theveninOf } from './operatingPoint';
import { partName } from './partNames';
import { boardPartValues } from './parts';
import { predictRamp } from './rampModel';
import { biasNetworkOf } from './transistorLaw';

export interface BoardPhysicsProblem {
  severity: 'error' | 'warning';
  /** Field path in the design file, e.g. `parts.rBiasBottom.ohm`. */
  field: string;
  message: string;
}

/** Most charging current a design may ask of its transistor (A); see the check below. */
export const maxChargingCurrentA = 0.1;

function format(value: number, digits = 4): string {
  return Number(value.toPrecision(digits)).toString();
}

export function validateBoardPhysics(design: BoardDesign): BoardPhysicsProblem[] {
  const problems: BoardPhysicsProblem[] = [];
  const error = (field: string, message: string): void => void problems.push({ severity: 'error', field, message });
  const warning = (field: string, message: string): void => void problems.push({ severity: 'warning', field, message });
  const halfCycleUs = 1e6 / (2 * design.mainsHz);
  const { vebV } = design.transistor;

  if (design.rampTargetV >= design.supplyV) {
    error('rampTargetV', `a ramp of ${format(design.rampTargetV)} V cannot be charged from a ${format(design.supplyV)} V supply: the current source needs headroom above the ramp`);
  }
  if (design.syncResetUs >= halfCycleUs) {
    error('syncResetUs', `a reset of ${format(design.syncResetUs)} us leaves no charging time in a ${format(halfCycleUs)} us half-cycle`);
  }
  if (design.alphaMinDeg >= design.alphaMaxDeg) {
    error('alphaMinDeg', `the smallest alpha, ${format(design.alphaMinDeg)} deg, must be below the largest, ${format(design.alphaMaxDeg)} deg`);
  }
  const top = partName(design, 'rBiasTop');
  const bottom = partName(design, 'rBiasBottom');

  // V_TH + V_EB >= V: the emitter cannot rise above the supply, so the emitter-base junction never conducts
  // (REFERENCES.md: Malvino, I_E = (V - V_TH - V_EB)/(R_E + R_TH/(beta+1)) would be zero or negative).
  const { theveninV } = theveninOf(biasNetworkOf(design));
  if (theveninV + vebV >= design.supplyV) {
    error(
      'parts.rBiasBottom.ohm',
      `the bias divider puts the base at ${format(theveninV)} V, less than V_EB (${format(vebV, 2)} V) below the ${format(design.supplyV)} V supply: the transistor is cut off and the ramp never charges (lower the ${bottom} or raise the ${top})`,
    );
    return problems;
  }

  const prediction = predictRamp(design);
  const values = boardPartValues(design);
  // A ramp source runs at microamps to a few milliamps (common practice); a small-signal PNP transistor is rated
  // for 100 to 800 mA of collector current (from memory). Beyond 100 mA the parts describe no ramp source.
  if (!(prediction.chargingCurrentA <= maxChargingCurrentA)) {
    error(
      'parts.rEmitter.ohm',
      `the parts ask the current source for ${Number.isFinite(prediction.chargingCurrentA) ? `${format(prediction.chargingCurrentA * 1e3)} mA` : 'no finite current'}, beyond the ${maxChargingCurrentA * 1e3} mA a small-signal PNP transistor carries: raise rEmitter or lower the base divider's drop`,
    );
    return problems;
  }
  if (design.rampTargetV >= prediction.clipV && design.rampTargetV < design.supplyV) {
    error(
      'rampTargetV',
      `the current source saturates at ${format(prediction.clipV)} V (emitter ${format(prediction.emitterV)} V minus V_EC(sat) ${format(design.transistor.vecSatV, 2)} V), below the ${format(design.rampTargetV)} V target: lower the emitter drop (raise the ${bottom} against the ${top}) or the target`,
    );
  }
  const range = alphaRangeOf(design, prediction);
  if (design.alphaMaxDeg >= range.endDeg) {
    error(
      'alphaMaxDeg',
      `the largest alpha, ${format(design.alphaMaxDeg)} deg, is past the end of the ramp at ${format(range.endDeg)} deg (half-cycle less half the ${format(design.syncResetUs)} us reset): the board cannot fire there`,
    );
  }
  if (design.syncPhaseDeg + design.alphaMaxDeg >= 180 && design.alphaMaxDeg < range.endDeg) {
    warning('alphaMaxDeg', `the largest alpha, ${format(design.alphaMaxDeg)} deg, plus the sync lag reaches the next zero crossing`);
  }

  if (design.parts.rControlTop || design.parts.potControl) {
    const limits = controlLimitsOf(design, { prediction });
    if (limits.alphaMaxDeg === null) {
      warning('parts.rControlTop.ohm', `at the pot's end the control (${format(limits.controlMaxV)} V) is above the ramp's end: the board stops firing instead of holding the largest alpha, ${format(design.alphaMaxDeg)} deg`);
    } else if (limits.alphaMaxDeg > design.alphaMaxDeg + design.tolerances.alphaDeg) {
      warning('parts.rControlTop.ohm', `the pot's end fires at ${format(limits.alphaMaxDeg)} deg, past the largest alpha, ${format(design.alphaMaxDeg)} deg`);
    }
  }
  const peakErrorPct = ((prediction.peakV - design.rampTargetV) / design.rampTargetV) * 100;
  if (prediction.clipped) {
    warning('parts.rEmitter.ohm', `the parts charge the ramp into clipping at ${format(prediction.clipV)} V before the half-cycle ends: the current is too high for the supply headroom`);
  } else if (Math.abs(peakErrorPct) > design.tolerances.rampPeakPct) {
    warning('parts.rEmitter.ohm', `the parts give a ramp peak of ${format(prediction.peakV)} V, ${format(peakErrorPct, 2)} % from the ${format(design.rampTargetV)} V target`);
  }
  if (!prediction.clipped && prediction.headroomV < 0.5) {
    warning('parts.rBiasBottom.ohm', `only ${format(prediction.headroomV, 2)} V of headroom between the ramp peak and clipping: supply and part tolerances may clip it`);
  }
  // Five time constants bring the capacitor within 1 % of its floor (common practice).
  const dischargeTimeConstantUs = values.rDischargeOhm * values.cRampFarad * 1e6;
  if (design.rectifier === 'full-wave' && 5 * dischargeTimeConstantUs > design.syncResetUs) {
    warning('parts.rDischarge.ohm', `the reset (${format(design.syncResetUs)} us) is shorter than five discharge time constants (5 x ${format(dischargeTimeConstantUs)} us): the ramp will not start from its floor`);
  }
  return problems;
}
