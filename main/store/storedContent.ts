/**
 * Reading back what the logbook stores as JSON text (a design version, a session's readings), with the same rules
 * an archive is checked by on import (app/exchange/archiveContent.ts). Text that does not meet them (a logbook
 * written before the rules, or damaged) is an InputError naming the design or session, so it stops the one view
 * that needs it and never the views of other sessions.
 */
import type { z } from 'zod';
import type { CaptureReadings } from '../../app/bench/readings';
import { boardDesignSchema, type BoardDesign } from '../../app/board/design';
import { InputError } from '../../app/errors';
import { storedReadingsSchema } from '../../app/exchange/archiveContent';

/**
 * JSON text read back through a schema; `label` names the content in the message (`plural` for its verbs), `after`
 * ends it. Gives the text as parsed (`raw`, every field kept) and as the schema reads it (`data`, defaults filled).
 */
function parseStored<T>(json: string, what: string, schema: z.ZodType<T>, content: { label: string; plural: boolean; after: string }): { raw: unknown; data: T } {
  const { label, plural, after } = content;
  let value: unknown;
  try {
    value = JSON.parse(json);
  } catch {
    throw new InputError(`is not sound: its stored ${label} ${plural ? 'are' : 'is'} not JSON${after}`, what);
  }
  const parsed = schema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new InputError(`is not sound: its stored ${label} ${plural ? 'fail' : 'fails'} validation (field ${issue.path.join('.') || `(whole ${label})`}: ${issue.message})${after}`, what);
  }
  return { raw: value, data: parsed.data };
}

export function parseStoredDesign(json: string, what: string): BoardDesign {
  return parseStored(json, what, boardDesignSchema, { label: 'board design', plural: false, after: '' }).data;
}

export function parseStoredReadings(json: string, what: string): CaptureReadings {
  // As stored, every field kept (the schema checks the fields the views rely on, and lets newer ones through).
  return parseStored(json, what, storedReadingsSchema, { label: 'readings', plural: true, after: '; the other sessions are not affected' }).raw as CaptureReadings;
}
