/**
 * Sizing: from targets to a complete part set in standard values, verified with the model.
 *
 * 1. Charging current I_C from the ramp: C dv/dt = I_C over the charging interval (REFERENCES.md: slope = I_C/C),
 *    refined with the full model so the Early droop is included.
 * 2. Emitter at V (1 - drop fraction); R_E = V_drop / I_E with I_E = I_C (beta+1)/beta (REFERENCES.md: Malvino).
 * 3. Base at V_E - V_EB; divider R1 = (V - V_B)/I_div, R2 = V_B/(I_div - I_B), I_div by default from the
 *    stiff-divider rule R_TH <= 0.01 beta R_E (Malvino, from memory).
 * 4. R1 and R2 tried over the series' values near the exact ones (wider for coarse series), R_E re-solved exactly for each pair
 *    and rounded each way; the combination whose ramp peak lands nearest the target, with the emitter drop near
 *    the asked share and headroom to clipping, wins.
 * 5. Control-limit resistor for alphaMaxDeg, rounded up so alpha stays short of it (controlDivider.ts).
 */
import { InputError } from '../errors';
import { controlLimitsOf } from './controlDivider';
import { type BoardDesign, boardDesignSchema } from './design';
import { designRanges, withinRange } from './designRanges';
import { formatOhm } from './formatValues';
import { type ESeriesName, eSeriesTolerancePct, standardValueNeighbours, standardValuesBetween } from './eSeries';
import { predictRamp, type RampPrediction } from './rampModel';
import type { SizingTargets } from './sizingTargets';
import { analyseTolerances, type ToleranceReport } from './toleranceAnalysis';
import { exactOhmFor } from './trimCandidates';

/** Least headroom between the sized ramp's peak and clipping (V), common practice. */
export const sizingHeadroomV = 0.5;
const weightPerDrop = 5;
const dividerSearchSpread: Record<ESeriesName, number> = { E6: 1.8, E12: 1.5, E24: 1.25, E48: 1.08, E96: 1.05, E192: 1.025 };

export interface SizingResult {
  design: BoardDesign;
  prediction: RampPrediction;
  peakErrorPct: number;
  tolerance: ToleranceReport;
  /** The values before rounding to the series (ohm). */
  exactOhm: { rEmitter: number; rBiasTop: number; rBiasBottom: number; rControlTop: number | null };
  notes: string[];
}

function neighbours(value: number, series: ESeriesName): number[] {
  const { below, above } = standardValueNeighbours(value, series);
  return below === above ? [below] : [below, above];
}

/** The design with these resistors, or null when one lies outside the resistors makers list (designRanges.ts). */
function designFrom(targets: SizingTargets, ohm: { rEmitter: number; rBiasTop: number; rBiasBottom: number; rControlTop?: number }): BoardDesign | null {
  if (Object.values(ohm).some((value) => value !== undefined && !withinRange(value, designRanges.resistorOhm))) return null;
  const tolerancePct = eSeriesTolerancePct[targets.series as ESeriesName];
  return boardDesignSchema.parse({
    name: targets.name,
    mainsHz: targets.mainsHz,
    rectifier: targets.rectifier,
    supplyV: targets.supplyV,
    rampTargetV: targets.rampTargetV,
    alphaMinDeg: targets.alphaMinDeg,
    alphaMaxDeg: targets.alphaMaxDeg,
    syncPhaseDeg: targets.syncPhaseDeg,
    syncResetUs: targets.syncResetUs,
    gatePulseUs: targets.gatePulseUs,
    parts: {
      rEmitter: { ohm: ohm.rEmitter, tolerancePct },
      rBiasTop: { ohm: ohm.rBiasTop, tolerancePct },
      rBiasBottom: { ohm: ohm.rBiasBottom, tolerancePct },
      cRamp: { farad: targets.cRampFarad, tolerancePct: targets.capacitorTolerancePct },
      ...(ohm.rControlTop !== undefined ? { rControlTop: { ohm: ohm.rControlTop, tolerancePct } } : {}),
      potControl: { ohm: targets.potControlOhm, tolerancePct: 20 },
    },
    transistor: targets.transistor,
  });
}

