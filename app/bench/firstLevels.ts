/**
 * Levels learned from the first fraction of a second of samples, before cycle tracking starts: the sync offset and
 * amplitude (for the crossing hysteresis), the gate state levels (IEEE 181 histogram method) and the ramp's
 * spread (so a window whose ramp barely moves is not taken for a charging interval).
 */
import type { SampleBlock } from '../capture/samples';
import { stateLevelsByHistogram, type StateLevels } from '../signal/stateLevels';
import { estimateSyncLevels, type SyncLevels } from '../signal/zeroCrossings';

export interface FirstLevels {
  sync: SyncLevels | null;
  gate: StateLevels | null;
  /** 1st to 99th percentile spread of the ramp (V). */
  rampSpreadV: number;
}

/**
 * Uses exactly the first `maxSamples` samples, whatever the block sizes, so a capture gives the same readings however
 * a reader or the logger cuts it into blocks.
 */
export function learnFirstLevels(blocks: readonly SampleBlock[], options: { minimumSyncAmplitudeV: number; maxSamples: number }): FirstLevels {
  const sync = concatenate(blocks.map((block) => block.sync), options.maxSamples);
  const gate = concatenate(blocks.map((block) => block.gate), options.maxSamples);
  const ramp = concatenate(blocks.map((block) => block.ramp), options.maxSamples);
  const syncLevels = estimateSyncLevels(sync);
  const sortedRamp = ramp.sort();
  const rampSpreadV = sortedRamp.length > 0 ? sortedRamp[Math.floor(0.99 * (sortedRamp.length - 1))] - sortedRamp[Math.floor(0.01 * (sortedRamp.length - 1))] : 0;
  return {
    sync: syncLevels && syncLevels.amplitudeV >= options.minimumSyncAmplitudeV ? syncLevels : null,
    gate: stateLevelsByHistogram(gate),
    rampSpreadV,
  };
}

function concatenate(parts: readonly Float64Array[], maxSamples: number): Float64Array {
  const total = Math.min(maxSamples, parts.reduce((sum, part) => sum + part.length, 0));
  const joined = new Float64Array(total);
  let offset = 0;
  for (const part of parts) {
    if (offset >= total) break;
    const take = Math.min(part.length, total - offset);
    joined.set(part.subarray(0, take), offset);
    offset += take;
  }
  return joined;
}
