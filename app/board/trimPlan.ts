/**
 * The trim plan: from the readings of a board's ramp, estimate what its current source actually does
 * (estimateFromReadings.ts), then rank the changes that bring the ramp peak to rampTargetV at the end of the
 * charging interval, each in standard values (IEC 60063, nearest by ratio) with its predicted result.
 *
 * Ranking: distance from the target plus the bench effort of the change: a resistor soldered across the fitted
 * emitter resistor (no desoldering) before a replacement, before a series resistor (a cut track), before a divider
 * change (which also moves the clipping level, and whose prediction depends on the current-versus-capacitance
 * ambiguity). Candidates that clip or leave under minHeadroomV to clipping fall to the bottom (common practice).
 */
import { InputError } from '../errors';
import type { BoardDesign } from './design';
import { type ESeriesName, standardValueNeighbours, standardValuesBetween } from './eSeries';
import { estimateFromReadings } from './estimateFromReadings';
import { alphaRangeOf } from './firingAngle';
import { controlLimitsOf } from './controlDivider';
import { formatOhm, formatPercent, formatVolt } from './formatValues';
import type { PartOverrides } from './parts';
import { partLabel } from './parts';
import type { RampReadings } from './rampReadings';
import type { RampPrediction } from './rampModel';
import { analyseTolerances } from './toleranceAnalysis';
import { type CandidateContext, candidatesFor, exactOhmFor, fittedOhm, predictWith, type ResistorRole, type TrimCandidate, type TrimMethod } from './trimCandidates';

export interface TrimPlanOptions {
  /** Series to pick values from. Default E24. */
  series?: ESeriesName;
  /** Part values known to be fitted, when they differ from the design (ohm). */
  fitted?: PartOverrides;
  /** Least headroom between the ramp peak and clipping a suggestion may leave (V). Default 0.5 V (common practice). */
  minHeadroomV?: number;
  /** Most suggestions listed. Default 5. */
  maxSuggestions?: number;
}

export interface TrimSuggestion {
  part: ResistorRole;
  ref: string | null;
  method: TrimMethod;
  fromOhm: number;
  /** Effective resistance of the position after the change (ohm). */
  toOhm: number;
  /** The resistor added in parallel or series; null for a replacement. */
  addOhm: number | null;
  series: ESeriesName;
  predictedPeakV: number;
  predictedPeakErrorPct: number;
  /** Alpha the control pot covers after the change: from the ramp's start to the pot's end (null: past the ramp's end). */
  predictedAlphaRangeDeg: { minDeg: number; maxDeg: number | null };
  headroomV: number;
  clipped: boolean;
  alsoChange: { part: ResistorRole; ref: string | null; fromOhm: number; toOhm: number } | null;
  reason: string;
}

export interface ControlLimitSuggestion {
  part: 'rControlTop';
  ref: string | null;
  method: 'replace';
  fromOhm: number | null;
  toOhm: number;
  series: ESeriesName;
  predictedAlphaMaxDeg: number | null;
  reason: string;
}

export interface TrimPlan {
  status: 'in-tolerance' | 'trim' | 'no-fix';
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
  suggestions: TrimSuggestion[];
  controlLimit: ControlLimitSuggestion | null;
  notes: string[];
}

const effortPct: Record<string, number> = { parallel: 0, replace: 0.3, series: 0.6, divider: 1.5, dividerWithEmitter: 2.5 };

function effortOf(candidate: TrimCandidate): number {
  if (candidate.part === 'rEmitter') return effortPct[candidate.method];
  // A divider moved far from its design value changes the board's bias a lot: prefer the smaller move.
  const movePct = 2 * Math.abs(Math.log(candidate.toOhm / candidate.fromOhm));
  return (candidate.alsoChange ? effortPct.dividerWithEmitter : effortPct.divider) + movePct;
}

