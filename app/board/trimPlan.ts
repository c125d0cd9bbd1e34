/**
 * The trim plan: diagnose first, then compensate. From the readings of a board's ramp:
 * 1. Diagnosis (partDiagnosis.ts): does the ramp fit a board whose parts are each within tolerance? When only a part
 *    outside its own tolerance explains it (or the technician measured one), the first suggestions are to measure
 *    and replace that part with its design value, each with the ramp predicted after the replacement.
 * 2. Bias trims (trimCandidates.ts): estimate what the current source actually does (estimateFromReadings.ts) and
 *    list the resistor changes in standard values (IEC 60063, nearest by ratio) that bring the ramp peak to
 *    rampTargetV, each with its predicted result. They come first only when the ramp fits good parts stacking up,
 *    or the measured parts show they are good (common practice: a trim is for a board whose parts are within
 *    tolerance; a part far outside it is replaced).
 * Ranking of the trims (trimRanking.ts): usable and within the ramp tolerance band first; then one standard part
 * swapped before two combined; then less bench work; then nearer the target. A suggestion outside the band says so.
 * The summary is one line; the reasoning follows in the notes, each thing said once.
 */
import { InputError } from '../errors';
import type { BoardDesign } from './design';
import { type ESeriesName } from './eSeries';
import { estimateFromReadings } from './estimateFromReadings';
import { alphaRangeOf } from './firingAngle';
import { formatPercent, formatVolt } from './formatValues';
import { describeMeasuredParts } from './measuredParts';
import { diagnoseRamp, type PartDiagnosis } from './partDiagnosis';
import { partName, type BoardPart } from './partNames';
import type { PartOverrides } from './parts';
import { predictRamp } from './rampModel';
import type { RampReadings } from './rampReadings';
import { controlLimitSuggestion, type ControlLimitSuggestion } from './controlLimitAdvice';
import { type CandidateContext, predictWith } from './trimCandidates';
import { rankedTrims } from './trimRanking';
import { repairSuggestion, type TrimSuggestion } from './trimSuggestion';

export type { TrimSuggestion } from './trimSuggestion';
export type { ControlLimitSuggestion } from './controlLimitAdvice';

export interface TrimPlanOptions {
  /** Series to pick values from. Default E24. */
  series?: ESeriesName;
  /** Part values known on the board when they differ from the design: measured, or fitted this session (ohm, farad). */
  fitted?: PartOverrides;
  /** The subset of `fitted` the technician measured (a measured part outside its tolerance is a fault to replace). */
  measured?: PartOverrides;
  /** Least headroom between the ramp peak and clipping a suggestion may leave (V). Default 0.5 V (common practice). */
  minHeadroomV?: number;
  /** Most trim suggestions listed (repairs come on top). Default 5. */
  maxSuggestions?: number;
}

export interface TrimPlan {
  /** `repair`: a part is off and comes first; `trim`: a bias trim is the cure; `no-fix`: no trim reaches the target. */
  status: 'in-tolerance' | 'repair' | 'trim' | 'no-fix';
  /** One line: how far off the ramp is, and the first thing to do. */
  summary: string;
  measuredPeakErrorPct: number;
  estimate: {
    chargingCurrentA: number;
    /** Effective V_EB that explains the ramp with the parts as designed (may be unphysical when explanation is 'capacitance'). */
    vebV: number;
    designCurrentA: number;
    currentErrorPct: number;
    capacitanceErrorPct: number;
    basis: 'peak' | 'slope';
    explanation: 'veb' | 'capacitance';
    ambiguity: string;
  };
  diagnosis: PartDiagnosis;
  suggestions: TrimSuggestion[];
  controlLimit: ControlLimitSuggestion | null;
  /** The reasoning, each thing once, in the order a technician reads it. */
  notes: string[];
}

function firstAction(suggestion: TrimSuggestion): string {
  // The reason's first clause is the action ("Replace ... with ...", "Measure ... and replace ...").
  const action = suggestion.reason.split(/: |; /)[0];
  return action.charAt(0).toLowerCase() + action.slice(1);
}

