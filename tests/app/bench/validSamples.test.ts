import { describe, expect, it } from 'vitest';
import { splitValidRuns } from '../../../app/bench/validSamples';
import type { SampleBlock } from '../../../app/capture/samples';

function block(values: number[], afterGap = false): SampleBlock {
  const data = Float64Array.from(values);
  return { startS: 1, sampleRateHz: 10, sync: data, ramp: data.map(() => 1), gate: data.map(() => 0), control: null, afterGap };
}

describe('splitValidRuns', () => {
  it('passes a clean block through as it is', () => {
    const clean = block([1, 2, 3]);
    const { runs, invalid } = splitValidRuns(clean);
    expect(runs).toEqual([clean]);
    expect(runs[0]).toBe(clean);
    expect(invalid).toBe(0);
  });

  it('cuts around bad samples; the runs after them follow a gap and keep their times', () => {
    const { runs, invalid } = splitValidRuns(block([1, 2, Number.NaN, Number.POSITIVE_INFINITY, 5, 6, 2e6, 8]));
    expect(invalid).toBe(3);
    expect(runs.map((run) => Array.from(run.sync))).toEqual([[1, 2], [5, 6], [8]]);
    expect(runs.map((run) => run.afterGap)).toEqual([false, true, true]);
    // Sample 4 of a block starting at 1 s at 10 S/s is at 1.4 s.
    expect(runs[1].startS).toBeCloseTo(1.4, 12);
    expect(runs[2].startS).toBeCloseTo(1.7, 12);
  });

  it('a bad control value counts too; an all-bad block gives no runs', () => {
    const withControl = { ...block([1, 2, 3]), control: Float64Array.from([0, Number.NaN, 0]) };
    expect(splitValidRuns(withControl).runs.map((run) => run.sync.length)).toEqual([1, 1]);
    expect(splitValidRuns(block([Number.NaN, Number.NaN])).runs).toHaveLength(0);
  });
});
