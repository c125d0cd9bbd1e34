/**
 * The physical range of every number a board design carries. A value outside it is not a board this tool can
 * reason about: 1e-300 ohm or 1e30 ohm passes "positive and finite", yet gives NaN currents and trims of 2e+22
 * Mohm. Each range says where it comes from; the design schema (design.ts), the sizing targets and the measured
 * part values all take their limits from here, and DEVELOPERS.md lists them.
 */
import { z } from 'zod';
import { formatFarad, formatOhm } from './formatValues';

export interface PhysicalRange {
  min: number;
  max: number;
  /** Unit as written in messages. */
  unit: string;
  /** Where the limits come from (a standard, a rating, common practice, from memory). */
  source: string;
}

export const designRanges = {
  /**
   * Fixed resistors: the IEC 60063 decades resistor makers list for through-hole and chip parts, 1 ohm to 10 Mohm
   * (common practice). The emitter, bias, discharge, control-limit resistors and the control pot all sit in it.
   */
  resistorOhm: { min: 1, max: 10e6, unit: 'ohm', source: 'the IEC 60063 decades stocked as resistors (common practice)' },
  /**
   * Ramp capacitor: a 50/60 Hz ramp of a few volts charged by 10 uA to 10 mA needs C = I t / V of about 10 nF to
   * 10 uF; 100 pF to 100 uF leaves a decade either side (IEC 60063 decades of film and ceramic parts, common practice).
   */
  rampCapacitorFarad: { min: 100e-12, max: 100e-6, unit: 'F', source: 'a 50/60 Hz ramp charged by 10 uA to 10 mA, a decade either side (common practice)' },
  /**
   * Supply of the current source: at least V_EB plus the ramp and the transistor's V_EC(sat) (3 V); at most what a
   * small-signal PNP transistor is rated for collector to emitter, commonly 40 to 80 V (from memory), so 60 V.
   */
  supplyV: { min: 3, max: 60, unit: 'V', source: "V_EB plus a ramp at the low end; a small-signal PNP transistor's V_CEO rating (40-80 V, from memory) at the high end" },
  /** Ramp height: a comparator needs a ramp of some volts to resolve a firing angle (0.5 V and up, common practice); below the supply. */
  rampTargetV: { min: 0.5, max: 60, unit: 'V', source: 'a ramp a comparator can resolve (common practice), below the 60 V supply limit' },
  /** Supply of the control divider: the same transistor-rating ceiling as the supply; a volt at least to give a control range. */
  controlSupplyV: { min: 1, max: 60, unit: 'V', source: 'the same ceiling as the supply (common practice)' },
  /** Gate pulse: 1 us (no thyristor latches on less, from memory) to 10 ms (half a mains cycle at 50 Hz). */
  gatePulseUs: { min: 1, max: 10_000, unit: 'us', source: 'hard firing tens of us up to long pulses of half a mains cycle (from memory)' },
  /** Early voltage: small-signal PNP transistors have V_A of 20-100 V (REFERENCES.md, from memory); 5 V to 1000 V leaves room. */
  earlyV: { min: 5, max: 1000, unit: 'V', source: 'V_A of small-signal PNP transistors, 20-100 V (from memory), with room either side' },
  /** Mains at the thyristor: 10 V rms (a low-voltage test supply) to 1000 V rms (low-voltage equipment, IEC 60038). */
  loadMainsRmsV: { min: 10, max: 1000, unit: 'V', source: 'a low-voltage test supply up to the 1000 V limit of low-voltage equipment (IEC 60038, from memory)' },
  /** Load resistance: 10 mohm to 1 Mohm covers heaters, chargers and DC drives (common practice). */
  loadOhm: { min: 0.01, max: 1e6, unit: 'ohm', source: 'heaters, chargers and DC drive loads (common practice)' },
  /** Latching current: 0.1 mA (sensitive-gate parts) to 10 A (large press-packs), from memory. */
  latchingCurrentA: { min: 1e-4, max: 10, unit: 'A', source: "thyristor data sheets' latching currents, sensitive-gate to large parts (from memory)" },
  /** Tolerances a reading is judged by: tighter than 0.1 % (or 0.1 deg) no logger resolves; wider than 50 % (45 deg) judges nothing. */
  rampPeakTolerancePct: { min: 0.1, max: 50, unit: '%', source: 'what a 10-bit to 12-bit logger resolves, up to a check that still judges (common practice)' },
  angleToleranceDeg: { min: 0.1, max: 45, unit: 'deg', source: 'what a logger at 10 kS/s resolves at 50 Hz, up to an eighth of a cycle (common practice)' },
  /** Divider current of `size`: 1 uA (a divider still stiffer than the base current) to 100 mA (a 1/4 W divider at 15 V, common practice). */
  dividerCurrentA: { min: 1e-6, max: 0.1, unit: 'A', source: 'a divider stiffer than the base current up to what a small divider dissipates (common practice)' },
} as const satisfies Record<string, PhysicalRange>;

/** `1e+7` -> `10000000`, `1e-10` -> `1e-10`: short and exact enough for a message. */
function shown(value: number): string {
  return Number(value.toPrecision(4)).toString();
}

/** A limit as written on a part where there is a notation for it (10 Mohm, 100 pF), else number and unit. */
function limitText(value: number, unit: string): string {
  if (unit === 'ohm') return formatOhm(value);
  if (unit === 'F') return formatFarad(value);
  return `${shown(value)} ${unit}`;
}

/** The message for a value outside its range: what it must be, and why. */
export function rangeMessage(range: PhysicalRange): string {
  return `must be from ${limitText(range.min, range.unit)} to ${limitText(range.max, range.unit)} (${range.source})`;
}

/** A zod number limited to `range`, with the range and its source in the message. */
export function rangedNumber(range: PhysicalRange): z.ZodNumber {
  const outside = { error: (issue: { input?: unknown }) => `${rangeMessage(range)}; got ${typeof issue.input === 'number' ? shown(issue.input) : String(issue.input)}` };
  return z.number().min(range.min, outside).max(range.max, outside);
}

/** True when `value` is inside `range`. */
export function withinRange(value: number, range: PhysicalRange): boolean {
  return Number.isFinite(value) && value >= range.min && value <= range.max;
}
