/**
 * One suggestion of the trim plan, and how it is put in words: a repair (a part outside its tolerance measured and
 * replaced with its design value) or a bias trim (a resistor in standard values, trimCandidates.ts). Parts are named
 * as a technician names them (partNames.ts) and values in the drawing code (formatValues.ts).
 */
import type { BoardDesign } from './design';
import type { ESeriesName } from './eSeries';
import { alphaRangeOf } from './firingAngle';
import { controlLimitsOf } from './controlDivider';
import { formatFarad, formatOhm, formatPercent, formatVolt } from './formatValues';
import { designValueOf } from './measuredParts';
import { suspectWords, type Suspect } from './partDiagnosis';
import { partName, type BoardPart } from './partNames';
import type { PartOverrides } from './parts';
import { predictRamp, type RampPrediction } from './rampModel';
import type { RampReadings } from './rampReadings';
import type { ResistorRole, TrimCandidate, TrimMethod } from './trimCandidates';

export interface TrimSuggestion {
  /** `repair`: replace a part that is outside its tolerance with its design value; `trim`: change the bias. */
  kind: 'repair' | 'trim';
  /** The position (design role key), or `transistor` for the ramp transistor. */
  part: BoardPart;
  ref: string | null;
  method: TrimMethod;
  /** Resistor positions: the value there now (for a repair: the value the ramp points to, or the one measured). */
  fromOhm: number | null;
  /** Resistor positions: the effective resistance after the change (for a repair: the design value). */
  toOhm: number | null;
  /** The ramp capacitor: the value the ramp points to (or measured), and the design value it is replaced with. */
  fromFarad: number | null;
  toFarad: number | null;
  /** The resistor added in parallel or series; null for a replacement. */
  addOhm: number | null;
  series: ESeriesName;
  predictedPeakV: number;
  predictedPeakErrorPct: number;
  /** Alpha the control pot covers after the change: from the ramp's start to the pot's end (null: past the ramp's end). */
  predictedAlphaRangeDeg: { minDeg: number; maxDeg: number | null };
  headroomV: number;
  clipped: boolean;
  /** The predicted peak is within the design's ramp tolerance band. */
  withinTolerance: boolean;
  /** Within the band, unclipped and with the least headroom to clipping. */
  usable: boolean;
  /**
   * How far the predicted peak may move (percent of the target) because the parts already on the board are only
   * known within their tolerance (the meter's accuracy once measured); 0 for a repair, which puts a known value in.
   */
  uncertaintyPct: number;
  alsoChange: { part: ResistorRole; ref: string | null; fromOhm: number; toOhm: number } | null;
  reason: string;
}

interface Outcome {
  prediction: RampPrediction;
  errorPct: number;
  withinTolerance: boolean;
  usable: boolean;
  words: string;
  alphaRangeDeg: { minDeg: number; maxDeg: number | null };
}

function outcomeOf(design: BoardDesign, prediction: RampPrediction, partOverrides: PartOverrides, minHeadroomV: number): Outcome {
  const errorPct = ((prediction.peakV - design.rampTargetV) / design.rampTargetV) * 100;
  const withinTolerance = !prediction.clipped && Math.abs(errorPct) <= design.tolerances.rampPeakPct;
  const usable = withinTolerance && prediction.headroomV >= minHeadroomV;
  const band = `outside the ${design.tolerances.rampPeakPct} % band, so the ramp would still miss its target`;
  const words = prediction.clipped
    ? `the ramp would still clip (${formatVolt(prediction.peakV)})`
    : `peak ${formatVolt(prediction.peakV)} (${formatPercent(errorPct)}), ${formatVolt(prediction.headroomV)} below clipping${withinTolerance ? '' : `: ${band}`}${withinTolerance && !usable ? ', too close to clipping' : ''}`;
  const range = alphaRangeOf(design, prediction);
  const limits = controlLimitsOf(design, { prediction, partOverrides });
  return { prediction, errorPct, withinTolerance, usable, words, alphaRangeDeg: { minDeg: range.startDeg, maxDeg: limits.alphaMaxDeg } };
}