export function planTrim(design: BoardDesign, measured: RampReadings, options: TrimPlanOptions = {}): TrimPlan {
  assertRampReadings(measured);
  const series = options.series ?? 'E24';
  const minHeadroomV = options.minHeadroomV ?? 0.5;
  const fitted = options.fitted ?? {};
  const targetV = design.rampTargetV;
  const estimate = estimateFromReadings(design, measured, { partOverrides: fitted });
  const context: CandidateContext = { design, series, vebShiftV: estimate.modelShiftV, fitted: estimate.modelOverrides };
  const measuredPeakErrorPct = ((measured.peakV - targetV) / targetV) * 100;
  const notes: string[] = [];
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

  // A ramp that starts late has a shorter charging interval: its peak is low for a reason no resistor of the
  // current source should fix (commissioning rule: the ramp starts within a few degrees, REFERENCES.md).
  if (measured.startDelayDeg !== undefined) {
    const designStartDeg = alphaRangeOf(design, estimate.prediction).startDeg - design.syncPhaseDeg;
    if (Math.abs(measured.startDelayDeg - designStartDeg) > design.tolerances.startDelayDeg) {
      notes.push(
        `The ramp starts ${measured.startDelayDeg.toFixed(1)} deg after the zero crossing, the design ${designStartDeg.toFixed(1)} deg: check the sync and reset circuit first, the charging time (and so the peak) depends on it.`,
      );
    }
  }
  const inTolerance = !measured.clipped && Math.abs(measuredPeakErrorPct) <= design.tolerances.rampPeakPct;
  if (inTolerance) {
    return {
      status: 'in-tolerance',
      summary: `Ramp peak ${formatVolt(measured.peakV)} is within ${design.tolerances.rampPeakPct} % of the ${formatVolt(targetV)} target (${formatPercent(measuredPeakErrorPct)}): no change needed.`,
      measuredPeakErrorPct,
      estimate: estimateOut,
      suggestions: [],
      controlLimit: controlLimitSuggestion(design, measured, estimate.prediction, context),
      notes,
    };
  }

  // A ramp further off than every corner of the tolerances suggests a wrong part, not a spread: say so first.
  const spread = analyseTolerances(design, { runs: 0, partOverrides: fitted });
  if (!measured.clipped && (measured.peakV < spread.worstCase.peakLowV || measured.peakV > spread.worstCase.peakHighV)) {
    const refs = (['rEmitter', 'rBiasTop', 'rBiasBottom', 'cRamp'] as const).map((role) => partLabel(design, role)).join(', ');
    notes.push(
      `The ramp is further from design than the parts' tolerances allow (worst case ${formatVolt(spread.worstCase.peakLowV)} to ${formatVolt(spread.worstCase.peakHighV)}): check that ${refs} and the transistor are the parts the design lists before trimming.`,
    );
  }
  notes.push(`Estimate: ${estimate.ambiguity}. Changing the emitter resistor works out the same either way; a divider change assumes the current is off, not the capacitor.`);

  const candidates: TrimCandidate[] = [...candidatesFor(context, 'rEmitter', targetV), ...candidatesFor(context, 'rBiasBottom', targetV), ...candidatesFor(context, 'rBiasTop', targetV)];
  // When the target sits too close to the clipping level, only moving the divider (and then the emitter resistor) helps.
  if (estimate.prediction.clipV < targetV + minHeadroomV) candidates.push(...dividerWithEmitter(context, targetV, minHeadroomV));

  const scored = candidates
    .map((candidate) => {
      const errorPct = (Math.abs(candidate.prediction.peakV - targetV) / targetV) * 100;
      const clippingPenalty = candidate.prediction.clipped ? 100 : candidate.prediction.headroomV < minHeadroomV ? 50 : 0;
      return { candidate, score: errorPct + effortOf(candidate) + clippingPenalty };
    })
    .sort((first, second) => first.score - second.score);
  const seen = new Set<string>();
  const suggestions: TrimSuggestion[] = [];
  for (const { candidate } of scored) {
    const key = `${candidate.part}/${candidate.method}/${candidate.partOhm}/${candidate.alsoChange?.toOhm ?? ''}`;
    if (seen.has(key)) continue;
    seen.add(key);
    suggestions.push(describe(design, candidate, measured, estimate.prediction, series, fitted));
    if (suggestions.length >= (options.maxSuggestions ?? 5)) break;
  }
  const usable = suggestions.filter((suggestion) => !suggestion.clipped && suggestion.headroomV >= minHeadroomV);
  const best = suggestions[0];
  const status = usable.length > 0 ? 'trim' : 'no-fix';
  const summary =
    status === 'trim'
      ? `${measured.clipped ? `The ramp clips at about ${formatVolt(estimate.prediction.clipV)}: the charging current is too high for the supply headroom. ` : `Ramp peak ${formatVolt(measured.peakV)} is ${formatPercent(measuredPeakErrorPct)} from the ${formatVolt(targetV)} target. `}Best: ${best.reason}`
      : `No change of one resistor in ${series} brings the ramp to ${formatVolt(targetV)} with ${formatVolt(minHeadroomV)} headroom to clipping: the supply or the target must change.`;
  const afterTrim = status === 'trim' ? predictWith(context, { [best.part]: best.toOhm, ...(best.alsoChange ? { [best.alsoChange.part]: best.alsoChange.toOhm } : {}) }) : estimate.prediction;
  return {
    status,
    summary,
    measuredPeakErrorPct,
    estimate: estimateOut,
    suggestions,
    controlLimit: controlLimitSuggestion(design, measured, afterTrim, { ...context, fitted: { ...fitted, ...(status === 'trim' ? { [best.part]: best.toOhm } : {}) } }),
    notes,
  };
}

