/**
 * The ramp a board makes: current source (operatingPoint.ts), charging the ramp capacitor from the reset floor
 * for one half-cycle minus the reset time, until the source runs out of compliance and the ramp clips.
 *
 * - Active region: I_C(v) falls linearly with the ramp voltage v through the Early effect (r_o = (V_A + V_EC)/I_C,
 *   REFERENCES.md), taken as the straight line through the exact operating points at the floor and at the clipping
 *   level; C dv/dt = I0 - G (v - floor) then has the closed form v = floor + (I0/G)(1 - exp(-G t/C)).
 * - Clipping: the transistor saturates when V_EC reaches vecSatV (REFERENCES.md: compliance limit). Beyond it the
 *   emitter is no longer held: with V_EC = vecSatV and V_EB fixed, KCL gives
 *   C dv/dt = (V - v - V_ECsat)/R_E - (v + V_ECsat - V_EB - V_TH)/R_TH, an exponential approach with time constant
 *   C (R_E || R_TH). A stiff divider (small R_TH) clips flat; a weak one lets the ramp bend over slowly.
 * - Floor: during reset the discharge resistor carries the source current, floor = I_C R_dis, plus what is left of
 *   the previous peak after the reset time (time constant R_dis C): steady state by fixed-point iteration.
 */
import type { BoardDesign } from './design';
import { solveOperatingPoint, theveninOf } from './operatingPoint';
import { boardPartValues, type PartOverrides } from './parts';
import { biasNetworkOf, transistorLawOf } from './transistorLaw';

export interface RampOptions {
  /** Extra V_EB at the same current (V). */
  vebShiftV?: number;
  /** Board temperature (C); V_EB drifts about -2 mV/K (REFERENCES.md: Sedra and Smith). */
  temperatureC?: number;
  /** Current gain of the fitted transistor, when not the design's. */
  beta?: number;
  /** Parts as fitted, replacing the design's values (ohm, farad for cRamp). */
  partOverrides?: PartOverrides;
}

export interface RampPrediction {
  mainsHz: number;
  theveninV: number;
  theveninOhm: number;
  /** Emitter voltage with the ramp at the floor (V). */
  emitterV: number;
  /** V_EB at the floor (V). */
  vebV: number;
  /** Collector current with the ramp at the floor (A). */
  chargingCurrentA: number;
  /** How much the charging current falls per volt of ramp (S): the source's output conductance. */
  outputConductanceS: number;
  capacitanceFarad: number;
  /** Ramp slope at the floor (V/s). */
  initialSlopeVPerS: number;
  /** Slope at the middle of the unclipped part (V/s): what a least-squares line over that part measures. */
  slopeVPerS: number;
  /** Delay from the sync zero crossing to the ramp's start (s): half the reset time. */
  startDelayS: number;
  chargingIntervalS: number;
  floorV: number;
  /** Ramp voltage at the end of the charging interval (V). */
  peakV: number;
  /** Ramp voltage where the source saturates (V). */
  clipV: number;
  clipped: boolean;
  /** Time from the ramp's start to clipping (s); null when the ramp never reaches it in the interval. */
  clipOnsetS: number | null;
  /** clipV minus the peak the active region alone would reach (V); negative when clipped. */
  headroomV: number;
  /** Post-clip approach: final value and time constant (REFERENCES.md KCL above). */
  saturatedFinalV: number;
  saturatedTimeConstantS: number;
}

/** -expm1(-x)/x, 1 at x = 0: the factor that turns a linear rise into the exponential one. */
function riseFactor(x: number): number {
  return Math.abs(x) < 1e-9 ? 1 - x / 2 : -Math.expm1(-x) / x;
}

/** Ramp voltage in the active region t seconds after the start, ignoring clipping. */
function activeRampV(floorV: number, currentA: number, conductanceS: number, farad: number, elapsedS: number): number {
  return floorV + ((currentA * elapsedS) / farad) * riseFactor((conductanceS * elapsedS) / farad);
}