export function planTrim(design: BoardDesign, measured: RampReadings, options: TrimPlanOptions = {}): TrimPlan {
  assertRampReadings(measured);
  const series = options.series ?? 'E24';
  const minHeadroomV = options.minHeadroomV ?? 0.5;
  const fitted = options.fitted ?? {};
  const measuredParts = options.measured ?? {};
  const targetV = design.rampTargetV;
  const estimate = estimateFromReadings(design, measured, { partOverrides: fitted });
  const context: CandidateContext = { design, series, vebShiftV: estimate.modelShiftV, fitted: estimate.modelOverrides };
  const measuredPeakErrorPct = ((measured.peakV - targetV) / targetV) * 100;
  const estimateOut = {
    chargingCurrentA: estimate.chargingCurrentA,
    vebV: estimate.vebV,
    designCurrentA: estimate.designCurrentA,
    currentErrorPct: estimate.currentErrorPct,
    capacitanceErrorPct: estimate.capacitanceErrorPct,
    basis: estimate.basis,
    explanation: estimate.explanation,
    ambiguity: estimate.ambiguity,
  };
  const notes: string[] = [];
  const measuredWords = describeMeasuredParts(design, fitted);
  if (measuredWords.length > 0) notes.push(`Planned for the board as built: ${measuredWords.join(', ')}.`);
  // A ramp that starts late has a shorter charging interval: its peak is low for a reason no resistor of the
  // current source should fix (commissioning rule: the ramp starts within a few degrees, REFERENCES.md).
  if (measured.startDelayDeg !== undefined) {
    // Both counted from the mains zero crossing: the analyzer adds the sync lag (syncPhaseDeg), and so does startDeg.
    const designStartDeg = alphaRangeOf(design, estimate.prediction).startDeg;
    if (Math.abs(measured.startDelayDeg - designStartDeg) > design.tolerances.startDelayDeg) {
      notes.push(
        `The ramp starts ${measured.startDelayDeg.toFixed(1)} deg after the zero crossing, the design ${designStartDeg.toFixed(1)} deg: check the sync and reset circuit first, the charging time (and so the peak) depends on it.`,
      );
    }
  }
  const diagnosis = diagnoseRamp(design, measured, { known: fitted, measured: measuredParts });
  const inTolerance = !measured.clipped && Math.abs(measuredPeakErrorPct) <= design.tolerances.rampPeakPct;
  const head = measured.clipped
    ? `The ramp clips at about ${formatVolt(measured.peakV)}, its charging current too high for the supply headroom`
    : `Ramp peak ${formatVolt(measured.peakV)} is ${formatPercent(measuredPeakErrorPct)} from the ${formatVolt(targetV)} target`;
  // The suspects in order, at most four: the ramp cannot tell them apart, so the technician measures them in this
  // order until one reads wrong (and tells the plan the ones that read right).
  const repairs = diagnosis.suspects
    .slice(0, 4)
    .map((suspect) => repairSuggestion(design, suspect, { known: fitted, series, minHeadroomV }));

  if (inTolerance && repairs.length === 0) {
    return {
      status: 'in-tolerance',
      summary: `Ramp peak ${formatVolt(measured.peakV)} is within ${design.tolerances.rampPeakPct} % of the ${formatVolt(targetV)} target (${formatPercent(measuredPeakErrorPct)}): no change needed.`,
      measuredPeakErrorPct,
      estimate: estimateOut,
      diagnosis,
      suggestions: [],
      controlLimit: controlLimitSuggestion(design, measured, estimate.prediction, context),
      notes,
    };
  }

  const envelopeWords = `good parts give a ${diagnosis.basis === 'peak' ? 'rise' : 'slope'} of ${rangeWords(diagnosis)}, this ramp ${valueWords(diagnosis, diagnosis.measured)}`;
  const measuredOff = diagnosis.suspects.filter((suspect) => suspect.measured);
  if (measuredOff.length > 0 && diagnosis.consistent) {
    notes.push(`With the ${measuredOff.map((suspect) => `${partName(design, suspect.part)} as measured`).join(' and the ')}, the ramp fits every other part inside its tolerance (${envelopeWords}): replacing it is the cure.`);
  } else if (diagnosis.consistent) {
    notes.push(`The ramp fits parts within their tolerances that stack up (${envelopeWords}): a bias trim is the cure.`);
  } else {
    notes.push(`No board with every part inside its tolerance makes this ramp (${envelopeWords}): a part is off.`);
  }
  if (diagnosis.measureFirst) notes.push(diagnosis.measureFirst);

  const compensating = measuredOff.length > 0 ? 'measured' : repairs.length > 0 ? 'suspected' : null;
  const trims = inTolerance
    ? []
    : rankedTrims(context, measured, estimate.prediction, { minHeadroomV, maxSuggestions: options.maxSuggestions ?? 5, compensating, known: fitted, measuredParts });
  // The estimate matters to the trims, and only says something when the board is not as it was taken to be.
  if (trims.length > 0 && Math.abs(estimate.currentErrorPct) >= 1) {
    notes.push(`Estimate: ${estimate.ambiguity}. A change of the emitter resistor works out the same either way; a divider change assumes the current is off, not the capacitor.`);
  }
  if (compensating === 'suspected' && trims.length > 0) notes.push('The trims after the repairs would only hide a part that is off: use one only if the parts measure good.');
  if (compensating === 'measured' && trims.length > 0) notes.push('The trims after the replacement would leave a part outside its tolerance on the board and compensate it.');
  if (trims.length > 0) notes.push('Measure each new resistor before fitting it: the predictions take it at its marked value.');
  // A trim that puts a measured part back to its design value is the repair already listed.
  const suggestions = [...repairs, ...trims.filter((trim) => !repairs.some((repair) => repair.part === trim.part && trim.method === 'replace' && !trim.alsoChange && repair.toOhm === trim.toOhm))];
  const usableTrim = trims.find((suggestion) => suggestion.usable);
  const status: TrimPlan['status'] = repairs.length > 0 ? 'repair' : usableTrim ? 'trim' : 'no-fix';
  const summary =
    status === 'repair'
      ? `${head}, ${diagnosis.consistent ? 'and a part measured outside its tolerance' : 'more than parts within tolerance allow'}: ${firstAction(repairs[0])}.`
      : status === 'trim'
        ? `${head}, ${diagnosis.consistent ? 'within what parts in tolerance allow' : 'more than the parts as measured explain (check the transistor and the readings)'}: ${firstAction(trims[0])}.`
        : `${head}: no change of one resistor in ${series} brings the ramp to ${formatVolt(targetV)} with ${formatVolt(minHeadroomV)} headroom to clipping; the supply or the target must change.`;
  const first = suggestions[0];
  const afterChange = first ? { ...fitted, ...changesOf(first) } : fitted;
  // After a repair the board is back to its design (the fault, not the bias, was the shift): its control limit is
  // judged on that board, and an alpha max measured with the faulty part says nothing about it.
  const afterPrediction =
    first?.kind === 'repair' ? predictRamp(design, { partOverrides: afterChange }) : first?.kind === 'trim' ? predictWith(context, changesOf(first)) : estimate.prediction;
  const limitContext = first?.kind === 'repair' ? { ...context, vebShiftV: 0, fitted: afterChange } : { ...context, fitted: { ...context.fitted, ...afterChange } };
  const limitReadings = first?.kind === 'repair' ? { ...measured, alphaMaxDeg: null } : measured;
  return {
    status,
    summary,
    measuredPeakErrorPct,
    estimate: estimateOut,
    diagnosis,
    suggestions,
    controlLimit: controlLimitSuggestion(design, limitReadings, afterPrediction, limitContext),
    notes,
  };
}

