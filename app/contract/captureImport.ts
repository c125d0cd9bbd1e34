/**
 * Opening a capture file on the Bench screen instead of a live link: the file's bytes travel over the contract in
 * pieces (browser mode has no path to give), are looked at (channels, units, a first look at each), the technician
 * says which channel is which role, and the capture is then read through the same steps as a live link.
 */
import { z } from 'zod';

/** Largest capture the screens take: a 10-minute 50 kS/s 4-channel CSV is about 1.2 GB (our limit, with room). */
export const maxCaptureUploadBytes = 4 * 1024 ** 3;
/** Bytes per piece: a piece is one call, base64 in JSON (4/3 larger), well under a transport's 4 MB request limit. */
export const captureUploadPieceBytes = 1024 * 1024;

const fileName = z
  .string()
  .trim()
  .min(1, 'a file name must not be empty')
  .max(200, 'a file name of over 200 characters')
  .refine((name) => !/[\\/\0]/.test(name) && name !== '.' && name !== '..', 'a file name, not a path')
  .refine((name) => /\.(csv|cfg|dat|cff)$/i.test(name), 'a capture is a .csv, a COMTRADE .cfg with its .dat, or a .cff');

export const captureUploadStartSchema = z
  .object({
    files: z
      .array(z.object({ name: fileName, sizeBytes: z.number().int().nonnegative().max(maxCaptureUploadBytes, 'the file is larger than the screens take (4 GiB): read it with rampwright analyze') }).strict())
      .min(1)
      .max(2, 'one capture: a .csv, a .cff, or a .cfg with its .dat'),
  })
  .strict();

export const captureUploadChunkSchema = z
  .object({
    uploadId: z.string().min(1).max(64),
    fileIndex: z.number().int().min(0).max(1),
    offset: z.number().int().nonnegative(),
    /** base64 of at most captureUploadPieceBytes bytes. */
    contentBase64: z.string().max(Math.ceil(captureUploadPieceBytes / 3) * 4),
  })
  .strict();

/** What a CSV cannot tell by itself, and the roles: the command line's options, as fields. */
export const captureReadFieldsSchema = z
  .object({
    /** The channel map in the command line's form: `sync=CH1,ramp=CH2:x10,gate=CH3:invert`. */
    channelMap: z.string().trim().max(2000).optional(),
    separator: z.enum(['comma', 'semicolon', 'tab']).optional(),
    decimal: z.enum(['point', 'comma']).optional(),
    timeUnit: z.enum(['s', 'ms', 'us']).optional(),
    headerLine: z.number().int().min(0).max(100000).optional(),
    sampleRateHz: z.number().min(1000).max(1_000_000).optional(),
  })
  .strict();
export type CaptureReadFields = z.infer<typeof captureReadFieldsSchema>;

export const inspectCaptureSchema = z
  .object({ uploadId: z.string().min(1).max(64), designName: z.string().optional(), fields: captureReadFieldsSchema.default({}) })
  .strict();

export const captureChannelSchema = z.object({
  /** What the channel map calls it: a CSV column's number, An or Dn. */
  reference: z.string(),
  /** The name the file gives it ('' for none): used in the map when it is the only channel of that name. */
  name: z.string(),
  label: z.string(),
  unit: z.string(),
  kind: z.enum(['column', 'analog', 'digital']),
  minV: z.number().nullable(),
  maxV: z.number().nullable(),
  /** Min-max pairs of the first samples, for a small trace. */
  trace: z.array(z.number()),
});
export type CaptureChannel = z.infer<typeof captureChannelSchema>;

/** The field of the form a refusal names (the command line's option), when one settles it. */
export const captureFieldSchema = z.enum(['channelMap', 'separator', 'decimal', 'timeUnit', 'headerLine', 'sampleRateHz']);
export type CaptureField = z.infer<typeof captureFieldSchema>;

export const capturePreviewSchema = z.object({
  uploadId: z.string(),
  fileNames: z.array(z.string()),
  format: z.enum(['csv', 'comtrade']),
  channels: z.array(captureChannelSchema),
  /** Samples of the first look. */
  samples: z.number().int().nonnegative(),
  /** The map the file would be read with now (given, the design's, or roles by name); null when it cannot be read yet. */
  channelMap: z.string().nullable(),
  /** The same per role: the channel (its reference), scale and inversion; null for a role without a channel. */
  roles: z.record(z.enum(['sync', 'ramp', 'gate', 'control']), z.object({ reference: z.string(), scale: z.number(), invert: z.boolean() }).nullable()).nullable(),
  /** Where the map came from. */
  mapSource: z.enum(['given', 'design', 'names']).nullable(),
  /** How it would be read, in one line; null while refused. */
  readAs: z.string().nullable(),
  /** Why it cannot be read as it is, and which field settles it. */
  problem: z.object({ message: z.string(), field: captureFieldSchema.nullable() }).nullable(),
});
export type CapturePreviewResult = z.infer<typeof capturePreviewSchema>;

export const captureProgressSchema = z.object({
  fileName: z.string(),
  bytesRead: z.number().nonnegative(),
  totalBytes: z.number().nonnegative(),
  state: z.enum(['reading', 'done', 'cancelled', 'failed']),
  message: z.string().nullable(),
});
export type CaptureProgress = z.infer<typeof captureProgressSchema>;
