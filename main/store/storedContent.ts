/**
 * Reading back what the logbook stores as JSON text (a design version, a session's readings), with the same rules
 * an archive is checked by on import (app/exchange/archiveContent.ts). Text that does not meet them (a logbook
 * written before the rules, or damaged) is an InputError naming the design or session, so it stops the one view
 * that needs it and never the views of other sessions.
 */
import type { CaptureReadings } from '../../app/bench/readings';
import { boardDesignSchema, type BoardDesign } from '../../app/board/design';
import { InputError } from '../../app/errors';
import { storedReadingsSchema } from '../../app/exchange/archiveContent';

export function parseStoredDesign(json: string, what: string): BoardDesign {
  let value: unknown;
  try {
    value = JSON.parse(json);
  } catch {
    throw new InputError('is not sound: its stored board design is not JSON', what);
  }
  const parsed = boardDesignSchema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new InputError(`is not sound: its stored board design fails validation (field ${issue.path.join('.') || '(whole design)'}: ${issue.message})`, what);
  }
  return parsed.data;
}

export function parseStoredReadings(json: string, what: string): CaptureReadings {
  let value: unknown;
  try {
    value = JSON.parse(json);
  } catch {
    throw new InputError('is not sound: its stored readings are not JSON; the other sessions are not affected', what);
  }
  const parsed = storedReadingsSchema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new InputError(`is not sound: its stored readings fail validation (${issue.path.join('.')}: ${issue.message}); the other sessions are not affected`, what);
  }
  return value as CaptureReadings;
}
