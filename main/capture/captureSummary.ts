import type { SignalRole } from '../../app/capture/samples';
import { readCaptureFile, type ReadCaptureOptions } from './readCaptureFile';

export interface CaptureSummary {
  samples: number;
  durationS: number;
  /** Rate of the last block (the best estimate for a timed file). */
  sampleRateHz: number;
  channels: SignalRole[];
  /** Stretches that follow a gap in the samples. */
  gaps: number;
}

/** Reads a capture through once and says what it holds, without keeping its samples. */
export async function captureSummary(path: string, options: ReadCaptureOptions = {}): Promise<CaptureSummary> {
  let samples = 0;
  let firstS: number | undefined;
  let lastS = 0;
  let sampleRateHz = 0;
  let gaps = 0;
  let hasControl = false;
  for await (const block of readCaptureFile(path, options)) {
    const length = block.sync.length;
    firstS ??= block.startS;
    samples += length;
    sampleRateHz = block.sampleRateHz;
    lastS = block.startS + length / block.sampleRateHz;
    if (block.afterGap) gaps++;
    hasControl = block.control !== null;
  }
  return {
    samples,
    durationS: lastS - (firstS ?? 0),
    sampleRateHz,
    channels: hasControl ? ['sync', 'ramp', 'gate', 'control'] : ['sync', 'ramp', 'gate'],
    gaps,
  };
}
