/**
 * Every event from the session service to the screens. Live events are throttled and decimated on the service
 * side (at most about 20 frames a second, min-max decimated folds) so the screen gets what it can draw.
 */
import { z } from 'zod';
import { foldCycleSchema, linkHealthSchema, stepReportSchema, transferPointSchema } from './readings';
import { benchStateSchema } from './records';
import { captureProgressSchema } from './captureImport';
import { benchEventNames, isBenchEventName, type BenchEventName, type SameNames } from './names';

export const liveFrameSchema = z.object({
  /** Open session, null when the link streams without a session. */
  sessionId: z.number().int().positive().nullable(),
  /** Stream time of the newest sample in the frame (s). */
  t: z.number(),
  /** The most recent cycles (up to about 20), oldest first, for the cycle fold. */
  fold: z.array(foldCycleSchema),
  /** Live readings of the steps (not yet recorded; `checkStep` records them). */
  steps: z.array(stepReportSchema),
  link: linkHealthSchema,
  /** The service's state count when the frame was made (`stateSerial` of the bench state). */
  stateSerial: z.number().int().nonnegative(),
});
export type LiveFrame = z.infer<typeof liveFrameSchema>;

export const noticeSchema = z.object({
  level: z.enum(['info', 'warning', 'error']),
  message: z.string(),
});
export type Notice = z.infer<typeof noticeSchema>;

/** A command from the desktop shell's application menu for the screens (browser mode never sends it). */
export const menuCommandSchema = z.discriminatedUnion('command', [
  z.object({ command: z.literal('show-screen'), screen: z.enum(['board', 'bench', 'transfer', 'trim', 'logbook']) }),
  z.object({ command: z.literal('show-safety-note') }),
]);
export type MenuCommand = z.infer<typeof menuCommandSchema>;

export const benchEvents = {
  /** Throttled live view: fold, step readings, link health. Not sent while the plot is held. */
  live: liveFrameSchema,
  /** Link state changes and periodic health (also while held). */
  health: linkHealthSchema,
  /** Session opened/closed, step recorded, trim applied, hold changed. */
  state: benchStateSchema,
  /** New transfer points since the last event (batched). */
  transfer: z.object({ sessionId: z.number().int().positive().nullable(), points: z.array(transferPointSchema) }),
  /** Something the technician should read: link lost and reopened, session marked interrupted. */
  notice: noticeSchema,
  /** The desktop menu asked the screens to do something. */
  menuCommand: menuCommandSchema,
  /** How far a capture file opened on the screens has been read (a few times a second, and at its end). */
  captureProgress: captureProgressSchema,
} as const;

export type BenchEvents = typeof benchEvents;
export type EventName = keyof BenchEvents;
export type EventData<Name extends EventName> = z.output<BenchEvents[Name]>;

export const eventNames: readonly EventName[] = benchEventNames;

export function isEventName(name: unknown): name is EventName {
  return isBenchEventName(name);
}

// The name list and the event list must hold the same names.
const eventNamesMatch: SameNames<EventName, BenchEventName> = true;
void eventNamesMatch;
