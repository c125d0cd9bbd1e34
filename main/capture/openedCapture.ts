/** What opening a capture file gives (main/capture/readCaptureFile.ts), and the error of a reading stopped on purpose. */
import type { SampleBlock } from '../../app/capture/samples';

/** The reading was stopped on purpose (a Cancel button, a closed screen): not a fault of the file. */
export class CaptureCancelled extends Error {
  constructor(path: string) {
    super(`reading ${path} was cancelled`);
    this.name = 'CaptureCancelled';
  }
}

/** A capture opened for reading: its blocks, and how it is read once that is known. */
export interface OpenedCapture {
  blocks: AsyncGenerator<SampleBlock>;
  /** One line: columns or channels, units, timing, roles (null before the first lines are read). */
  readAs(): string | null;
  /** Bytes of the data file (the .dat of a COMTRADE pair). */
  totalBytes: number;
}
