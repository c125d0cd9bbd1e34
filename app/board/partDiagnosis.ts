/**
 * Diagnosis before compensation: can a board whose every part is inside its tolerance make the measured ramp?
 * A bias trim is for a board whose parts are each within tolerance but stack up badly; a part far outside its own
 * tolerance is measured and replaced (common practice). Three steps:
 * 1. The envelope: the rise (peak - floor; the slope when the ramp clips) that 99 % of boards with good parts give
 *    (envelopeOf below): each position within its tolerance (a part the technician measured only within the
 *    meter's accuracy), V_EB within the unit spread, beta within its spread, the bench between 15 and 35 C;
 *    widened by the reading's own accuracy. Inside it, the ramp fits good parts: trim.
 * 2. Outside it, each position alone is asked which value would explain the ramp with every other part as
 *    designed (or as measured): the suspects, likeliest first by how many of its own tolerances it would be off.
 *    A clipped ramp also shows the clipping level, which rules out a suspect that would clip elsewhere.
 * 3. The ramp cannot tell a current from a capacitance (slope = I_C/C, REFERENCES.md): when the two likeliest
 *    suspects are one of each, one sentence says which to measure first and why.
 * A part the technician measured outside its tolerance is a suspect whatever the ramp says.
 */
import type { BoardDesign } from './design';
import { designValueOf } from './measuredParts';
import { formatPartValue } from './formatValues';
import { partName, type BoardPart } from './partNames';
import type { PartOverrides } from './parts';
import { predictRamp, type RampOptions, type RampPrediction } from './rampModel';
import type { RampReadings } from './rampReadings';

/** The positions that set the ramp. */
export const rampPositions = ['rEmitter', 'rBiasTop', 'rBiasBottom', 'cRamp'] as const;
export type RampPosition = (typeof rampPositions)[number];

/** Unit-to-unit V_EB spread at the same current, +- (V); from memory, as the tolerance analysis uses. */
const vebSpreadV = 0.02;
/** Unit-to-unit beta spread, +- percent (from memory: a gain group spans about 2:1). */
const betaSpreadPct = 33;
/** A workshop bench (our rule, common practice for indoor work). */
const benchTemperatureC = { minC: 15, maxC: 35 };
/**
 * The V_EB band of a good transistor of the design's type on the bench: the unit spread plus the drift over the
 * bench's temperatures (about -2 mV/K, REFERENCES.md: Sedra and Smith), +- (V).
 */
export const vebBandV = vebSpreadV + 0.002 * ((benchTemperatureC.maxC - benchTemperatureC.minC) / 2);
/** How well a handheld meter reads a part (our rule: resistors 1 %, capacitors 3 %). */
const meterAccuracyPct = { resistor: 1, capacitor: 3 };
/** Two-sided 99 % of a normal distribution (normal table): the share of good boards the envelope holds. */
const goodBoardsSigmas = 2.58;
/** The analysis reads the ramp within 1.5 % (its accuracy suite against ngspice): the envelope is widened by it. */
const readingMarginPct = 1.5;
/**
 * How often a part of each kind is the one found off, relative to a fixed resistor: capacitors drift with age and
 * heat and fail far more often than film resistors (common practice); a suspect's tolerances off are divided by it.
 */
const failureWeight: Record<BoardPart, number> = { rEmitter: 1, rBiasTop: 1, rBiasBottom: 1, cRamp: 2, transistor: 1, rDischarge: 1, rControlTop: 1, potControl: 1 };
/** How much easier one part is to check than another: a resistor reads in circuit, the capacitor must be lifted. */
const checkEffort: Record<BoardPart, number> = { rEmitter: 1, rBiasTop: 1, rBiasBottom: 1, cRamp: 2, transistor: 3, rDischarge: 1, rControlTop: 1, potControl: 1 };

export interface Suspect {
  part: BoardPart;
  /** The value that explains the ramp (ohm, farad; V_EB in volts for the transistor), or the measured value. */
  explainingValue: number;
  /** The design's value (V_EB in volts for the transistor). */
  designValue: number;
  /** Off by this many of its own tolerances (for the transistor: of vebBandV). */
  tolerances: number;
  /** The value was measured by the technician, not inferred from the ramp. */
  measured: boolean;
}

