/**
 * The "Parts on the board" fields of the Trim screen, DOM-free: which parts are offered, how a known value is
 * written back into a field, and what the typed texts mean (blank: not measured). A field's problem is the same
 * words the session would answer with (app/board/measuredParts.ts), shown beside the field before any call.
 */
import type { BoardDesign, PartRole } from '../../app/board/design';
import { checkMeasuredParts } from '../../app/board/measuredParts';
import { formatPartValue } from '../../app/board/formatValues';
import { parseQuantity } from '../../app/board/parseQuantity';

/** The parts that set the ramp: the ones worth measuring when the ramp misses. */
export const measurableParts: readonly PartRole[] = ['rEmitter', 'rBiasTop', 'rBiasBottom', 'cRamp'];

/** A value as marked on the part (IEC 60062 code: "8k2", "560n", "1M5"), to put back in a field; four digits kept. */
export function partValueText(role: PartRole, value: number): string {
  return formatPartValue(role, value, 4);
}

export interface MeasuredFieldsResult {
  measured: Partial<Record<PartRole, number>>;
  /** Per part: what is wrong with its text, in words. */
  problems: Partial<Record<PartRole, string>>;
}

export function readMeasuredFields(design: BoardDesign, texts: Partial<Record<PartRole, string>>): MeasuredFieldsResult {
  const measured: Partial<Record<PartRole, number>> = {};
  const problems: Partial<Record<PartRole, string>> = {};
  for (const role of measurableParts) {
    const text = (texts[role] ?? '').trim();
    if (text === '') continue;
    const value = parseQuantity(text);
    if (Number.isNaN(value)) {
      problems[role] = `"${text}" is not a part value: write it as marked, for example ${role === 'cRamp' ? '470n or 4u7' : '5k1 or 470R'}`;
      continue;
    }
    try {
      Object.assign(measured, checkMeasuredParts(design, { [role]: value }, role));
    } catch (error) {
      // The checker's words without the "role: " it starts with; the field already names the part.
      problems[role] = (error as Error).message.replace(`${role}: `, '');
    }
  }
  return { measured, problems };
}
