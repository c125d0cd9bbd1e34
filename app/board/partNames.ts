/**
 * Parts in a technician's words: "emitter resistor R14", never the design file's role keys. Every text a person
 * reads (screens, command line, records) names parts through here; the role keys stay in files and JSON.
 */
import type { BoardDesign, PartRole } from './design';
import { formatFarad, formatOhm } from './formatValues';

/** The ramp transistor, which a design describes by its junction but gives no position key. */
export type BoardPart = PartRole | 'transistor';

const partWords: Record<BoardPart, string> = {
  rEmitter: 'emitter resistor',
  rBiasTop: 'upper bias resistor',
  rBiasBottom: 'lower bias resistor',
  cRamp: 'ramp capacitor',
  rDischarge: 'discharge resistor',
  rControlTop: 'control limit resistor',
  potControl: 'control pot',
  transistor: 'ramp transistor',
};

export function isBoardPart(name: string): name is BoardPart {
  return Object.prototype.hasOwnProperty.call(partWords, name);
}

/** "emitter resistor R14" (the design's designator when it has one), "ramp transistor". */
export function partName(design: BoardDesign | null, part: BoardPart): string {
  const ref = part === 'transistor' ? undefined : design?.parts[part]?.ref;
  return ref ? `${partWords[part]} ${ref}` : partWords[part];
}

/** As partName, with a capital first letter for the start of a sentence or a table cell. */
export function partNameCapitalised(design: BoardDesign | null, part: BoardPart): string {
  const name = partName(design, part);
  return name.charAt(0).toUpperCase() + name.slice(1);
}

/**
 * A part named in a stored record (a role key, or older free text such as a designator): the role in words, with
 * the designator when the design is known; other text as it was written.
 */
export function recordedPartName(design: BoardDesign | null, part: string): string {
  return isBoardPart(part) ? partName(design, part) : part;
}

/**
 * A value recorded for a part (a trim's before and after, a measurement), in the part's own unit and the drawing
 * code: farad for the ramp capacitor, ohm otherwise (also for older records naming a designator); the transistor
 * carries no value.
 */
export function recordedPartValue(part: string, value: number): string {
  if (part === 'transistor') return '-';
  return part === 'cRamp' ? formatFarad(value) : formatOhm(value);
}
