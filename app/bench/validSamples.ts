/**
 * Samples the analysis can trust: a value that is not a finite number, or beyond +-1 MV (no logger input reads that;
 * our rule), is a lost sample. A block holding some is cut around them and the part after is marked as following a
 * gap, so the analysis never joins across missing samples and never lets one bad value poison its sums.
 */
import type { SampleBlock } from '../capture/samples';

const limitV = 1e6;

function isValidAt(block: SampleBlock, index: number): boolean {
  const sync = block.sync[index];
  const ramp = block.ramp[index];
  const gate = block.gate[index];
  const control = block.control ? block.control[index] : 0;
  // Comparisons are false for NaN, so this rejects NaN as well as infinities and absurd values.
  return Math.abs(sync) < limitV && Math.abs(ramp) < limitV && Math.abs(gate) < limitV && Math.abs(control) < limitV;
}

/** Position of the first sample that is not valid, else the block's length: one pass over the channels together. */
function firstInvalid(block: SampleBlock): number {
  const { sync, ramp, gate, control } = block;
  const length = sync.length;
  if (control) {
    for (let i = 0; i < length; i++) {
      // Comparisons are false for NaN, so this rejects NaN as well as infinities and absurd values.
      if (!(Math.abs(sync[i]) < limitV && Math.abs(ramp[i]) < limitV && Math.abs(gate[i]) < limitV && Math.abs(control[i]) < limitV)) return i;
    }
    return length;
  }
  for (let i = 0; i < length; i++) {
    if (!(Math.abs(sync[i]) < limitV && Math.abs(ramp[i]) < limitV && Math.abs(gate[i]) < limitV)) return i;
  }
  return length;
}

/** The block itself when every sample is valid (the usual case), else its valid runs; `invalid` counts the rest. */
export function splitValidRuns(block: SampleBlock): { runs: SampleBlock[]; invalid: number } {
  const length = block.sync.length;
  const firstBad = firstInvalid(block);
  if (firstBad === length) return { runs: [block], invalid: 0 };
  const runs: SampleBlock[] = [];
  let invalid = 0;
  let runStart = 0;
  let afterGap = block.afterGap;
  const cut = (from: number, to: number): void => {
    if (to <= from) return;
    runs.push({
      startS: block.startS + from / block.sampleRateHz,
      sampleRateHz: block.sampleRateHz,
      sync: block.sync.subarray(from, to),
      ramp: block.ramp.subarray(from, to),
      gate: block.gate.subarray(from, to),
      control: block.control ? block.control.subarray(from, to) : null,
      afterGap,
    });
  };
  // From the first bad sample on; the run before it is cut at once as the loop starts there.
  for (let i = firstBad; i <= length; i++) {
    if (i < length && isValidAt(block, i)) continue;
    cut(runStart, i);
    if (i < length) {
      invalid += 1;
      afterGap = true;
    }
    runStart = i + 1;
  }
  return { runs, invalid };
}
