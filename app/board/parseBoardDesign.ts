/**
 * The edge where a board design enters: schema (zod) then physics. Every fault names the field path and,
 * for physics faults, why the value cannot work. Throws InputError; returns a design the core can trust.
 */
import { InputError } from '../errors';
import { validateBoardPhysics } from './boardPhysics';
import { type BoardDesign, boardDesignSchema } from './design';

function fieldPath(path: readonly PropertyKey[]): string {
  return path.length === 0 ? '(whole design)' : path.map(String).join('.');
}

export function parseBoardDesign(json: unknown, source?: string): BoardDesign {
  const where = source ?? 'board design';
  const parsed = boardDesignSchema.safeParse(json);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `field ${fieldPath(issue.path)}: ${issue.message}`);
    throw new InputError(lines.join('; '), where);
  }
  const errors = validateBoardPhysics(parsed.data).filter((problem) => problem.severity === 'error');
  if (errors.length > 0) {
    throw new InputError(errors.map((problem) => `field ${problem.field}: ${problem.message}`).join('; '), where);
  }
  return parsed.data;
}
