import { describe, expect, it } from 'vitest';
import { SampleBlockBuilder } from '../../../app/formats/sampleBlockBuilder';
import type { SampleBlock } from '../../../app/capture/samples';
import { InputError } from '../../../app/errors';

function build(times: number[], options: { blockSamples: number; fixedRateHz?: number; fallbackRateHz?: number }): SampleBlock[] {
  const builder = new SampleBlockBuilder({ ...options, hasControl: false, where: () => 'here' });
  const out: SampleBlock[] = [];
  times.forEach((timeS, index) => builder.append(timeS, index, 0, 0, 0, out));
  builder.flush(out);
  return out;
}

describe('SampleBlockBuilder', () => {
  it('holds a one-sample block until the next sample gives the rate, and keeps the order', () => {
    const blocks = build([0, 0.001, 0.002], { blockSamples: 1 });
    expect(blocks.map((block) => block.sync[0])).toEqual([0, 1, 2]);
    // Rate from the first interval: 1 / 1 ms = 1000 Hz; tolerance: one double rounding of the printed times.
    for (const block of blocks) expect(block.sampleRateHz).toBeCloseTo(1000, 9);
  });

  it('averages jitter over the stretch: rate = (n - 1) / (t_last - t_first)', () => {
    // Intervals 0.9, 1.1, 1.0 ms: the mean period is exactly 1 ms.
    const blocks = build([0, 0.0009, 0.002, 0.003], { blockSamples: 8 });
    expect(blocks).toHaveLength(1);
    expect(blocks[0].sampleRateHz).toBeCloseTo(1000, 9);
  });

  it('calls an interval over 1.5 periods a gap and one under it jitter', () => {
    // Period 1 ms: 1.4 ms is jitter, 1.6 ms is a gap.
    const jitter = build([0, 0.001, 0.002, 0.0034], { blockSamples: 8 });
    expect(jitter).toHaveLength(1);
    const gap = build([0, 0.001, 0.002, 0.0036, 0.0046], { blockSamples: 8 });
    expect(gap.map((block) => [block.startS, block.sync.length, block.afterGap])).toEqual([
      [0, 3, false],
      [0.0036, 2, true],
    ]);
  });

  it('uses the previous stretch period for a single sample after a gap', () => {
    const blocks = build([0, 0.001, 0.01], { blockSamples: 8 });
    expect(blocks[1].sync.length).toBe(1);
    expect(blocks[1].sampleRateHz).toBeCloseTo(1000, 9);
  });

  it('gives fixed-rate blocks times origin + k / rate', () => {
    const blocks = build([Number.NaN, Number.NaN, Number.NaN], { blockSamples: 2, fixedRateHz: 4 });
    expect(blocks.map((block) => block.startS)).toEqual([0, 0.5]);
  });

  it('says a lone timed sample has no rate, and time must increase', () => {
    expect(() => build([0], { blockSamples: 1 })).toThrow(InputError);
    expect(() => build([0], { blockSamples: 1 })).toThrow('cannot tell the sample rate');
    expect(build([0], { blockSamples: 1, fallbackRateHz: 250 })[0].sampleRateHz).toBe(250);
    expect(() => build([0, 0.001, 0.001], { blockSamples: 4 })).toThrow('here: time does not increase');
  });
});