export interface PartDiagnosis {
  /** The ramp fits a board with every part inside its tolerance. */
  consistent: boolean;
  basis: 'peak' | 'slope';
  /** Rise (V) or slope (V/s) measured, and the envelope good parts allow. */
  measured: number;
  envelope: { low: number; high: number };
  /** Likeliest first. */
  suspects: Suspect[];
  /** One sentence on which part to measure first and why, when the ramp cannot tell the likeliest two apart. */
  measureFirst: string | null;
}

export interface DiagnosisOptions {
  /** Part values known on the board (measured, or fitted this session). */
  known?: PartOverrides;
  /** The subset of `known` the technician measured. */
  measured?: PartOverrides;
}

function quantityOf(basis: 'peak' | 'slope', prediction: RampPrediction): number {
  return basis === 'peak' ? prediction.peakV - prediction.floorV : prediction.slopeVPerS;
}

/**
 * A part's tolerance as a fraction; a design may state 0 % (exact), which would make any deviation infinitely many
 * tolerances off: the tightest tolerance letter of IEC 60062 (E, 0.005 %, from memory) is taken as its floor.
 */
function toleranceOf(design: BoardDesign, part: RampPosition): number {
  return Math.max(design.parts[part].tolerancePct, 0.005) / 100;
}

/**
 * The rise or slope a board of good parts gives, 99 % of such boards: each of the seven quantities (four parts,
 * V_EB, beta, bench temperature) moved alone to either end of its spread gives its effect (in log terms, so a part
 * that scales the ramp counts the same either way); the sum of seven uniform draws is near normal (central limit),
 * its standard deviation the root sum of squares of the half-ranges over sqrt(3) (uniform distribution), and the
 * range is the sum of the mean shifts +- 2.58 standard deviations (two-sided 99 %, normal table): a ramp only one
 * good board in a hundred could make is taken as a part off, worth a measurement (our rule). Worst-case corners would
 * call a ramp that one board in many thousands could make "in tolerance" (common practice in tolerance analysis:
 * statistical limits for judging, worst case for designing).
 */
function envelopeOf(design: BoardDesign, basis: 'peak' | 'slope', known: PartOverrides, measured: PartOverrides): { low: number; high: number } {
  const centre: PartOverrides = { ...known };
  for (const part of rampPositions) centre[part] = known[part] ?? (designValueOf(design, part) as number);
  const base: RampOptions = { partOverrides: centre, temperatureC: (benchTemperatureC.minC + benchTemperatureC.maxC) / 2 };
  const nominal = quantityOf(basis, predictRamp(design, base));
  const moves: Array<(sign: number) => RampOptions> = [
    ...rampPositions.map((part) => (sign: number): RampOptions => {
      const accuracy = part === 'cRamp' ? meterAccuracyPct.capacitor : meterAccuracyPct.resistor;
      const spread = measured[part] !== undefined ? accuracy / 100 : toleranceOf(design, part);
      return { ...base, partOverrides: { ...centre, [part]: (centre[part] as number) * (1 + sign * spread) } };
    }),
    (sign) => ({ ...base, vebShiftV: sign * vebSpreadV }),
    (sign) => ({ ...base, beta: design.transistor.beta * (1 + (sign * betaSpreadPct) / 100) }),
    (sign) => ({ ...base, temperatureC: sign > 0 ? benchTemperatureC.maxC : benchTemperatureC.minC }),
  ];
  // A design whose model gives no ramp at all has no envelope: no good board makes any ramp.
  if (!(Number.isFinite(nominal) && nominal > 0)) return { low: 0, high: 0 };
  let shift = 0;
  let variance = 0;
  for (const move of moves) {
    const up = Math.log(quantityOf(basis, predictRamp(design, move(1))) / nominal);
    const down = Math.log(quantityOf(basis, predictRamp(design, move(-1))) / nominal);
    // A move that stops the ramp (the transistor cut off at an extreme design) is left out rather than made infinite.
    if (!Number.isFinite(up) || !Number.isFinite(down)) continue;
    shift += (up + down) / 2;
    variance += ((up - down) / 2) ** 2 / 3;
  }
  const reach = goodBoardsSigmas * Math.sqrt(variance);
  const margin = readingMarginPct / 100;
  return { low: nominal * Math.exp(shift - reach) * (1 - margin), high: nominal * Math.exp(shift + reach) * (1 + margin) };
}

