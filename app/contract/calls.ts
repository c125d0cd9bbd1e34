/**
 * Every call from the screens to the session service, in one list: name -> payload schema, result schema, purpose.
 * The call name is also the IPC channel suffix and the HTTP path segment. The service validates every payload
 * with these schemas at the transport edge (STYLE.md: validation at the edge, the core trusts its types).
 */
import { z } from 'zod';
import { boardDesignSchema } from '../board/design';
import { benchCallNames, isBenchCallName, type BenchCallName, type SameNames } from './names';
import { captureReadFieldsSchema, capturePreviewSchema, captureUploadChunkSchema, captureUploadStartSchema, inspectCaptureSchema } from './captureImport';
import { commissioningStepSchema, linkHealthSchema, stepReportSchema, transferFitSchema, transferPointSchema } from './readings';
import {
  appliedTrimSchema,
  benchStateSchema,
  designProblemSchema,
  designSummarySchema,
  driftPointSchema,
  fleetViewSchema,
  exportFormatSchema,
  isoTimeSchema,
  openSessionSchema,
  sessionComparisonSchema,
  sessionDetailSchema,
  sessionRowSchema,
  storedDesignSchema,
  trimPlanSchema,
  unitSummarySchema,
} from './records';

const empty = z.object({}).strict();
const sessionId = z.number().int().positive('a session id is a positive whole number');
const nonEmpty = (what: string) => z.string().trim().min(1, `${what} must not be empty`);

/** Control voltage of the virtual board: held at one value, or swept slowly to draw a transfer curve. */
export const virtualControlSchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('fixed'), controlV: z.number().min(0).max(100) }),
  z.object({ mode: z.literal('sweep'), fromV: z.number().min(0).max(100), toV: z.number().min(0).max(100), periodS: z.number().positive().max(3600) }),
]);
export type VirtualControl = z.infer<typeof virtualControlSchema>;

export const connectPayloadSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('serial'), path: nonEmpty('the serial port path'), baudRate: z.number().int().positive().optional() }),
  z.object({
    kind: z.literal('virtual'),
    /** A stored design by name (latest version), or a design given inline. */
    designName: z.string().min(1).optional(),
    design: boardDesignSchema.optional(),
    /** Named faults of the virtual board, e.g. "wrong-emitter-resistor". */
    faults: z.array(z.string().min(1)).default([]),
    control: virtualControlSchema.optional(),
    /** How much faster than real time the virtual board runs (1 for the bench screen). */
    speed: z.number().positive().max(1000).default(1),
    seed: z.number().int().optional(),
  }).refine((value) => value.designName !== undefined || value.design !== undefined, { message: 'the virtual board needs a designName or a design' }),
  z.object({
    kind: z.literal('capture'),
    /** A capture sent with captureUploadStart / captureUploadChunk. */
    uploadId: z.string().min(1).max(64),
    /** The design it is measured against when no session is open yet. */
    designName: z.string().min(1).optional(),
    fields: captureReadFieldsSchema.default({}),
    /** Times real time the capture is played at (1: as recorded); 0 reads it as fast as the analysis goes. */
    speed: z.number().min(0).max(1000).default(1),
  }),
]);
export type ConnectPayload = z.input<typeof connectPayloadSchema>;

export const portInfoSchema = z.object({
  path: z.string(),
  manufacturer: z.string().nullable(),
  serialNumber: z.string().nullable(),
  vendorId: z.string().nullable(),
  productId: z.string().nullable(),
  /** The port is on a USB-serial bridge loggers are commonly built on (listed first): what the bridge is. */
  loggerBridge: z.string().nullable().default(null),
});
export type PortInfo = z.infer<typeof portInfoSchema>;

function call<P extends z.ZodType, R extends z.ZodType>(payload: P, result: R, purpose: string) {
  return { payload, result, purpose };
}

