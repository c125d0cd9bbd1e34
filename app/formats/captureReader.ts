import type { SampleBlock } from '../capture/samples';

/**
 * An incremental capture reader: feed it the file in chunks of any size (split anywhere, even inside a
 * line or a UTF-8 character), collect the blocks each call completes, then call `finish()` once for the rest.
 * Memory stays bounded by one block plus one partial line or record, whatever the file's length.
 * Bad input throws an `InputError` naming the file, line or record and what is wrong.
 */
export interface CaptureReader {
  push(chunk: Uint8Array | string): SampleBlock[];
  finish(): SampleBlock[];
  /** How the file is being read, in one line (columns or channels, units, timing, roles); null until known. */
  readAs(): string | null;
}

/** Samples per emitted block unless a reader is told otherwise: big enough to amortise per-block work, small enough for live views. */
export const defaultBlockSamples = 4096;
