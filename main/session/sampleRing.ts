/**
 * The last few seconds of raw samples, for folding recent cycles and for "keep capture". Bounded: blocks older
 * than `keepS` behind the newest are dropped, so an hour of streaming costs the same memory as a minute.
 * A gap in the record (a dropped block) empties the ring: no cycle or kept capture may join two stretches.
 */
import type { SampleBlock } from '../../app/capture/samples';

export interface SampleRing {
  push(block: SampleBlock): void;
  /** Blocks overlapping [fromS, toS), oldest first. */
  blocksBetween(fromS: number, toS: number): SampleBlock[];
  /** The newest `seconds` of samples as blocks (may be shorter after a gap). */
  lastSeconds(seconds: number): SampleBlock[];
  newestS(): number | null;
  clear(): void;
}

function blockEndS(block: SampleBlock): number {
  return block.startS + block.sync.length / block.sampleRateHz;
}

export function createSampleRing(options: { keepS: number }): SampleRing {
  let blocks: SampleBlock[] = [];
  return {
    push(block) {
      if (block.afterGap) blocks = [];
      blocks.push(block);
      const cutS = blockEndS(block) - options.keepS;
      let drop = 0;
      while (drop < blocks.length - 1 && blockEndS(blocks[drop]) <= cutS) drop++;
      if (drop > 0) blocks = blocks.slice(drop);
    },
    blocksBetween(fromS, toS) {
      return blocks.filter((block) => blockEndS(block) > fromS && block.startS < toS);
    },
    lastSeconds(seconds) {
      const newest = blocks.length > 0 ? blockEndS(blocks[blocks.length - 1]) : 0;
      return blocks.filter((block) => blockEndS(block) > newest - seconds);
    },
    newestS: () => (blocks.length > 0 ? blockEndS(blocks[blocks.length - 1]) : null),
    clear() {
      blocks = [];
    },
  };
}

/** Joins consecutive blocks of one stretch into one block (for keeping a capture). */
export function mergeBlocks(blocks: readonly SampleBlock[]): SampleBlock {
  const total = blocks.reduce((sum, block) => sum + block.sync.length, 0);
  const hasControl = blocks.every((block) => block.control !== null);
  const merged: SampleBlock = {
    startS: blocks[0].startS,
    sampleRateHz: blocks[0].sampleRateHz,
    sync: new Float64Array(total),
    ramp: new Float64Array(total),
    gate: new Float64Array(total),
    control: hasControl ? new Float64Array(total) : null,
    afterGap: blocks[0].afterGap,
  };
  let offset = 0;
  for (const block of blocks) {
    merged.sync.set(block.sync, offset);
    merged.ramp.set(block.ramp, offset);
    merged.gate.set(block.gate, offset);
    if (merged.control && block.control) merged.control.set(block.control, offset);
    offset += block.sync.length;
  }
  return merged;
}