export const benchCalls = {
  // Link
  listPorts: call(empty, z.object({ ports: z.array(portInfoSchema) }), 'Serial ports with their USB ids, for picking the logger.'),
  connect: call(connectPayloadSchema, linkHealthSchema, 'Open the logger link on a serial port, or start the virtual board.'),
  disconnect: call(empty, linkHealthSchema, 'Close the link (the open session stays open).'),
  setVirtualControl: call(virtualControlSchema, z.object({ control: virtualControlSchema }), 'Set or sweep the virtual board\'s control voltage.'),

  // Capture files opened on the screens
  captureUploadStart: call(captureUploadStartSchema, z.object({ uploadId: z.string(), pieceBytes: z.number().int().positive() }), 'Announce a capture file (or a COMTRADE pair) about to be sent in pieces.'),
  captureUploadChunk: call(captureUploadChunkSchema, z.object({ receivedBytes: z.number().int().nonnegative() }), 'One piece of an announced capture file, in order.'),
  inspectCapture: call(inspectCaptureSchema, capturePreviewSchema, 'The channels of a sent capture with a first look at each, and how it would be read with the roles given (or the design\'s).'),
  saveCaptureMap: call(
    z.object({ designName: nonEmpty('the design name'), channelMap: z.string().trim().min(1).max(2000) }).strict(),
    storedDesignSchema,
    'Remember a capture\'s roles for a design (saved as the design\'s channel map, a new version).',
  ),

  // Designs
  listDesigns: call(empty, z.object({ designs: z.array(designSummarySchema) }), 'Stored board designs, latest version of each.'),
  getDesign: call(z.object({ name: nonEmpty('the design name'), version: z.number().int().positive().optional() }).strict(), storedDesignSchema, 'One stored design (latest version unless one is named).'),
  /** `design` is checked by the schema and then by the board physics; a design that fails either is not saved. */
  saveDesign: call(
    z.object({ design: boardDesignSchema }).strict(),
    /** `saved` is false when the design equals a stored version of its name: nothing was saved. */
    storedDesignSchema.extend({ saved: z.boolean() }),
    'Save a design as a new version; an unchanged design saves nothing and says so.',
  ),
  validateDesign: call(z.object({ design: z.unknown() }).strict(), z.object({ ok: z.boolean(), problems: z.array(designProblemSchema) }), 'Check a design as typed, field by field, without saving.'),

  // Units
  listUnits: call(z.object({ designName: z.string().optional() }).strict(), z.object({ units: z.array(unitSummarySchema) }), 'Units in the logbook, optionally of one design.'),

  // Session at the bench
  startSession: call(
    z.object({ unitSerial: nonEmpty('the unit serial'), designName: nonEmpty('the design name'), operator: nonEmpty('the operator'), notes: z.string().optional() }).strict(),
    openSessionSchema,
    'Open a session for a unit against a stored design; readings from the link go into it.',
  ),
  stopSession: call(z.object({ notes: z.string().optional() }).strict(), sessionRowSchema, 'Close the open session (without signing off).'),
  benchState: call(empty, benchStateSchema, 'Everything the Bench screen shows at once, for a fresh screen.'),
  setHold: call(z.object({ held: z.boolean() }).strict(), z.object({ held: z.boolean() }), 'Freeze or release the live plot (data keeps flowing into the session).'),
  keepCapture: call(z.object({ seconds: z.number().positive().max(10).default(2), label: z.string().optional() }).strict(), z.object({ captureId: z.number().int().positive(), seconds: z.number() }), 'Keep the last seconds of raw samples in the session.'),
  checkStep: call(z.object({ step: commissioningStepSchema }).strict(), stepReportSchema, 'Take the step\'s readings now, judge them against the design and record them in the session.'),
  signOff: call(
    z.object({
      notes: z.string().optional(),
      /**
       * Given, the session may be signed off with exceptions (steps missing, unmeasured or out of tolerance) and this
       * is the written reason the record keeps. Without it the service refuses a sign-off the gate does not clear.
       */
      exceptionsReason: z.string().max(2000, 'the reason must stay under 2000 characters').optional(),
    }).strict(),
    sessionRowSchema,
    'Sign off and close the session: at once when every step is recorded and within tolerance, otherwise only with exceptions and a written reason.',
  ),

  // Trim
  trimPlan: call(
    z.object({
      series: z.enum(['E12', 'E24', 'E48', 'E96']).default('E24'),
      /**
       * Part values measured on the board, by role or designator (ohm, farad for the capacitor). Given, they replace
       * the session's measured values (an empty object forgets them); left out, the session's stay.
       */
      measuredParts: z.record(z.string(), z.number()).optional(),
    }).strict(),
    trimPlanSchema,
    'The ranked trim plan from the current ramp readings and the parts known to be on the board.',
  ),
  applyTrim: call(
    z.object({
      // A resistor position takes fromOhm/toOhm, the ramp capacitor (cRamp) fromFarad/toFarad, the transistor none.
      part: nonEmpty('the part'), fromOhm: z.number().positive().nullable().default(null), toOhm: z.number().positive().nullable().default(null),
      fromFarad: z.number().positive().nullable().default(null), toFarad: z.number().positive().nullable().default(null),
      method: z.enum(['replace', 'parallel', 'series']), addOhm: z.number().positive().nullable().default(null), reason: z.string().default(''),
      alsoChange: z.object({ part: nonEmpty('the second part'), fromOhm: z.number().positive(), toOhm: z.number().positive() }).strict().nullable().default(null),
    }).strict(),
    z.object({ trim: appliedTrimSchema, recheckNeeded: z.boolean() }),
    '"I fitted this": record the change in the session and ask for a re-check of the ramp.',
  ),

  // Transfer curve
  transferPoints: call(
    z.object({ sessionId: sessionId.optional() }).strict(),
    z.object({
      points: z.array(transferPointSchema),
      fit: transferFitSchema.nullable(),
      ideal: z.array(transferPointSchema),
      /** The control range the design allows (app/board/controlRange.ts): the default sweep, and where the Transfer and Limits steps judge. */
      controlRange: z.object({ lowV: z.number(), highV: z.number(), alphaAtLowDeg: z.number().nullable(), alphaAtHighDeg: z.number().nullable() }).nullable(),
    }),
    'Transfer points so far (open session unless one is named), the fit, the design\'s ideal line and its control range.',
  ),
  clearTransfer: call(empty, z.object({ cleared: z.number().int().nonnegative() }), 'Start the transfer curve again in the open session.'),

  // Logbook
  listSessions: call(
    z.object({ unitSerial: z.string().optional(), designName: z.string().optional(), from: isoTimeSchema.optional(), to: isoTimeSchema.optional(), limit: z.number().int().positive().max(10000).default(200) }).strict(),
    z.object({ sessions: z.array(sessionRowSchema) }),
    'Sessions by unit, design and date, newest first.',
  ),
  sessionDetail: call(z.object({ sessionId }).strict(), sessionDetailSchema, 'One session: readings, transfer curve, trims, link events.'),
  compareSessions: call(z.object({ sessionIdA: sessionId, sessionIdB: sessionId }).strict(), sessionComparisonSchema, 'Two sessions side by side.'),
  drift: call(
    z.object({ unitSerial: nonEmpty('the unit serial') }).strict(),
    z.object({
      unitSerial: z.string(),
      points: z.array(driftPointSchema),
      /** Trends that will cross (or have crossed) a tolerance of the unit's design, in words; empty when none. */
      warnings: z.array(z.string()),
    }),
    'A unit\'s readings across its sessions, with a warning where a trend will cross a tolerance.',
  ),

  fleet: call(
    z.object({ designName: nonEmpty('the design name'), unitSerial: z.string().optional() }).strict(),
    fleetViewSchema,
    'A board design\'s fleet (each unit\'s latest session) against the board model\'s Monte Carlo prediction, with one unit placed in it.',
  ),

  sharing: call(
    empty,
    z.object({
      /** The shared logbook this bench pushes to (address without password); null when it pushes nowhere. */
      target: z.string().nullable(),
      /** Finished sessions of this bench not yet in the shared logbook. */
      waiting: z.number().int().nonnegative(),
      lastAttemptAt: isoTimeSchema.nullable(),
      lastReachedAt: isoTimeSchema.nullable(),
      /** Why the last push did not go through, or null. */
      problem: z.string().nullable(),
    }),
    'Whether this bench shares its finished sessions with a shared logbook, and how many wait to be pushed.',
  ),

  // Exports (formats are registered by the report/export side; see issue on sign-off and recall)
  exportFormats: call(empty, z.object({ formats: z.array(exportFormatSchema) }), 'Export formats this bench can write.'),
  exportSession: call(
    z.object({ sessionId, format: nonEmpty('the export format') }).strict(),
    z.object({ fileName: z.string(), mediaType: z.string(), /** base64 of the file's bytes */ contentBase64: z.string(), savedPath: z.string().nullable() }),
    'Export a session in one of the registered formats.',
  ),
} as const;

export type BenchCalls = typeof benchCalls;
export type CallName = keyof BenchCalls;
/** What a caller passes (defaults may be left out). */
export type CallPayload<Name extends CallName> = z.input<BenchCalls[Name]['payload']>;
/** What the service receives after validation (defaults filled in). */
export type ParsedPayload<Name extends CallName> = z.output<BenchCalls[Name]['payload']>;
export type CallResult<Name extends CallName> = z.output<BenchCalls[Name]['result']>;

export const callNames: readonly CallName[] = benchCallNames;

export function isCallName(name: unknown): name is CallName {
  return isBenchCallName(name);
}

// The name list and the call list must hold the same names: each line fails to compile if one has a name the other lacks.
const callNamesMatch: SameNames<CallName, BenchCallName> = true;
void callNamesMatch;
