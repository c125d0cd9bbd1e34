/**
 * COMTRADE as recorders write it, in fixtures of our own (fixtures/captures/recorder-*): a rate that changes
 * part-way (nrates 2), timestamps only (a rate of 0) with a time multiplier, the 2013 single file, and the habits of
 * published sample records: channel ids padded with spaces, units with a leading space, PS in lower case, the
 * 2013 time-code and quality lines, a rev_year that is no revision (2001), an end-of-file mark (0x1A) after the
 * last line. Those habits are the ones seen in the python-comtrade project's tests/sample_files (sample_ascii.cfg,
 * sample_ascii.cff, and the 2001 record in tests.py), read for their form; their files are not copied here.
 * Every volt and time expected is worked out by hand from the fixture text.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseChannelMap } from '../../../app/capture/channelMap';
import { parseComtradeConfig } from '../../../app/formats/comtradeConfigParse';
import { createComtradeCffReader } from '../../../app/formats/comtradeCffReader';
import { createComtradeDataReader } from '../../../app/formats/comtradeDataReader';
import { fixtureBytes, fixtureText } from './fixtureBytes';
import { readInPieces } from './readAll';

function expectClose(actual: number[], expected: number[], digits = 12): void {
  expect(actual).toHaveLength(expected.length);
  actual.forEach((value, index) => expect(value).toBeCloseTo(expected[index], digits));
}

describe('COMTRADE variants from recorders', () => {
  it('2013 single file, ASCII, two rates, roles by id (padded ids, digital gate), a trailing 0x1A', () => {
    const reader = createComtradeCffReader({ channelMap: parseChannelMap('sync=VA,ramp=IB,gate=ST_1'), source: 'rw0388.cff' });
    const capture = readInPieces(reader, fixtureBytes('recorder-rw0388-multirate-2013.cff'));
    // 4000 Hz for samples 1-4, then 2000 Hz: two blocks, the second starting 500 us after the 4th sample (750 us).
    expect(capture.blocks.map((block) => block.sampleRateHz)).toEqual([4000, 2000]);
    expect(capture.blocks.map((block) => block.sync.length)).toEqual([4, 3]);
    expect(capture.blocks[1].afterGap).toBe(false);
    expectClose(capture.timeS, [0, 250e-6, 500e-6, 750e-6, 1250e-6, 1750e-6, 2250e-6]);
    // VA: a = 0.01 V; IB: a = 0.002 V; ST_1 is the first digital column.
    expectClose(capture.sync, [1, 2, 3, 4, -1, -2, -3]);
    expectClose(capture.ramp, [0.5, 1, 1.5, 2, 3, 4, 5]);
    expect(capture.gate).toEqual([0, 0, 1, 1, 0, 0, 1]);
    expect(reader.readAs()).toBe(
      'COMTRADE 2013 ASCII, 3 analog + 3 digital channels, 2 rates (4 kS/s to sample 4, 2 kS/s to the end); sync=analog 1 "VA", ramp=analog 2 "IB", gate=digital 1 "ST_1"',
    );
  });

  it('the same record with the gate inverted and the ramp scaled, by An and Dn', () => {
    const reader = createComtradeCffReader({ channelMap: parseChannelMap('sync=1,ramp=A2:x10,gate=D1:invert') });
    const capture = readInPieces(reader, fixtureBytes('recorder-rw0388-multirate-2013.cff'));
    expectClose(capture.ramp, [5, 10, 15, 20, 30, 40, 50]);
    expect(capture.gate).toEqual([1, 1, 0, 0, 1, 1, 0]);
  });

  it('rev_year 2001 read as 1999, a rate of 0 (timestamps only) with timemult 2.5, a gap, roles by number', () => {
    const config = parseComtradeConfig(fixtureText('recorder-rw0388-timestamps-2001.cfg'));
    expect(config.revision).toBe(1999);
    expect(config.timeMultiplier).toBe(2.5);
    const reader = createComtradeDataReader(config, { channelMap: parseChannelMap('sync=1,ramp=2,gate=IC,control=4'), source: 'rw0388.dat' });
    const capture = readInPieces(reader, fixtureBytes('recorder-rw0388-timestamps-2001.dat'));
    // Ticks 0, 20, 40, 60 x 2.5 us = 0, 50, 100, 150 us: 20 kS/s. Then 400 us: 5 periods on, a gap; 450 us.
    expect(capture.blocks).toHaveLength(2);
    expect(capture.blocks[0].sampleRateHz).toBeCloseTo(20000, 6);
    expect(capture.blocks[1].afterGap).toBe(true);
    expect(capture.blocks[1].startS).toBeCloseTo(400e-6, 15);
    expectClose(capture.sync, [1, -1, 0.5, -0.5, 0.25, -0.25]);
    expectClose(capture.gate, [0, 0, 12, 12, 0, 0]);
    expectClose(capture.control as number[], [3.1, 3.1, 3.2, 3.2, 3.3, 3.3]);
    expect(reader.readAs()).toContain('times from the timestamps, timemult 2.5');
  });

  it('BINARY with two rates: the same samples and times however the data is cut, whatever the block size', () => {
    const config = parseComtradeConfig(fixtureText('recorder-rw0391-binary-multirate.cfg'));
    const options = { channelMap: parseChannelMap('sync=U1,ramp=U2,gate=ST_1') };
    const bytes = fixtureBytes('recorder-rw0391-binary-multirate.dat');
    const whole = readInPieces(createComtradeDataReader(config, options), bytes);
    // 5000 Hz (200 us) to sample 3, then 10000 Hz (100 us): 0, 200, 400, then 500, 600, 700 us.
    expectClose(whole.timeS, [0, 200e-6, 400e-6, 500e-6, 600e-6, 700e-6]);
    expectClose(whole.sync, [1, 2, 3, -1, -2, -3]);
    expect(whole.gate).toEqual([0, 0, 1, 1, 0, 0]);
    expect(whole.blocks.map((block) => block.sampleRateHz)).toEqual([5000, 10000]);
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5 }), fc.array(fc.integer({ min: 0, max: bytes.length }), { maxLength: 6 }), (blockSamples, cuts) => {
        const pieces = readInPieces(createComtradeDataReader(config, { ...options, blockSamples }), bytes, cuts);
        expectClose(pieces.timeS, whole.timeS);
        expect(pieces.sync).toEqual(whole.sync);
        expect(pieces.gate).toEqual(whole.gate);
        // No block mixes the two rates.
        expect(pieces.blocks.every((block) => block.sampleRateHz === 5000 || block.sampleRateHz === 10000)).toBe(true);
      }),
      { numRuns: 150 },
    );
  });

  it('recorder habits: empty times, empty line frequency, spaces around ids and values', () => {
    // The form of a record with its optional fields left empty (as in the python-comtrade tests' lazy 1999 case).
    const text = ',,1999\r\n4,3A,1D\r\n1, TP1   ,,,V,0.5,0,0,-32768,32767,1,1,S\r\n2, TP2 ,,,V,0.5,0,0,-32768,32767,1,1,S\r\n' +
      '3,TP3,,,V,1,0,0,-32768,32767,1,1,S\r\n1, Gate out ,,,0\r\n\r\n0\r\n0,2\r\n,\r\n\r\nASCII\r\n1\r\n';
    const config = parseComtradeConfig(text);
    expect(config.firstSampleTime.text).toBe('');
    expect(config.lineFrequencyHz).toBe(0);
    const reader = createComtradeDataReader(config, { channelMap: parseChannelMap('sync=TP1,ramp=TP2,gate=Gate out') });
    const capture = readInPieces(reader, new TextEncoder().encode('1, 0, 2,4,6,0\r\n2,100, 4, 8,12,1\r\n'));
    // a = 0.5: 2 -> 1 V, 4 -> 2 V; 100 us apart: 10 kS/s.
    expect(capture.sync).toEqual([1, 2]);
    expect(capture.ramp).toEqual([2, 4]);
    expect(capture.gate).toEqual([0, 1]);
    expect(capture.blocks[0].sampleRateHz).toBeCloseTo(10000, 6);
  });
});