/** Divider values that lift the clipping level to target + headroom, each with the emitter resistor re-solved. */
function dividerWithEmitter(context: CandidateContext, targetV: number, minHeadroomV: number): TrimCandidate[] {
  const results: TrimCandidate[] = [];
  for (const part of ['rBiasBottom', 'rBiasTop'] as const) {
    const fromOhm = fittedOhm(context, part);
    for (const value of standardValuesBetween(fromOhm / 4, fromOhm * 4, context.series)) {
      const exactEmitter = exactOhmFor(context, 'rEmitter', targetV, { [part]: value });
      if (exactEmitter === null) continue;
      const { below, above } = standardValueNeighbours(exactEmitter, context.series);
      for (const emitterOhm of below === above ? [below] : [below, above]) {
        const prediction = predictWith(context, { [part]: value, rEmitter: emitterOhm });
        if (prediction.clipped || prediction.headroomV < minHeadroomV) continue;
        results.push({
          part,
          method: 'replace',
          fromOhm,
          toOhm: value,
          partOhm: value,
          alsoChange: { part: 'rEmitter', fromOhm: fittedOhm(context, 'rEmitter'), toOhm: emitterOhm },
          prediction,
        });
      }
    }
  }
  return results;
}

function describe(design: BoardDesign, candidate: TrimCandidate, measured: RampReadings, before: RampPrediction, series: ESeriesName, fitted: PartOverrides): TrimSuggestion {
  const prediction = candidate.prediction;
  const label = partLabel(design, candidate.part);
  const errorPct = ((prediction.peakV - design.rampTargetV) / design.rampTargetV) * 100;
  const result = `peak ${formatVolt(prediction.peakV)} (${formatPercent(errorPct)}), ${formatVolt(prediction.headroomV)} below clipping`;
  let action: string;
  if (candidate.method === 'parallel') {
    action = `Solder ${formatOhm(candidate.partOhm)} across ${label}, now ${formatOhm(candidate.fromOhm)}, making ${formatOhm(candidate.toOhm)}`;
  } else if (candidate.method === 'series') {
    action = `Add ${formatOhm(candidate.partOhm)} in series with ${label}, now ${formatOhm(candidate.fromOhm)}, making ${formatOhm(candidate.toOhm)}`;
  } else {
    action = `Replace ${label} ${formatOhm(candidate.fromOhm)} with ${formatOhm(candidate.toOhm)}`;
  }
  if (candidate.alsoChange) action += ` and ${partLabel(design, candidate.alsoChange.part)} ${formatOhm(candidate.alsoChange.fromOhm)} with ${formatOhm(candidate.alsoChange.toOhm)}`;
  const why =
    candidate.part === 'rEmitter'
      ? prediction.chargingCurrentA > before.chargingCurrentA
        ? 'more charging current'
        : 'less charging current'
      : candidate.alsoChange
        ? 'the base moves up for headroom, the emitter resistor sets the current'
        : 'the base voltage moves the emitter drop';
  const clipNote = measured.clipped && candidate.part === 'rEmitter' ? ' (less current, so the ramp stays below the clipping level)' : '';
  const range = alphaRangeOf(design, prediction);
  const limits = controlLimitsOf(design, { prediction, partOverrides: fitted });
  return {
    part: candidate.part,
    ref: design.parts[candidate.part]?.ref ?? null,
    method: candidate.method,
    fromOhm: candidate.fromOhm,
    toOhm: candidate.toOhm,
    addOhm: candidate.method === 'replace' ? null : candidate.partOhm,
    series,
    predictedPeakV: prediction.peakV,
    predictedPeakErrorPct: errorPct,
    predictedAlphaRangeDeg: { minDeg: range.startDeg, maxDeg: limits.alphaMaxDeg },
    headroomV: prediction.headroomV,
    clipped: prediction.clipped,
    alsoChange: candidate.alsoChange ? { ...candidate.alsoChange, ref: design.parts[candidate.alsoChange.part]?.ref ?? null } : null,
    reason: `${action}: ${why}${clipNote}; ${result}.`,
  };
}