/** The replacement of a suspect with its design value, predicted with every other part as designed (or known). */
export function repairSuggestion(design: BoardDesign, suspect: Suspect, options: { known: PartOverrides; series: ESeriesName; minHeadroomV: number }): TrimSuggestion {
  const after: PartOverrides = { ...options.known };
  if (suspect.part !== 'transistor') after[suspect.part] = designValueOf(design, suspect.part) ?? undefined;
  const outcome = outcomeOf(design, predictRamp(design, { partOverrides: after }), after, options.minHeadroomV);
  const name = partName(design, suspect.part);
  const capacitor = suspect.part === 'cRamp';
  const transistor = suspect.part === 'transistor';
  const designWords = capacitor ? formatFarad(suspect.designValue) : formatOhm(suspect.designValue);
  const action = transistor
    ? `Replace the ${name} with a good one of the design's type`
    : suspect.measured
      ? `Replace the ${name} with ${designWords}`
      : `Measure the ${name} and replace it with ${designWords}`;
  const reason = `${action}: ${suspectWords(design, suspect)}; after it, ${outcome.words}.`;
  return {
    kind: 'repair',
    part: suspect.part,
    ref: transistor ? null : (design.parts[suspect.part as Exclude<BoardPart, 'transistor'>]?.ref ?? null),
    method: 'replace',
    fromOhm: transistor || capacitor ? null : suspect.explainingValue,
    toOhm: transistor || capacitor ? null : suspect.designValue,
    fromFarad: capacitor ? suspect.explainingValue : null,
    toFarad: capacitor ? suspect.designValue : null,
    addOhm: null,
    series: options.series,
    predictedPeakV: outcome.prediction.peakV,
    predictedPeakErrorPct: outcome.errorPct,
    predictedAlphaRangeDeg: outcome.alphaRangeDeg,
    headroomV: outcome.prediction.headroomV,
    clipped: outcome.prediction.clipped,
    withinTolerance: outcome.withinTolerance,
    usable: outcome.usable,
    uncertaintyPct: 0,
    alsoChange: null,
    reason,
  };
}

/** A bias trim in words: the action, why it works, and the predicted result (outside the band said so). */
export function trimSuggestion(
  design: BoardDesign,
  candidate: TrimCandidate,
  measured: RampReadings,
  before: RampPrediction,
  options: { series: ESeriesName; fitted: PartOverrides; minHeadroomV: number; compensating: 'measured' | 'suspected' | null; uncertaintyPct: number },
): TrimSuggestion {
  const outcome = outcomeOf(design, candidate.prediction, options.fitted, options.minHeadroomV);
  const name = partName(design, candidate.part);
  let action: string;
  if (candidate.method === 'parallel') {
    action = `Solder ${formatOhm(candidate.partOhm)} across the ${name} (${formatOhm(candidate.fromOhm)}), making ${formatOhm(candidate.toOhm)}`;
  } else if (candidate.method === 'series') {
    action = `Add ${formatOhm(candidate.partOhm)} in series with the ${name} (${formatOhm(candidate.fromOhm)}), making ${formatOhm(candidate.toOhm)}`;
  } else {
    action = `Replace the ${name} (${formatOhm(candidate.fromOhm)}) with ${formatOhm(candidate.toOhm)}`;
  }
  if (candidate.alsoChange) action += ` and the ${partName(design, candidate.alsoChange.part)} (${formatOhm(candidate.alsoChange.fromOhm)}) with ${formatOhm(candidate.alsoChange.toOhm)}`;
  const why =
    candidate.part === 'rEmitter'
      ? candidate.prediction.chargingCurrentA > before.chargingCurrentA
        ? 'more charging current'
        : `less charging current${measured.clipped ? ', so the ramp stays below the clipping level' : ''}`
      : candidate.alsoChange
        ? 'the base moves up for headroom, the emitter resistor sets the current'
        : 'the base voltage moves the emitter drop';
  const onlyIf = options.compensating === 'suspected' ? 'Only if the parts measure good: ' : options.compensating === 'measured' ? 'Instead of the replacement: ' : '';
  // Worth saying when the parts already on the board could move the result by a third of the band or more.
  const unsure =
    options.uncertaintyPct >= design.tolerances.rampPeakPct / 3
      ? `; the ${partName(design, candidate.part)} on the board could move this by up to ${options.uncertaintyPct.toFixed(1)} %: measure it first`
      : '';
  const lead = options.compensating ? action.charAt(0).toLowerCase() + action.slice(1) : action;
  return {
    kind: 'trim',
    part: candidate.part,
    ref: design.parts[candidate.part]?.ref ?? null,
    method: candidate.method,
    fromOhm: candidate.fromOhm,
    toOhm: candidate.toOhm,
    fromFarad: null,
    toFarad: null,
    addOhm: candidate.method === 'replace' ? null : candidate.partOhm,
    series: options.series,
    predictedPeakV: candidate.prediction.peakV,
    predictedPeakErrorPct: outcome.errorPct,
    predictedAlphaRangeDeg: outcome.alphaRangeDeg,
    headroomV: candidate.prediction.headroomV,
    clipped: candidate.prediction.clipped,
    withinTolerance: outcome.withinTolerance,
    usable: outcome.usable,
    uncertaintyPct: options.uncertaintyPct,
    alsoChange: candidate.alsoChange ? { ...candidate.alsoChange, ref: design.parts[candidate.alsoChange.part]?.ref ?? null } : null,
    reason: `${onlyIf}${lead}: ${why}; ${outcome.words}${unsure}.`,
  };
}