/** Bisection on `position` in [from, to] (log scale) for the value whose ramp quantity equals `wanted`; null when none does. */
function solveFor(evaluate: (position: number) => number, from: number, to: number, wanted: number, logScale: boolean): number | null {
  const map = (x: number): number => (logScale ? Math.exp(x) : x);
  let low = logScale ? Math.log(from) : from;
  let high = logScale ? Math.log(to) : to;
  const lowValue = evaluate(map(low));
  const highValue = evaluate(map(high));
  if (!Number.isFinite(lowValue) || !Number.isFinite(highValue) || (lowValue - wanted) * (highValue - wanted) > 0) return null;
  const rising = highValue > lowValue;
  for (let iteration = 0; iteration < 60; iteration += 1) {
    const middle = 0.5 * (low + high);
    if (evaluate(map(middle)) > wanted === rising) high = middle;
    else low = middle;
  }
  return map(0.5 * (low + high));
}

export function diagnoseRamp(design: BoardDesign, readings: RampReadings, options: DiagnosisOptions = {}): PartDiagnosis {
  const known = options.known ?? {};
  const measuredParts = options.measured ?? {};
  const basis: 'peak' | 'slope' = readings.clipped ? 'slope' : 'peak';
  const measured = basis === 'peak' ? readings.peakV - readings.floorV : readings.slopeVPerMs * 1000;
  const envelope = envelopeOf(design, basis, known, measuredParts);
  const consistent = measured >= envelope.low && measured <= envelope.high;

  const suspects: Suspect[] = [];
  // A part measured outside its own tolerance needs replacing whatever the ramp says.
  for (const part of rampPositions) {
    const value = measuredParts[part];
    if (value === undefined) continue;
    const designValue = designValueOf(design, part) as number;
    const tolerances = Math.abs(value / designValue - 1) / toleranceOf(design, part);
    if (tolerances > 1) suspects.push({ part, explainingValue: value, designValue, tolerances, measured: true });
  }
  if (!consistent) suspects.push(...inferredSuspects(design, readings, basis, measured, known));
  const ordered = orderSuspects(suspects);
  return { consistent, basis, measured, envelope, suspects: ordered, measureFirst: measureFirstSentence(design, ordered) };
}

/** Each position alone (and the transistor's V_EB) solved for the measured ramp, kept when outside its tolerance. */
function inferredSuspects(design: BoardDesign, readings: RampReadings, basis: 'peak' | 'slope', measured: number, known: PartOverrides): Suspect[] {
  const found: Suspect[] = [];
  // A clipped ramp's top shows the clipping level: a suspect that would clip more than twice the reading margin
  // away from it does not explain this ramp.
  const clipsWhereMeasured = (prediction: RampPrediction): boolean =>
    !readings.clipped || Math.abs(prediction.peakV / readings.peakV - 1) <= (2 * readingMarginPct) / 100;
  for (const part of rampPositions) {
    if (known[part] !== undefined) continue;
    const designValue = designValueOf(design, part) as number;
    const at = (value: number): RampPrediction => predictRamp(design, { partOverrides: { ...known, [part]: value } });
    const value = solveFor((candidate) => quantityOf(basis, at(candidate)), designValue / 10, designValue * 10, measured, true);
    if (value === null || !clipsWhereMeasured(at(value))) continue;
    const tolerances = Math.abs(value / designValue - 1) / toleranceOf(design, part);
    if (tolerances > 1) found.push({ part, explainingValue: value, designValue, tolerances, measured: false });
  }
  const vebV = design.transistor.vebV;
  const atShift = (shiftV: number): RampPrediction => predictRamp(design, { partOverrides: known, vebShiftV: shiftV });
  // From a junction with almost no V_EB left (a leaky or broken one) to one that barely conducts.
  const shiftV = solveFor((shift) => quantityOf(basis, atShift(shift)), 0.05 - vebV, Math.min(0.5, design.supplyV - vebV), measured, false);
  if (shiftV !== null && clipsWhereMeasured(atShift(shiftV))) {
    const tolerances = Math.abs(shiftV) / vebBandV;
    if (tolerances > 1) found.push({ part: 'transistor', explainingValue: vebV + shiftV, designValue: vebV, tolerances, measured: false });
  }
  return found;
}