/** The fixed control resistor when the pot's end fires away from alphaMaxDeg (measured, or predicted after the trim). */
function controlLimitSuggestion(design: BoardDesign, measured: RampReadings, prediction: RampPrediction, context: CandidateContext): ControlLimitSuggestion | null {
  if (!design.parts.potControl && !design.parts.rControlTop) return null;
  const limits = controlLimitsOf(design, { prediction, partOverrides: context.fitted });
  const toleranceDeg = design.tolerances.alphaDeg;
  // Only a measured alpha past the limit counts: a lower largest alpha may just mean the pot was not at its end.
  const measuredOff = measured.alphaMaxDeg != null && measured.alphaMaxDeg > design.alphaMaxDeg + toleranceDeg;
  const predictedOff = limits.alphaMaxDeg === null || Math.abs(limits.alphaMaxDeg - design.alphaMaxDeg) > toleranceDeg;
  if (!(measuredOff || predictedOff) || limits.limitResistorOhm === null) return null;
  // Round up: a larger top resistor lowers the pot's end, so alpha stays short of alphaMaxDeg (REFERENCES.md rule).
  const toOhm = standardValueNeighbours(limits.limitResistorOhm, context.series).above;
  const fromOhm = context.fitted.rControlTop ?? design.parts.rControlTop?.ohm ?? null;
  // The fitted value is already the best the series offers: the shortfall is the series' step, not a fault.
  if (fromOhm !== null && Math.abs(fromOhm / toOhm - 1) < 1e-6) return null;
  const after = controlLimitsOf(design, { prediction, partOverrides: { ...context.fitted, rControlTop: toOhm } });
  const label = partLabel(design, 'rControlTop');
  const seen = measured.alphaMaxDeg != null ? `alpha max measured ${measured.alphaMaxDeg.toFixed(1)} deg` : `alpha max would be ${limits.alphaMaxDeg === null ? 'past the ramp end' : `${limits.alphaMaxDeg.toFixed(1)} deg`}`;
  return {
    part: 'rControlTop',
    ref: design.parts.rControlTop?.ref ?? null,
    method: 'replace',
    fromOhm,
    toOhm,
    series: context.series,
    predictedAlphaMaxDeg: after.alphaMaxDeg,
    reason: `${seen}, design ${design.alphaMaxDeg} deg: ${fromOhm === null ? `fit ${label} ${formatOhm(toOhm)}` : `replace ${label} ${formatOhm(fromOhm)} with ${formatOhm(toOhm)}`} so the pot's end fires at ${after.alphaMaxDeg === null ? '(past the ramp end)' : `${after.alphaMaxDeg.toFixed(1)} deg`}.`,
  };
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