export function sizeBoard(targets: SizingTargets): SizingResult {
  const series = targets.series as ESeriesName;
  const { vebV, beta, vecSatV } = targets.transistor;
  const notes: string[] = [];
  const supplyV = targets.supplyV;
  const emitterV = supplyV * (1 - targets.emitterDropFraction);
  if (emitterV - vecSatV < targets.rampTargetV + sizingHeadroomV) {
    throw new InputError(
      `an emitter drop of ${(targets.emitterDropFraction * 100).toFixed(0)} % puts the emitter at ${emitterV.toFixed(2)} V, so the ramp clips near ${(emitterV - vecSatV).toFixed(2)} V, ` +
        `too close to the ${targets.rampTargetV} V target (needs ${sizingHeadroomV} V headroom): lower the emitter drop or the target, or raise the supply`,
      'emitterDropFraction',
    );
  }
  const chargingS = 1 / (2 * targets.mainsHz) - targets.syncResetUs * 1e-6;
  if (!(chargingS > 0)) throw new InputError('the reset time leaves no charging time in a half-cycle', 'syncResetUs');
  const collectorA = (targets.cRampFarad * targets.rampTargetV) / chargingS;
  const emitterA = (collectorA * (beta + 1)) / beta;
  const rEmitterFirst = (supplyV - emitterV) / emitterA;
  const baseV = emitterV - vebV;
  const baseA = emitterA / (beta + 1);
  // Stiff divider: R_TH = 0.01 beta R_E; with R_TH ~ (V - V_B) V_B / (V I_div) that fixes I_div.
  const dividerA = targets.dividerCurrentA ?? ((supplyV - baseV) * baseV) / (supplyV * 0.01 * beta * rEmitterFirst);
  if (dividerA <= 2 * baseA) {
    throw new InputError(`a divider current of ${(dividerA * 1e6).toFixed(1)} uA is not well above the base current (${(baseA * 1e6).toFixed(2)} uA): raise it`, 'dividerCurrentA');
  }
  const exactTop = (supplyV - baseV) / dividerA;
  const exactBottom = baseV / (dividerA - baseA);
  // A capacitor too small for its ramp asks for resistors beyond 10 Mohm, one too large for ones below 1 ohm.
  for (const [role, exact] of [['rEmitter', rEmitterFirst], ['rBiasTop', exactTop], ['rBiasBottom', exactBottom]] as const) {
    if (withinRange(exact, designRanges.resistorOhm)) continue;
    const tooLarge = exact > designRanges.resistorOhm.max;
    throw new InputError(
      `these targets need ${role} of about ${formatOhm(exact)}, ${tooLarge ? 'above' : 'below'} the ${formatOhm(designRanges.resistorOhm.min)} to ${formatOhm(designRanges.resistorOhm.max)} resistors are made in: ` +
        `choose a ${tooLarge ? 'larger' : 'smaller'} ramp capacitor${targets.dividerCurrentA === undefined ? '' : ' or another divider current'}`,
      'cRampFarad',
    );
  }

  let best: { design: BoardDesign; prediction: RampPrediction; score: number; exactEmitter: number } | null = null;
  // Divider values around the exact ones: with a coarse series the pair's ratio is the fine adjustment that the
  // emitter resistor's steps lack, so coarse series search wider; the emitter drop is kept near the asked share
  // by the score below. About three to five values each way keeps the search to a few hundred model runs.
  const spread = dividerSearchSpread[series];
  const dividerValues = (exact: number): number[] => {
    const values = standardValuesBetween(exact / spread, exact * spread, series);
    return values.length > 0 ? values : neighbours(exact, series);
  };
  for (const rBiasTop of dividerValues(exactTop)) {
    for (const rBiasBottom of dividerValues(exactBottom)) {
      const provisional = designFrom(targets, { rEmitter: rEmitterFirst, rBiasTop, rBiasBottom });
      if (provisional === null) continue;
      if ((supplyV * rBiasBottom) / (rBiasTop + rBiasBottom) + vebV >= supplyV) continue;
      const exactEmitter = exactOhmFor({ design: provisional, series, vebShiftV: 0, fitted: {} }, 'rEmitter', targets.rampTargetV);
      if (exactEmitter === null) continue;
      for (const rEmitter of neighbours(exactEmitter, series)) {
        const design = designFrom(targets, { rEmitter, rBiasTop, rBiasBottom });
        if (design === null) continue;
        const prediction = predictRamp(design);
        const errorPct = (Math.abs(prediction.peakV - targets.rampTargetV) / targets.rampTargetV) * 100;
        // One percent of ramp error weighs as much as a fifth of the supply off the asked emitter drop: the drop
        // is a soft wish (it trades V_EB sensitivity against headroom), the ramp height is the target.
        const dropError = Math.abs((supplyV - prediction.emitterV) / supplyV - targets.emitterDropFraction);
        const score = errorPct + weightPerDrop * dropError + (prediction.clipped || prediction.headroomV < sizingHeadroomV ? 100 : 0);
        if (best === null || score < best.score) best = { design, prediction, score, exactEmitter };
      }
    }
  }
  if (best === null) throw new InputError('no divider in the series (within 1 ohm to 10 Mohm) leaves the transistor conducting at these targets', 'supplyV');

  const limits = controlLimitsOf(best.design, { prediction: best.prediction });
  let design = best.design;
  let exactControl: number | null = null;
  // Round up: a larger top resistor keeps alpha short of alphaMaxDeg.
  const rControlTop = limits.limitResistorOhm === null ? null : standardValueNeighbours(limits.limitResistorOhm, series).above;
  const limited = rControlTop === null ? null : designFrom(targets, { rEmitter: best.design.parts.rEmitter.ohm, rBiasTop: best.design.parts.rBiasTop.ohm, rBiasBottom: best.design.parts.rBiasBottom.ohm, rControlTop });
  if (limited !== null) {
    exactControl = limits.limitResistorOhm;
    design = limited;
  } else if (rControlTop !== null) {
    notes.push(`the control-limit resistor for alphaMaxDeg ${targets.alphaMaxDeg} deg would be ${formatOhm(rControlTop)}, outside the resistors made: none fitted`);
  } else {
    notes.push(`alphaMaxDeg ${targets.alphaMaxDeg} deg lies outside the ramp: no control-limit resistor fitted`);
  }
  const prediction = predictRamp(design);
  const peakErrorPct = ((prediction.peakV - targets.rampTargetV) / targets.rampTargetV) * 100;
  if (Math.abs(peakErrorPct) > design.tolerances.rampPeakPct) {
    notes.push(`the nearest ${series} values land the ramp ${peakErrorPct.toFixed(1)} % from the target: a finer series (E24 or E96) lands closer`);
  }
  if (prediction.clipped || prediction.headroomV < sizingHeadroomV) {
    notes.push(`only ${prediction.headroomV.toFixed(2)} V headroom to clipping: lower the emitter drop fraction`);
  }
  return {
    design,
    prediction,
    peakErrorPct,
    tolerance: analyseTolerances(design, { runs: 400 }),
    exactOhm: { rEmitter: best.exactEmitter, rBiasTop: exactTop, rBiasBottom: exactBottom, rControlTop: exactControl },
    notes,
  };
}