/**
 * Tolerances off, weighed by how often such a part is the one found off: smaller is likelier. A capacitor ages by
 * losing capacitance (dried or cracked dielectric, common practice); one that would have to read high did not drift
 * there, it is a wrong value fitted, as likely as a wrong resistor, so its weight is a resistor's.
 */
function unlikeliness(suspect: Suspect): number {
  return suspect.tolerances / weightOf(suspect);
}

function weightOf(suspect: Suspect): number {
  return isCapacitance(suspect.part) && suspect.explainingValue > suspect.designValue ? 1 : failureWeight[suspect.part];
}

/**
 * Measured faults first; then likeliest first, except that a part easier to check goes first when it is nearly as
 * likely (within 1.5 times).
 */
function orderSuspects(suspects: readonly Suspect[]): Suspect[] {
  const ordered = [...suspects].sort((first, second) => Number(second.measured) - Number(first.measured) || unlikeliness(first) - unlikeliness(second));
  for (let index = 1; index < ordered.length; index += 1) {
    const before = ordered[index - 1];
    const here = ordered[index];
    if (!before.measured && !here.measured && unlikeliness(here) <= 1.5 * unlikeliness(before) && checkEffort[here.part] < checkEffort[before.part]) {
      ordered[index - 1] = here;
      ordered[index] = before;
    }
  }
  return ordered;
}

function offWords(suspect: Suspect): string {
  if (suspect.part === 'transistor') return `V_EB ${suspect.explainingValue.toFixed(2)} V instead of ${suspect.designValue.toFixed(2)} V`;
  const percent = (suspect.explainingValue / suspect.designValue - 1) * 100;
  return `${Math.abs(percent).toFixed(0)} % ${percent < 0 ? 'low' : 'high'}`;
}

const isCapacitance = (part: BoardPart): boolean => part === 'cRamp';

function measureFirstSentence(design: BoardDesign, suspects: readonly Suspect[]): string | null {
  const [first, second] = suspects;
  if (!first || !second || first.measured || second.measured || isCapacitance(first.part) === isCapacitance(second.part)) return null;
  const odds = `${first.tolerances.toFixed(1)} times its tolerance off, the ${partName(design, second.part)} ${second.tolerances.toFixed(1)} times its`;
  const why =
    checkEffort[first.part] < checkEffort[second.part] && unlikeliness(first) > unlikeliness(second)
      ? `it reads in circuit with the power off in a minute, while the ${partName(design, second.part)} must be lifted at one end to be measured`
      : isCapacitance(first.part) && weightOf(first) > 1
        ? `capacitors drift and fail far more often than resistors, and it would be ${odds}`
        : `it is the likelier of the two (${odds})`;
  return (
    `Measure the ${partName(design, first.part)} first (the ramp fits it ${offWords(first)}, or the ${partName(design, second.part)} ${offWords(second)}, ` +
    `and a ramp cannot tell a current from a capacitance): ${why}.`
  );
}

/** "ramp capacitor C6 reads about 273n (30 % low, 3.0 times its 10 % tolerance)", for the suggestion's reason. */
export function suspectWords(design: BoardDesign, suspect: Suspect): string {
  if (suspect.part === 'transistor') {
    return `the ramp needs the transistor's V_EB at ${suspect.explainingValue.toFixed(2)} V, ${Math.abs(suspect.explainingValue - suspect.designValue).toFixed(2)} V from the design's ${suspect.designValue.toFixed(2)} V (a good one stays within ${vebBandV.toFixed(2)} V)`;
  }
  const tolerancePct = design.parts[suspect.part as RampPosition].tolerancePct;
  const reading = suspect.measured ? 'measured' : 'the ramp fits';
  return `${reading} ${formatPartValue(suspect.part, suspect.explainingValue)} (${offWords(suspect)}, ${suspect.tolerances.toFixed(1)} times its ${tolerancePct} % tolerance)`;
}
