/** fast-check generator of captures: a few blocks at one rate, volts in a bench range, optional control, gaps, missing samples. */
import fc from 'fast-check';
import type { SampleBlock } from '../../../app/capture/samples';

export interface ArbitraryCaptureOptions {
  gaps?: boolean;
  missing?: boolean;
}

const volts = (missing: boolean) =>
  missing
    ? fc.oneof({ weight: 20, arbitrary: fc.double({ min: -400, max: 400, noNaN: true }) }, { weight: 1, arbitrary: fc.constant(Number.NaN) })
    : fc.double({ min: -400, max: 400, noNaN: true });

export function arbitraryCapture(options: ArbitraryCaptureOptions = {}): fc.Arbitrary<SampleBlock[]> {
  const missing = options.missing ?? false;
  return fc
    .record({
      // Logger rates from 5 to 200 kS/s, including ones with no exact decimal period (issue 2: 5-200 kS/s).
      sampleRateHz: fc.constantFrom(5000, 10000, 20000, 48000, 50000, 100000, 200000, 7777),
      startS: fc.constantFrom(0, 0.25, 12.5),
      hasControl: fc.boolean(),
      blocks: fc.array(
        fc.record({
          length: fc.integer({ min: 2, max: 40 }),
          // A gap of 3 to 200 periods: far beyond the 1.5-period threshold.
          gapPeriods: options.gaps ? fc.oneof(fc.constant(0), fc.integer({ min: 3, max: 200 })) : fc.constant(0),
          seed: fc.array(volts(missing), { minLength: 4 * 40, maxLength: 4 * 40 }),
        }),
        { minLength: 1, maxLength: 4 },
      ),
    })
    .map(({ sampleRateHz, startS, hasControl, blocks }) => {
      const result: SampleBlock[] = [];
      let nextS = startS;
      blocks.forEach((spec, index) => {
        const afterGap = index > 0 && spec.gapPeriods > 0;
        if (afterGap) nextS += (spec.gapPeriods - 1) / sampleRateHz;
        const take = (channel: number) => Float64Array.from(spec.seed.slice(channel * 40, channel * 40 + spec.length));
        result.push({
          startS: nextS,
          sampleRateHz,
          sync: take(0),
          ramp: take(1),
          gate: take(2),
          control: hasControl ? take(3) : null,
          afterGap,
        });
        nextS += spec.length / sampleRateHz;
      });
      return result;
    });
}

/** Index in the joined sample stream where each block after a gap starts. */
export function gapStarts(blocks: SampleBlock[]): number[] {
  const starts: number[] = [];
  let index = 0;
  for (const block of blocks) {
    if (block.afterGap) starts.push(index);
    index += block.sync.length;
  }
  return starts;
}
