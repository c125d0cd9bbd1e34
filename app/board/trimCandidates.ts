/**
 * Candidate changes for a trim, each in standard values (IEC 60063, nearest by ratio): the emitter resistor
 * replaced, or a resistor added in parallel or in series with the fitted one; a divider resistor replaced.
 * Each candidate is evaluated with the model carrying the estimate's V_EB shift (estimateFromReadings.ts).
 */
import type { BoardDesign, PartRole } from './design';
import { designRanges, withinRange } from './designRanges';
import { type ESeriesName, standardValueNeighbours } from './eSeries';
import type { PartOverrides } from './parts';
import { predictRamp, type RampPrediction } from './rampModel';

/** Every part position the trim plan may change: the resistors. */
export type ResistorRole = Exclude<PartRole, 'cRamp'>;

export type TrimMethod = 'replace' | 'parallel' | 'series';

export interface TrimCandidate {
  part: ResistorRole;
  method: TrimMethod;
  fromOhm: number;
  /** Effective resistance of the position after the change (ohm). */
  toOhm: number;
  /** The resistor to add (parallel/series), or the new part (replace) (ohm). */
  partOhm: number;
  /** A second change that goes with this one (a divider change that also needs a new emitter resistor). */
  alsoChange: { part: ResistorRole; fromOhm: number; toOhm: number } | null;
  prediction: RampPrediction;
}

export interface CandidateContext {
  design: BoardDesign;
  series: ESeriesName;
  vebShiftV: number;
  /** Parts as fitted (what the board has now), when they differ from the design. */
  fitted: PartOverrides;
}

export function fittedOhm(context: CandidateContext, part: ResistorRole): number {
  return context.fitted[part] ?? context.design.parts[part]?.ohm ?? NaN;
}

export function predictWith(context: CandidateContext, changes: PartOverrides): RampPrediction {
  return predictRamp(context.design, { vebShiftV: context.vebShiftV, partOverrides: { ...context.fitted, ...changes } });
}

/**
 * The resistance of `part` that puts the ramp peak on `targetV` (ohm), by bisection on log resistance over
 * 1/20x to 20x the fitted value; null when no value in that span reaches it. The peak falls as R_E or R1 rises
 * and rises with R2 (through the Thevenin voltage), so the direction is found from the ends.
 */
export function exactOhmFor(context: CandidateContext, part: ResistorRole, targetV: number, extra: PartOverrides = {}): number | null {
  const fitted = fittedOhm(context, part);
  let lowLog = Math.log(fitted / 20);
  let highLog = Math.log(fitted * 20);
  const peakAt = (logOhm: number): number => {
    const ohm = Math.exp(logOhm);
    const prediction = predictWith(context, { ...extra, [part]: ohm });
    return prediction.peakV;
  };
  const usable = (logOhm: number): boolean => {
    const ohm = Math.exp(logOhm);
    const bias = { ...context.fitted, ...extra, [part]: ohm };
    const top = bias.rBiasTop ?? context.design.parts.rBiasTop.ohm;
    const bottom = bias.rBiasBottom ?? context.design.parts.rBiasBottom.ohm;
    return (context.design.supplyV * bottom) / (top + bottom) + context.design.transistor.vebV < context.design.supplyV;
  };
  // Narrow the span to values that leave the transistor conducting (a divider change can cut it off).
  while (!usable(highLog) && highLog > lowLog + 1e-6) highLog -= 0.05;
  while (!usable(lowLog) && lowLog < highLog - 1e-6) lowLog += 0.05;
  const lowPeak = peakAt(lowLog);
  const highPeak = peakAt(highLog);
  if ((lowPeak - targetV) * (highPeak - targetV) > 0) return null;
  const risesWithOhm = highPeak > lowPeak;
  for (let iteration = 0; iteration < 60; iteration += 1) {
    const middle = 0.5 * (lowLog + highLog);
    const above = peakAt(middle) > targetV;
    if (above === risesWithOhm) highLog = middle;
    else lowLog = middle;
  }
  return Math.exp(0.5 * (lowLog + highLog));
}

function parallelOf(first: number, second: number): number {
  return (first * second) / (first + second);
}

/** Replace, parallel and series candidates for one resistor position. */
export function candidatesFor(context: CandidateContext, part: ResistorRole, targetV: number, extra: PartOverrides = {}): TrimCandidate[] {
  const exact = exactOhmFor(context, part, targetV, extra);
  if (exact === null) return [];
  const fromOhm = fittedOhm(context, part);
  const candidates: TrimCandidate[] = [];
  const push = (method: TrimMethod, partOhm: number, toOhm: number): void => {
    // A resistor no maker lists (beyond 1 ohm to 10 Mohm) is no advice, however the arithmetic came out.
    if (!withinRange(partOhm, designRanges.resistorOhm) || !withinRange(toOhm, designRanges.resistorOhm)) return;
    candidates.push({ part, method, fromOhm, toOhm, partOhm, alsoChange: null, prediction: predictWith(context, { ...extra, [part]: toOhm }) });
  };
  const neighbours = (value: number): number[] => {
    const { below, above } = standardValueNeighbours(value, context.series);
    return below === above ? [below] : [below, above];
  };
  for (const value of neighbours(exact)) push('replace', value, value);
  // Adding a part only makes sense on the emitter resistor (the divider's error is not what we correct).
  if (part === 'rEmitter' && exact < fromOhm) {
    const addExact = (exact * fromOhm) / (fromOhm - exact);
    for (const value of neighbours(addExact)) push('parallel', value, parallelOf(fromOhm, value));
  }
  if (part === 'rEmitter' && exact > fromOhm) {
    for (const value of neighbours(exact - fromOhm)) push('series', value, fromOhm + value);
  }
  return candidates;
}