export function predictRamp(design: BoardDesign, options: RampOptions = {}): RampPrediction {
  const values = boardPartValues(design, options.partOverrides);
  const bias = biasNetworkOf(design, options.partOverrides);
  const law = transistorLawOf(design, { vebShiftV: options.vebShiftV, temperatureC: options.temperatureC, beta: options.beta });
  const { theveninV, theveninOhm } = theveninOf(bias);
  const farad = values.cRampFarad;
  const halfCycleS = 1 / (2 * design.mainsHz);
  const resetS = design.syncResetUs * 1e-6;
  const chargingIntervalS = Math.max(halfCycleS - resetS, 0);
  // Half-wave boards stay in reset through the negative half-cycle as well (the deck's detector does the same).
  const dischargeS = design.rectifier === 'half-wave' ? halfCycleS + resetS : resetS;
  const vecSatV = design.transistor.vecSatV;

  const clipLevel = (collectorGuessV: number): { clipV: number; point: ReturnType<typeof solveOperatingPoint> } => {
    let clipV = collectorGuessV;
    let point = solveOperatingPoint(bias, law, clipV);
    for (let pass = 0; pass < 3; pass += 1) {
      clipV = point.emitterV - vecSatV;
      point = solveOperatingPoint(bias, law, clipV);
    }
    return { clipV, point };
  };

  let floorV = 0;
  let result: RampPrediction | null = null;
  for (let pass = 0; pass < 6; pass += 1) {
    const atFloor = solveOperatingPoint(bias, law, floorV);
    const { clipV, point: atClip } = clipLevel(atFloor.emitterV - vecSatV);
    const currentA = atFloor.collectorCurrentA;
    const spanV = clipV - floorV;
    const conductanceS = spanV > 1e-9 ? Math.max(0, (currentA - atClip.collectorCurrentA) / spanV) : 0;
    const unclippedPeakV = activeRampV(floorV, currentA, conductanceS, farad, chargingIntervalS);
    const clipOnsetS = clipOnsetTime(floorV, clipV, currentA, conductanceS, farad);
    const clipped = clipOnsetS !== null && clipOnsetS < chargingIntervalS;
    // Saturated segment: C dv/dt = a - b v (header comment).
    const inverseOhm = 1 / bias.rEmitterOhm + 1 / theveninOhm;
    const drive = (design.supplyV - vecSatV) / bias.rEmitterOhm + (theveninV + atClip.vebV - vecSatV) / theveninOhm;
    const saturatedFinalV = drive / inverseOhm;
    const saturatedTimeConstantS = farad / inverseOhm;
    const partial: RampPrediction = {
      mainsHz: design.mainsHz,
      theveninV,
      theveninOhm,
      emitterV: atFloor.emitterV,
      vebV: atFloor.vebV,
      chargingCurrentA: currentA,
      outputConductanceS: conductanceS,
      capacitanceFarad: farad,
      initialSlopeVPerS: currentA / farad,
      slopeVPerS: 0,
      startDelayS: Math.min(resetS / 2, halfCycleS / 2),
      chargingIntervalS,
      floorV,
      peakV: 0,
      clipV,
      clipped,
      clipOnsetS,
      headroomV: clipV - unclippedPeakV,
      saturatedFinalV,
      saturatedTimeConstantS,
    };
    partial.peakV = rampVoltageAt(partial, chargingIntervalS);
    const linearEndS = clipped && clipOnsetS !== null ? clipOnsetS : chargingIntervalS;
    partial.slopeVPerS = (currentA / farad) * Math.exp((-conductanceS * (linearEndS / 2)) / farad);
    result = partial;
    const dischargeTimeConstantS = values.rDischargeOhm * farad;
    const settledV = currentA * values.rDischargeOhm;
    const nextFloorV = settledV + (partial.peakV - settledV) * Math.exp(-dischargeS / dischargeTimeConstantS);
    if (Math.abs(nextFloorV - floorV) < 1e-9) break;
    floorV = nextFloorV;
  }
  if (result === null) throw new Error('predictRamp: no pass ran (bug)');
  return result;
}

function clipOnsetTime(floorV: number, clipV: number, currentA: number, conductanceS: number, farad: number): number | null {
  if (clipV <= floorV) return 0;
  if (currentA <= 0) return null;
  const spanV = clipV - floorV;
  const x = (conductanceS * spanV) / currentA;
  if (x >= 1) return null; // the current would fall to zero before the ramp got there
  const linearS = (spanV * farad) / currentA;
  return x < 1e-9 ? linearS : (linearS * -Math.log1p(-x)) / x;
}

/**
 * The model ramp `elapsedS` seconds after the ramp's start (exact to the model, a few floating-point operations):
 * the floor before the start, the active-region exponential up to clipping, the saturated approach after it,
 * and the value at the end of the charging interval after that (the board resets then; callers place resets).
 */
export function rampVoltageAt(prediction: RampPrediction, elapsedS: number): number {
  const { floorV, chargingCurrentA, outputConductanceS, capacitanceFarad, clipOnsetS, clipV } = prediction;
  const timeS = Math.min(Math.max(elapsedS, 0), prediction.chargingIntervalS);
  if (clipOnsetS === null || timeS <= clipOnsetS) {
    return activeRampV(floorV, chargingCurrentA, outputConductanceS, capacitanceFarad, timeS);
  }
  const sinceClipS = timeS - clipOnsetS;
  // A reset too short to pull the ramp below the clipping level starts the saturated part from the floor.
  const startV = Math.max(clipV, floorV);
  return prediction.saturatedFinalV + (startV - prediction.saturatedFinalV) * Math.exp(-sinceClipS / prediction.saturatedTimeConstantS);
}

/**
 * Time after the ramp's start at which the model ramp first reaches `levelV` (s), or null when it never does
 * within the charging interval. Inverse of rampVoltageAt on its rising part.
 */
export function timeToReachV(prediction: RampPrediction, levelV: number): number | null {
  const { floorV, chargingCurrentA, outputConductanceS, capacitanceFarad, clipOnsetS, clipV } = prediction;
  if (levelV <= floorV) return 0;
  if (levelV > prediction.peakV) return null;
  if (clipOnsetS === null || levelV <= clipV) {
    return clipOnsetTime(floorV, levelV, chargingCurrentA, outputConductanceS, capacitanceFarad);
  }
  const ratio = (levelV - prediction.saturatedFinalV) / (Math.max(clipV, floorV) - prediction.saturatedFinalV);
  const timeS = clipOnsetS - prediction.saturatedTimeConstantS * Math.log(ratio);
  // A level equal to the peak within rounding on a flat saturated tail: it is reached by the interval's end.
  return Number.isFinite(timeS) && timeS <= prediction.chargingIntervalS ? timeS : prediction.chargingIntervalS;
}