function changesOf(suggestion: TrimSuggestion): PartOverrides {
  const changes: PartOverrides = {};
  if (suggestion.part !== 'transistor' && suggestion.toOhm !== null) changes[suggestion.part] = suggestion.toOhm;
  if (suggestion.part === 'cRamp' && suggestion.toFarad !== null) changes.cRamp = suggestion.toFarad;
  if (suggestion.alsoChange) changes[suggestion.alsoChange.part] = suggestion.alsoChange.toOhm;
  return changes;
}

function valueWords(diagnosis: PartDiagnosis, value: number): string {
  return diagnosis.basis === 'peak' ? formatVolt(value) : `${(value / 1000).toFixed(3)} V/ms`;
}

function rangeWords(diagnosis: PartDiagnosis): string {
  return `${valueWords(diagnosis, diagnosis.envelope.low)} to ${valueWords(diagnosis, diagnosis.envelope.high)}`;
}

/** Readings that describe no charging ramp cannot be planned from: say which reading is wrong. */
function assertRampReadings(measured: RampReadings): void {
  for (const key of ['floorV', 'peakV', 'slopeVPerMs'] as const) {
    if (!Number.isFinite(measured[key])) throw new InputError(`the ${key} reading is not a number (${measured[key]})`, 'ramp readings');
  }
  if (!(measured.peakV > measured.floorV) || !(measured.slopeVPerMs > 0)) {
    throw new InputError(
      `no charging ramp: peak ${measured.peakV} V, floor ${measured.floorV} V, slope ${measured.slopeVPerMs} V/ms (is the ramp test point connected, the current source working?)`,
      'ramp readings',
    );
  }
}

export type { BoardPart };
