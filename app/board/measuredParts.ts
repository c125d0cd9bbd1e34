/**
 * Part values the technician measured on the board (or read off the fitted part), told to the trim planner so it
 * plans from the board as built rather than from the design. Written as `REF=VALUE` with the board's designator
 * ("R7=5k1", "C3=560n"; the design file's position key works too); values in ohm for resistors and farad for the
 * capacitor.
 *
 * A value more than ten times off its design value is refused: on the bench that is a slip of the prefix
 * ("5.1" for "5.1k") far more often than a part of that size fitted (common practice, no source).
 */
import { InputError } from '../errors';
import type { BoardDesign, PartRole } from './design';
import { designRanges, rangeMessage, withinRange } from './designRanges';
import { formatPartValue } from './formatValues';
import { partName } from './partNames';
import { parseQuantity } from './parseQuantity';
import type { PartOverrides } from './parts';

const partRoles: readonly PartRole[] = ['rEmitter', 'rBiasTop', 'rBiasBottom', 'cRamp', 'rDischarge', 'rControlTop', 'potControl'];

/** Most a measured value may differ from the design value, as a ratio either way. */
export const measuredRatioLimit = 10;

/** The design's value at a position: ohm, or farad for the ramp capacitor; null where the design has no part. */
export function designValueOf(design: BoardDesign, role: PartRole): number | null {
  if (role === 'cRamp') return design.parts.cRamp.farad;
  return design.parts[role]?.ohm ?? null;
}

/** The role a name stands for: the role itself (any case) or the design's own designator for it. */
export function partRoleNamed(design: BoardDesign, name: string): PartRole | null {
  const wanted = name.trim().toLowerCase();
  for (const role of partRoles) {
    if (role.toLowerCase() === wanted) return role;
    const ref = design.parts[role]?.ref;
    if (ref !== undefined && ref.toLowerCase() === wanted) return role;
  }
  return null;
}

/** Checks measured values against the design: a known position, a positive finite value, within ten times the design. */
export function checkMeasuredParts(design: BoardDesign, measured: Partial<Record<string, number>>, where = 'measured parts'): PartOverrides {
  const checked: PartOverrides = {};
  for (const [name, value] of Object.entries(measured)) {
    if (value === undefined) continue;
    const role = partRoleNamed(design, name);
    if (role === null) {
      const known = partRoles.filter((candidate) => designValueOf(design, candidate) !== null).map((candidate) => partName(design, candidate));
      throw new InputError(`"${name}" is not a part of the design ${design.name}; its parts are the ${known.join(', the ')}`, where);
    }
    if (!Number.isFinite(value) || value <= 0) throw new InputError(`the measured ${partName(design, role)} must be a positive number (got ${value})`, where);
    const designValue = designValueOf(design, role);
    if (designValue === null) throw new InputError(`the design ${design.name} has no ${partName(design, role)} to measure`, where);
    const ratio = value / designValue;
    if (ratio > measuredRatioLimit || ratio < 1 / measuredRatioLimit) {
      throw new InputError(
        `the measured ${partName(design, role)} ${formatPartValue(role, value)} is more than ${measuredRatioLimit} times off its design value ${formatPartValue(role, designValue)}: a missing or extra multiplier letter (k, M, n, u)?`,
        where,
      );
    }
    const range = role === 'cRamp' ? designRanges.rampCapacitorFarad : designRanges.resistorOhm;
    if (!withinRange(value, range)) throw new InputError(`the measured ${partName(design, role)} ${rangeMessage(range)}; got ${formatPartValue(role, value)}`, where);
    if (checked[role] !== undefined) throw new InputError(`the ${partName(design, role)} is given twice`, where);
    checked[role] = value;
  }
  return checked;
}

/** Parses `NAME=VALUE` entries (the `--part` option of the command line), then checks them as above. */
export function parseMeasuredParts(design: BoardDesign, entries: readonly string[], where = '--part'): PartOverrides {
  const measured: Record<string, number> = {};
  const roles = new Set<PartRole>();
  for (const entry of entries) {
    const equals = entry.indexOf('=');
    if (equals <= 0) throw new InputError(`"${entry}" is not DESIGNATOR=VALUE (for example R7=5k1 or C3=560n)`, where);
    const name = entry.slice(0, equals).trim();
    const text = entry.slice(equals + 1);
    const value = parseQuantity(text);
    if (Number.isNaN(value)) throw new InputError(`"${text}" in "${entry}" is not a part value (for example 5k1, 470R, 560n)`, where);
    const role = partRoleNamed(design, name);
    if (role !== null && roles.has(role)) throw new InputError(`the ${partName(design, role)} is given twice`, where);
    if (role !== null) roles.add(role);
    measured[name] = value;
  }
  return checkMeasuredParts(design, measured, where);
}

/** In words, for the plan's notes and the command line: "emitter resistor R7 taken as 5k1". */
export function describeMeasuredParts(design: BoardDesign, measured: PartOverrides): string[] {
  return (Object.entries(measured) as [PartRole, number][]).map(([role, value]) => `${partName(design, role)} taken as ${formatPartValue(role, value)}`);
}
