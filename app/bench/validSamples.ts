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

/** Position of the first sample before `end` that is not valid, else `end`. */
function firstInvalid(values: Float64Array, end: number): number {
  for (let i = 0; i < end; i++) {
    // Comparisons are false for NaN, so this rejects NaN as well as infinities and absurd values.
    if (!(Math.abs(values[i]) < limitV)) return i;
  }
  return end;
}

/** The block itself when every sample is valid (the usual case), else its valid runs; `invalid` counts the rest. */
export function splitValidRuns(block: SampleBlock): { runs: SampleBlock[]; invalid: number } {
  const length = block.sync.length;
  // One channel at a time (a tight loop each), each only as far as the earliest bad sample found so far.
  let end = firstInvalid(block.sync, length);
  end = firstInvalid(block.ramp, end);
  end = firstInvalid(block.gate, end);
  if (block.control) end = firstInvalid(block.control, end);
  if (end === length) return { runs: [block], invalid: 0 };
  const firstBad = end;
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
