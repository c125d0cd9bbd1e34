/** Test helpers: feed a reader in given pieces and join what comes out. */
import type { SampleBlock } from '../../../app/capture/samples';
import type { CaptureReader } from '../../../app/formats/captureReader';

export interface JoinedCapture {
  blocks: SampleBlock[];
  sync: number[];
  ramp: number[];
  gate: number[];
  control: number[] | null;
  /** Each sample's time from its block: startS + k / sampleRateHz. */
  timeS: number[];
}

export function joinBlocks(blocks: SampleBlock[]): JoinedCapture {
  const joined: JoinedCapture = { blocks, sync: [], ramp: [], gate: [], control: blocks[0]?.control === null ? null : [], timeS: [] };
  for (const block of blocks) {
    joined.sync.push(...block.sync);
    joined.ramp.push(...block.ramp);
    joined.gate.push(...block.gate);
    if (joined.control !== null && block.control !== null) joined.control.push(...block.control);
    for (let index = 0; index < block.sync.length; index++) joined.timeS.push(block.startS + index / block.sampleRateHz);
  }
  return joined;
}

/** Pushes `bytes` cut at the given offsets (sorted, in range), then finishes. */
export function readInPieces(reader: CaptureReader, bytes: Uint8Array, cuts: number[] = []): JoinedCapture {
  const blocks: SampleBlock[] = [];
  let previous = 0;
  for (const cut of [...cuts].sort((a, b) => a - b)) {
    blocks.push(...reader.push(bytes.subarray(previous, cut)));
    previous = cut;
  }
  blocks.push(...reader.push(bytes.subarray(previous)));
  blocks.push(...reader.finish());
  return joinBlocks(blocks);
}
