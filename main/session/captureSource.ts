/**
 * A capture file as the Bench's link: its blocks go into the same pipeline as a logger's (benchPipeline), played at
 * `speed` times real time (1: as recorded, so the fold moves as it did at the bench) or as fast as the analysis
 * goes (0). The reading reports its progress, can be cancelled (the link closed), and ends with the file: the steps
 * then hold the readings of its last second, the transfer curve and the extremes of all of it.
 */
import type { CaptureProgress, LinkSource } from '../../app/contract';
import type { SampleBlock } from '../../app/capture/samples';
import { isInputError } from '../../app/errors';
import { CaptureCancelled, checkCaptureFile, openCaptureFile, type OpenedCapture, type ReadCaptureOptions } from '../capture/readCaptureFile';
import type { LineSink, LineSource } from './liveLink';

export interface CaptureSourceOptions {
  path: string;
  fileName: string;
  read: ReadCaptureOptions;
  /** Times real time (1 as recorded); 0: as fast as it reads. */
  speed: number;
  onProgress(progress: CaptureProgress): void;
  /** Progress reports at most this often (ms, default 200). */
  progressIntervalMs?: number;
}

const wait = (ms: number): Promise<void> => new Promise((done) => setTimeout(done, ms));
const nextTurn = (): Promise<void> => new Promise((done) => setImmediate(done));

/**
 * Opens the file at once, so a file that cannot be read is refused with its reason before the link changes; the
 * reading starts with `start`.
 */
export async function openCaptureSource(options: CaptureSourceOptions): Promise<LineSource> {
  const controller = new AbortController();
  let bytesRead = 0;
  let lastReportMs = Number.NEGATIVE_INFINITY;
  const report = (state: CaptureProgress['state'], message: string | null, totalBytes: number): void => {
    options.onProgress({ fileName: options.fileName, bytesRead, totalBytes, state, message });
  };
  await checkCaptureFile(options.path, options.read);
  const capture: OpenedCapture = await openCaptureFile(options.path, {
    ...options.read,
    signal: controller.signal,
    onProgress: (done, total) => {
      bytesRead = done;
      const nowMs = Date.now();
      if (nowMs - lastReportMs >= (options.progressIntervalMs ?? 200)) {
        lastReportMs = nowMs;
        report('reading', null, total);
      }
    },
  });
  const description: LinkSource = { kind: 'capture', fileName: options.fileName };
  let stopped = false;

  const play = async (sink: LineSink): Promise<void> => {
    const startedMs = Date.now();
    let firstS: number | null = null;
    let sinceTurn = 0;
    try {
      for await (const block of capture.blocks) {
        if (stopped) break;
        firstS ??= block.startS;
        if (options.speed > 0) {
          // Hand the block over when its end is due at this speed.
          const dueMs = ((block.startS - firstS + block.sync.length / block.sampleRateHz) / options.speed) * 1000;
          const aheadMs = dueMs - (Date.now() - startedMs);
          if (aheadMs > 0) await wait(aheadMs);
        } else if (++sinceTurn >= 8) {
          // As fast as it goes, yet the screens and their calls get their turn.
          sinceTurn = 0;
          await nextTurn();
        }
        if (stopped) break;
        sink.blocks?.([block] as SampleBlock[]);
      }
      if (stopped) {
        // Stopped between blocks (while waiting for a block's time, say): the reader never saw the cancel.
        report('cancelled', null, capture.totalBytes);
        return;
      }
      report('done', capture.readAs(), capture.totalBytes);
      sink.finished?.(`end of ${options.fileName}`);
    } catch (error) {
      if (error instanceof CaptureCancelled || stopped) {
        report('cancelled', null, capture.totalBytes);
        return;
      }
      const message = isInputError(error) ? error.message : `reading failed: ${error instanceof Error ? error.message : String(error)}`;
      report('failed', message, capture.totalBytes);
      sink.ended(message);
    }
  };

  return {
    description,
    start(sink) {
      report('reading', capture.readAs(), capture.totalBytes);
      void play(sink);
    },
    stop() {
      if (stopped) return;
      stopped = true;
      // The reader stops at its next chunk and closes its threads and file (the loop above sees the cancel).
      controller.abort();
    },
  };
}
