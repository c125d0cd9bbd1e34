import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { signalRoles } from '../../../app/capture/samples';
import { createCsvReader } from '../../../app/formats/csvReader';
import { createCsvWriter } from '../../../app/formats/csvWriter';
import { comtradeFileTypes } from '../../../app/formats/comtradeConfig';
import { parseComtradeConfig } from '../../../app/formats/comtradeConfigParse';
import { formatComtradeConfig } from '../../../app/formats/comtradeConfigFormat';
import { createComtradeDataReader } from '../../../app/formats/comtradeDataReader';
import { createComtradeDataEncoder } from '../../../app/formats/comtradeDataEncoder';
import { ComtradeStatsCollector, comtradeTimeOriginS, planComtradeConfig } from '../../../app/formats/comtradeWritePlan';
import { arbitraryCapture, gapStarts } from './captureArbitrary';
import { joinBlocks, readInPieces } from './readAll';
import { joinBytes } from '../../helpers/joinBytes';

function concatenate(parts: (string | Uint8Array)[]): Uint8Array {
  return joinBytes(...parts.map((part) => (typeof part === 'string' ? new TextEncoder().encode(part) : part)));
}

describe('CSV write then read', () => {
  it('gives back every sample exactly, the times within 1 ns, and the gaps where they were', () => {
    fc.assert(
      fc.property(arbitraryCapture({ gaps: true, missing: true }), fc.integer({ min: 1, max: 50 }), (blocks, readBlockSamples) => {
        const writer = createCsvWriter();
        const bytes = concatenate(blocks.map((block) => writer.write(block)));
        const read = readInPieces(createCsvReader({ blockSamples: readBlockSamples }), bytes);
        const written = joinBlocks(blocks);
        // Shortest round-trip text (String(value)) reads back to the same double (ECMA-262 Number::toString).
        expect(read.sync).toEqual(written.sync);
        expect(read.ramp).toEqual(written.ramp);
        expect(read.gate).toEqual(written.gate);
        expect(read.control).toEqual(written.control);
        // t is printed to 9 decimals (0.5 ns rounding) and the rate is measured from those times: 1 ns covers both.
        read.timeS.forEach((timeS, index) => expect(Math.abs(timeS - written.timeS[index])).toBeLessThan(1e-9));
        expect(gapStarts(read.blocks)).toEqual(gapStarts(blocks));
      }),
      { numRuns: 120 },
    );
  });
});

describe('COMTRADE write then read, every file type and both revisions', () => {
  for (const fileType of comtradeFileTypes) {
    for (const revision of [1999, 2013] as const) {
      it(`${fileType} ${revision}: samples within the scaling's resolution, times within a timestamp unit`, () => {
        fc.assert(
          fc.property(arbitraryCapture({ gaps: true, missing: true }), (blocks) => {
            const collector = new ComtradeStatsCollector();
            blocks.forEach((block) => collector.observe(block));
            const stats = collector.result();
            const planned = planComtradeConfig(stats, { fileType, revision, stationName: 'Bench 4', lineFrequencyHz: 60 });
            // Through the text form, as a reader of the files would get it.
            const config = parseComtradeConfig(formatComtradeConfig(planned));
            const encoder = createComtradeDataEncoder(config, { timeOriginS: comtradeTimeOriginS(stats) });
            const bytes = concatenate(blocks.map((block) => encoder.encode(block)));
            const read = readInPieces(createComtradeDataReader(config, { blockSamples: 16 }), bytes);
            const written = joinBlocks(blocks);
            for (const role of signalRoles) {
              const writtenValues = written[role];
              const readValues = read[role];
              if (writtenValues === null) {
                expect(readValues).toBeNull();
                continue;
              }
              const channel = config.analogChannels.find((candidate) => candidate.id === role);
              expect(channel).toBeDefined();
              const a = channel?.multiplier ?? 0;
              const b = channel?.offset ?? 0;
              writtenValues.forEach((value, index) => {
                const back = (readValues as number[])[index];
                if (Number.isNaN(value)) {
                  expect(back).toBeNaN();
                  return;
                }
                // Bound: integer codes round to the nearest step, so |error| <= a / 2, plus double rounding of
                // (v - b) / a and a * x + b, a few units of 2^-52 relative to |v| + |b|. FLOAT32 stores volts
                // rounded to float32: |error| <= max(|v| * 2^-24, 2^-150): half a unit in the last place, and
                // below half the smallest float32 subnormal (2^-149) a value rounds to 0.
                const bound = fileType === 'FLOAT32' ? Math.max(Math.abs(value) * 2 ** -24, 2 ** -150) : a / 2 + 1e-14 * (Math.abs(value) + Math.abs(b));
                expect(Math.abs(back - value)).toBeLessThanOrEqual(bound);
              });
            }
            // Times: one rate without gaps -> nrates 1, times = first timestamp (1 us x timemult units) + k / rate.
            // With gaps -> nrates 0, timestamps of a thousandth of a period; the rate is re-measured from them.
            const tickS = config.timeMultiplier * 1e-6;
            const timeBoundS = config.sampleRates.length > 0 ? tickS / 2 + 1e-12 : 2 * tickS;
            read.timeS.forEach((timeS, index) => expect(Math.abs(timeS - written.timeS[index])).toBeLessThanOrEqual(timeBoundS));
            expect(gapStarts(read.blocks)).toEqual(gapStarts(blocks));
            expect(config.sampleRates.length > 0).toBe(gapStarts(blocks).length === 0);
          }),
          { numRuns: 30 },
        );
      });
    }
  }

  it('uses the integer range well: the largest stored code is the type limit', () => {
    const blocks = [{ startS: 0, sampleRateHz: 1000, sync: Float64Array.of(-3, 7), ramp: Float64Array.of(0.5, 9.5), gate: Float64Array.of(0, 12), control: null, afterGap: false }];
    const collector = new ComtradeStatsCollector();
    collector.observe(blocks[0]);
    const config = planComtradeConfig(collector.result(), { fileType: 'BINARY' });
    // sync range -3..7 V over codes -32767..32767: b = 2 V, a = 5 / 32767 V.
    expect(config.analogChannels[0].offset).toBe(2);
    expect(config.analogChannels[0].multiplier).toBe(5 / 32767);
    const bytes = createComtradeDataEncoder(config).encode(blocks[0]);
    const view = new DataView(bytes.buffer);
    // Record 1 sync code at byte 8, record 2 at 8 + 14 (records are 8 + 3 x 2 = 14 bytes).
    expect(view.getInt16(8, true)).toBe(-32767);
    expect(view.getInt16(14 + 8, true)).toBe(32767);
  });
});
