/**
 * The session archive (ours; app/exchange/ARCHIVE.md documents it byte by byte): one session with everything it
 * references, as gzip-compressed UTF-8 JSON. Validated here with zod at the edge; main/exchange reads and writes it.
 * Table sections are a column list plus rows of values, in the logbook's own column names, so a reader can check
 * every value against the schema it came from.
 */
import { z } from 'zod';

export const archiveFormatName = 'rampwright-session-archive';
export const archiveFormatVersion = 1;

const cellSchema = z.union([z.number(), z.string(), z.null()]);

export function tableSchema(columns: readonly string[]) {
  return z
    .object({ columns: z.array(z.string()), rows: z.array(z.array(cellSchema)) })
    .strict()
    .refine((table) => table.columns.length === columns.length && table.columns.every((name, index) => name === columns[index]), {
      message: `columns must be exactly ${columns.join(', ')}`,
      path: ['columns'],
    })
    .refine((table) => table.rows.every((row) => row.length === columns.length), { message: `every row needs ${columns.length} values`, path: ['rows'] });
}

/** Columns carried per table, in this order (the logbook's names; ids are local to a logbook and never carried). */
export const archiveColumns = {
  cycles: ['seq', 't_s', 'half_cycle', 'period_s', 'alpha_deg', 'control_v', 'pulses', 'wrong_half_cycle_pulses', 'ramp_peak_v', 'ramp_floor_v', 'slope_v_per_ms', 'start_delay_deg', 'nonlinearity_pct', 'clipped', 'reset_us', 'recorded_at_ms'],
  transferPoints: ['seq', 't_s', 'control_v', 'alpha_deg'],
  trims: ['part', 'from_ohm', 'to_ohm', 'method', 'reason', 'at_ms'],
  linkEvents: ['kind', 'detail', 'count', 'at_ms'],
  partMeasurements: ['part', 'value', 'design_value', 'at_ms'],
} as const;

const sha256Hex = z.string().regex(/^[0-9a-f]{64}$/, 'must be 64 lower-case hex digits (sha-256)');
const integer = z.number().int();

export const archiveCaptureSchema = z
  .object({
    label: z.string().nullable(),
    startS: z.number(),
    sampleRateHz: z.number().positive(),
    samplesPerChannel: integer.nonnegative(),
    roles: z.array(z.enum(['sync', 'ramp', 'gate', 'control'])).min(1),
    afterGap: z.boolean(),
    startedAtMs: integer,
    encoding: z.literal('f64le-planar+zlib'),
    /** sha-256 of the raw samples before compression (main/store/captureCodec.ts). */
    sha256: sha256Hex,
  })
  .strict();

/** The part of an archive whose canonical JSON is hashed: the session's identity. */
export const archiveSessionSchema = z
  .object({
    unit: z.object({ serial: z.string().min(1), designName: z.string().nullable(), createdAtMs: integer }).strict(),
    design: z.object({ name: z.string().min(1), contentHash: sha256Hex, designJson: z.string().min(2), savedAtMs: integer }).strict(),
    record: z
      .object({
        operator: z.string(),
        startedAtMs: integer,
        endedAtMs: integer.nullable(),
        status: z.enum(['closed', 'interrupted']),
        notes: z.string().nullable(),
        readingsJson: z.string().nullable(),
        cycleCount: integer.nullable(),
        alphaMeanDeg: z.number().nullable(),
        rampPeakMedianV: z.number().nullable(),
        /** The step reports as recorded; left out when the session has none (older sessions keep their hash). */
        stepsJson: z.string().optional(),
        /** The bench that recorded it; left out when unknown (sessions from before benches were named keep their hash). */
        bench: z.string().min(1).optional(),
        /**
         * How a closed session was signed off; left out for one closed without sign-off (and for interrupted ones),
         * so sessions exported before sign-offs were kept keep their hash. The reason and the exceptions (JSON of
         * the contract's SignOffException[]) come only with 'signed-off-with-exceptions'.
         */
        signOff: z.enum(['signed-off', 'signed-off-with-exceptions']).optional(),
        signOffReason: z.string().min(1).optional(),
        signOffExceptionsJson: z.string().min(2).optional(),
      })
      .strict()
      .refine((record) => record.signOff === undefined || record.status === 'closed', { message: 'only a closed session can carry a sign-off', path: ['signOff'] })
      .refine((record) => (record.signOff === 'signed-off-with-exceptions') === (record.signOffReason !== undefined && record.signOffExceptionsJson !== undefined), {
        message: 'a sign-off with exceptions carries its reason and its exceptions, and only it does',
        path: ['signOffReason'],
      }),
    cycles: tableSchema(archiveColumns.cycles),
    transferPoints: tableSchema(archiveColumns.transferPoints),
    captures: z.array(archiveCaptureSchema),
    trims: tableSchema(archiveColumns.trims),
    linkEvents: tableSchema(archiveColumns.linkEvents),
    /** Present only when the session has measured part values, so older sessions keep their content hash. */
    partMeasurements: tableSchema(archiveColumns.partMeasurements).optional(),
  })
  .strict();

export const archiveSignatureSchema = z
  .object({
    algorithm: z.literal('ed25519'),
    /** Base64 of the bench's raw 32-byte Ed25519 public key. */
    publicKey: z.string().max(100),
    /** Base64 of the 64-byte signature. */
    value: z.string().max(200),
  })
  .strict();
export type ArchiveSignature = z.infer<typeof archiveSignatureSchema>;

/** The exact bytes a bench signs: the format, its version, the content hash and the export time, one per line. */
export function signedArchiveMessage(archive: { contentSha256: string; exportedAt: string }): string {
  return `${archiveFormatName}\n${archiveFormatVersion}\ncontent-sha256 ${archive.contentSha256}\nexported-at ${archive.exportedAt}\n`;
}

export const sessionArchiveSchema = z
  .object({
    format: z.literal(archiveFormatName),
    version: z.literal(archiveFormatVersion),
    exportedAt: z.string(),
    /** sha-256 of canonical JSON (keys sorted, no spaces) of `session`. */
    contentSha256: sha256Hex,
    session: archiveSessionSchema,
    /** Base64 of each capture's stored bytes (zlib), in the order of `session.captures`; checked by their sha-256. */
    captureData: z.array(z.string()),
    /** The exporting bench's signature of `signedArchiveMessage` (ARCHIVE.md, "Signature"); absent when unsigned. */
    signature: archiveSignatureSchema.optional(),
  })
  .strict()
  .refine((archive) => archive.captureData.length === archive.session.captures.length, { message: 'captureData needs one entry per capture', path: ['captureData'] });

export type ArchiveSession = z.infer<typeof archiveSessionSchema>;
export type SessionArchive = z.infer<typeof sessionArchiveSchema>;
export type ArchiveCell = z.infer<typeof cellSchema>;

/**
 * JSON has no infinities; SQLite REAL columns can hold them. They travel as the strings "Infinity" and "-Infinity"
 * in numeric columns (NaN never reaches the logbook: SQLite stores it as NULL).
 */
export function toArchiveCell(value: unknown): ArchiveCell {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number') return Number.isFinite(value) ? value : value > 0 ? 'Infinity' : '-Infinity';
  if (typeof value === 'bigint') return Number(value);
  return String(value);
}

export function fromArchiveCell(value: ArchiveCell): number | string | null {
  if (value === 'Infinity') return Number.POSITIVE_INFINITY;
  if (value === '-Infinity') return Number.NEGATIVE_INFINITY;
  return value;
}
