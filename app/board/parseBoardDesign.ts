/**
 * The edge where a board design enters: schema (zod) then physics. Every fault names the field path (what to edit
 * in the file) with the part it belongs to in a technician's words ("parts.rEmitter.ohm (emitter resistor R14)")
 * and, for physics faults, why the value cannot work. Throws InputError; returns a design the core can trust.
 */
import { InputError } from '../errors';
import { validateBoardPhysics } from './boardPhysics';
import { type BoardDesign, boardDesignSchema } from './design';
import { isBoardPart, partName } from './partNames';

/** The field's path, and the part it belongs to in words, with the designator the file gives it (if any). */
function fieldLabel(path: readonly PropertyKey[], json: unknown): string {
  if (path.length === 0) return '(whole design)';
  const text = path.map(String).join('.');
  const [group, role] = path.map(String);
  if (group === 'transistor') return `${text} (${partName(null, 'transistor')})`;
  if (group !== 'parts' || role === undefined || !isBoardPart(role) || role === 'transistor') return text;
  const ref = (json as { parts?: Record<string, { ref?: unknown } | undefined> } | null)?.parts?.[role]?.ref;
  const words = partName(null, role);
  return `${text} (${typeof ref === 'string' && ref.trim() !== '' ? `${words} ${ref.trim()}` : words})`;
}

export function parseBoardDesign(json: unknown, source?: string): BoardDesign {
  const where = source ?? 'board design';
  const parsed = boardDesignSchema.safeParse(json);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `field ${fieldLabel(issue.path, json)}: ${issue.message}`);
    throw new InputError(lines.join('; '), where);
  }
  const errors = validateBoardPhysics(parsed.data).filter((problem) => problem.severity === 'error');
  if (errors.length > 0) {
    throw new InputError(errors.map((problem) => `field ${fieldLabel(problem.field.split('.'), json)}: ${problem.message}`).join('; '), where);
  }
  return parsed.data;
}
