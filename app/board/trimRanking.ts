/**
 * The bias trims, ranked as a technician would take them (issue 11):
 * 1. usable first: the predicted peak inside the ramp tolerance band, unclipped, with headroom to clipping, and
 *    staying inside it whatever the parts already on the board actually are within their tolerance (the plan takes
 *    an unmeasured part at its design value; replacing it makes the result carry all of its tolerance, a resistor
 *    added across or in series only a fraction of it);
 * 2. one standard part swapped before two parts combined (a resistor added across or in series, or a divider
 *    change that needs a new emitter resistor too);
 * 3. less bench work before more: across the fitted emitter resistor (no desoldering), then a replacement, then in
 *    series (a cut track); the emitter resistor before a divider resistor, whose change also moves the clipping
 *    level and whose prediction depends on reading the ramp as a current error rather than a capacitance one, and
 *    a small divider move before a large one;
 * 4. nearer the target.
 */
import { standardValueNeighbours, standardValuesBetween } from './eSeries';
import { estimateFromReadings } from './estimateFromReadings';
import type { PartOverrides } from './parts';
import type { RampPrediction } from './rampModel';
import type { RampReadings } from './rampReadings';
import { type CandidateContext, candidatesFor, exactOhmFor, fittedOhm, predictWith, type ResistorRole, type TrimCandidate } from './trimCandidates';
import { trimSuggestion, type TrimSuggestion } from './trimSuggestion';

export interface RankingOptions {
  minHeadroomV: number;
  maxSuggestions: number;
  /** A part is off, measured so or suspected from the ramp: the trims would compensate it, and say so. */
  compensating: 'measured' | 'suspected' | null;
  /** Part values known on the board (measured or fitted), as the plan was told. */
  known: PartOverrides;
  /** The subset of `known` measured by the technician: their uncertainty is the meter's, not the part's tolerance. */
  measuredParts: PartOverrides;
}

/** A handheld meter reads a resistor within 1 % (our rule, as in partDiagnosis.ts). */
const meterAccuracy = 0.01;

/**
 * How far the predicted peak could move (percent of the target) if a changed position's part already on the board
 * is anywhere within its tolerance (the meter's accuracy once measured): the estimate is made again with that
 * part at either end, and the change applied to it.
 */
function uncertaintyPct(context: CandidateContext, measured: RampReadings, candidate: TrimCandidate, options: RankingOptions, refits: Map<string, CandidateContext>): number {
  const design = context.design;
  const positions: ResistorRole[] = [candidate.part, ...(candidate.alsoChange ? [candidate.alsoChange.part] : [])];
  let worst = 0;
  for (const position of positions) {
    const spread = options.measuredParts[position] !== undefined ? meterAccuracy : (design.parts[position]?.tolerancePct ?? 0) / 100;
    if (!(spread > 0)) continue;
    for (const sign of [-1, 1]) {
      const actualOhm = fittedOhm(context, position) * (1 + sign * spread);
      const key = `${position}/${sign}`;
      let refit = refits.get(key);
      if (!refit) {
        const estimate = estimateFromReadings(design, measured, { partOverrides: { ...options.known, [position]: actualOhm } });
        refit = { ...context, vebShiftV: estimate.modelShiftV, fitted: estimate.modelOverrides };
        refits.set(key, refit);
      }
      const changes: PartOverrides = {};
      const added = candidate.partOhm;
      changes[candidate.part] =
        candidate.part !== position || candidate.method === 'replace'
          ? candidate.toOhm
          : candidate.method === 'parallel'
            ? (actualOhm * added) / (actualOhm + added)
            : actualOhm + added;
      if (candidate.alsoChange) changes[candidate.alsoChange.part] = candidate.alsoChange.toOhm;
      const peakV = predictWith(refit, changes).peakV;
      worst = Math.max(worst, (Math.abs(peakV - candidate.prediction.peakV) / design.rampTargetV) * 100);
    }
  }
  return worst;
}

function partsCount(candidate: TrimCandidate): number {
  return candidate.alsoChange || candidate.method !== 'replace' ? 2 : 1;
}

/**
 * Bench work and risk: across the emitter resistor, replacing it, in series with it; then a divider resistor, and
 * last a divider resistor with a new emitter resistor. A divider moved far from its design value changes the
 * board's bias a lot (clipping level, control range): the smaller move first.
 */
function benchWork(candidate: TrimCandidate): number {
  const move = (fromOhm: number, toOhm: number): number => 2 * Math.abs(Math.log(toOhm / fromOhm));
  if (candidate.alsoChange) return 5 + move(candidate.fromOhm, candidate.toOhm) + move(candidate.alsoChange.fromOhm, candidate.alsoChange.toOhm);
  if (candidate.part !== 'rEmitter') return 4 + move(candidate.fromOhm, candidate.toOhm);
  return { parallel: 1, replace: 2, series: 3 }[candidate.method];
}

export function rankedTrims(context: CandidateContext, measured: RampReadings, before: RampPrediction, options: RankingOptions): TrimSuggestion[] {
  const targetV = context.design.rampTargetV;
  const candidates: TrimCandidate[] = [...candidatesFor(context, 'rEmitter', targetV), ...candidatesFor(context, 'rBiasBottom', targetV), ...candidatesFor(context, 'rBiasTop', targetV)];
  // When the target sits too close to the clipping level, only moving the divider (and then the emitter resistor) helps.
  if (before.clipV < targetV + options.minHeadroomV) candidates.push(...dividerWithEmitter(context, targetV, options.minHeadroomV));
  const refits = new Map<string, CandidateContext>();
  const bandPct = context.design.tolerances.rampPeakPct;
  const described = candidates.map((candidate) => {
    const uncertainty = uncertaintyPct(context, measured, candidate, options, refits);
    const suggestion = trimSuggestion(context.design, candidate, measured, before, {
      series: context.series,
      fitted: context.fitted,
      minHeadroomV: options.minHeadroomV,
      compensating: options.compensating,
      uncertaintyPct: uncertainty,
    });
    // Sure: inside the band even at the worst of the parts already on the board.
    const sure = suggestion.usable && Math.abs(suggestion.predictedPeakErrorPct) + uncertainty <= bandPct;
    return { candidate, suggestion, sure, reach: Math.abs(suggestion.predictedPeakErrorPct) + uncertainty };
  });
  described.sort(
    (first, second) =>
      Number(second.sure) - Number(first.sure) ||
      Number(second.suggestion.usable) - Number(first.suggestion.usable) ||
      Number(second.suggestion.withinTolerance) - Number(first.suggestion.withinTolerance) ||
      partsCount(first.candidate) - partsCount(second.candidate) ||
      benchWork(first.candidate) - benchWork(second.candidate) ||
      first.reach - second.reach,
  );
  const seen = new Set<string>();
  const ranked: TrimSuggestion[] = [];
  for (const { candidate, suggestion } of described) {
    const key = `${candidate.part}/${candidate.method}/${candidate.partOhm}/${candidate.alsoChange?.toOhm ?? ''}`;
    if (seen.has(key)) continue;
    seen.add(key);
    ranked.push(suggestion);
    if (ranked.length >= options.maxSuggestions) break;
  }
  return ranked;
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
        results.push({ part, method: 'replace', fromOhm, toOhm: value, partOhm: value, alsoChange: { part: 'rEmitter', fromOhm: fittedOhm(context, 'rEmitter'), toOhm: emitterOhm }, prediction });
      }
    }
  }
  return results;
}
