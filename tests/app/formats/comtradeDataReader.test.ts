import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseComtradeConfig } from '../../../app/formats/comtradeConfigParse';
import { parseChannelMap } from '../../../app/capture/channelMap';
import { createComtradeDataReader } from '../../../app/formats/comtradeDataReader';
import { inputErrorOf as errorOf } from '../../helpers/inputError';
import { fixtureBytes, fixtureText } from './fixtureBytes';
import { readInPieces } from './readAll';

/** Equal as numbers, NaN equal to NaN; `digits` decimals because a*x+b in doubles is not exact (0.01 * 1200 = 12.000000000000002). */
function expectVolts(actual: number[], expected: number[], digits = 9): void {
  expect(actual).toHaveLength(expected.length);
  actual.forEach((value, index) => {
    if (Number.isNaN(expected[index])) expect(value).toBeNaN();
    else expect(value).toBeCloseTo(expected[index], digits);
  });
}

function readFixture(base: string, options: Parameters<typeof createComtradeDataReader>[1] = {}, cuts: number[] = []) {
  const config = parseComtradeConfig(fixtureText(`${base}.cfg`), `${base}.cfg`);
  return readInPieces(createComtradeDataReader(config, { source: `${base}.dat`, ...options }), fixtureBytes(`${base}.dat`), cuts);
}

describe('createComtradeDataReader: our fixtures, volts worked out by hand (value = a * x + b, IEEE C37.111)', () => {
  it('ASCII 1999: scaling, mV unit, missing marker 99999, digital gate', () => {
    const capture = readFixture('unit-rw0142-ascii-1999');
    // sync: a = 0.01 V: 1200 -> 12, -300 -> -3, 99999 -> missing, 0 -> 0, -1200 -> -12.
    expectVolts(capture.sync, [12, -3, NaN, 0, -12]);
    // ramp: a = 0.5, b = 100 in mV: 400 -> 300 mV, 9800 -> 5000 mV, 19800 -> 10000 mV, -200 -> 0, 29800 -> 15000 mV.
    expectVolts(capture.ramp, [0.3, 5, 10, 0, 15]);
    // control: a = 0.002, b = -1: 2500 -> 4.0, 2600 -> 4.2, ... 2900 -> 4.8.
    expectVolts(capture.control ?? [], [4, 4.2, 4.4, 4.6, 4.8]);
    // gate is digital channel 1: 0 1 1 0 0.
    expect(capture.gate).toEqual([0, 1, 1, 0, 0]);
    expect(capture.blocks[0].sampleRateHz).toBe(10000);
    expect(capture.blocks[0].startS).toBe(0);
  });

  it('BINARY 2013: int16, PS = P with a 200:10 ratio, an unused channel, 0x8000 missing', () => {
    const capture = readFixture('unit-rw0142-binary-2013');
    // sync: a = 0.1 gives primary volts; test point = primary x 10 / 200, so 0.005 V per count:
    // 2000 -> 10, -2000 -> -10, 1000 -> 5, 0x8000 -> missing.
    expectVolts(capture.sync, [10, -10, 5, NaN]);
    // ramp: a = 0.001, b = 5: 0 -> 5, 1500 -> 6.5, 3000 -> 8, -5000 -> 0.
    expectVolts(capture.ramp, [5, 6.5, 8, 0]);
    // gate: a = 0.0005: 0 -> 0, 24000 -> 12.
    expectVolts(capture.gate, [0, 12, 12, 0]);
    expect(capture.control).toBeNull();
    expect(capture.blocks[0].sampleRateHz).toBe(5000);
  });

  it('BINARY32 1999: int32, channel map by id, the gate as digital 17 (second word, bit 0)', () => {
    const capture = readFixture('unit-rw0207-binary32-1999', { channelMap: parseChannelMap('sync=tp1,ramp=TP2,gate=tp3') });
    // sync: a = 1e-5: 1e6 -> 10, -1e6 -> -10, 2147483647 -> 21474.83647, 0x80000000 -> missing.
    expectVolts(capture.sync, [10, -10, 21474.83647, NaN], 6);
    // ramp: a = 2e-6, b = 2: -2e6 -> -2, 0 -> 2, 4e6 -> 10, 6e6 -> 14.
    expectVolts(capture.ramp, [-2, 2, 10, 14]);
    // Second words 0x0000, 0x0001, 0x0003, 0x0002: bit 0 gives 0 1 1 0 (the first word's bit 0 is digital 1, not the gate).
    expect(capture.gate).toEqual([0, 1, 1, 0]);
    expect(capture.blocks[0].sampleRateHz).toBe(20000);
  });

  it('FLOAT32 2013 with nrates 0: times from timestamps x timemult, a gap, a NaN sample', () => {
    const capture = readFixture('unit-rw0311-float32-2013');
    expect(capture.blocks).toHaveLength(2);
    const [first, second] = capture.blocks;
    // Ticks 0, 40, 80 x 0.5 us = 0, 20, 40 us: 50 kS/s. Then 100 us: 3 periods after 40 us, more than 1.5: a gap.
    expect(first.startS).toBe(0);
    expect(first.sampleRateHz).toBeCloseTo(50000, 6);
    expect(first.afterGap).toBe(false);
    expect(second.afterGap).toBe(true);
    expect(second.startS).toBeCloseTo(100e-6, 15);
    // Ticks 200, 240: 20 us apart, 50 kS/s again.
    expect(second.sampleRateHz).toBeCloseTo(50000, 6);
    // Floats chosen exact in float32; ramp a = 2, b = 0.5: 1 -> 2.5, 1.5 -> 3.5, 2 -> 4.5, 2.25 -> 5, 2.5 -> 5.5.
    expectVolts(capture.sync, [0.5, -1.25, 3.75, NaN, -0.125], 15);
    expectVolts(capture.ramp, [2.5, 3.5, 4.5, 5, 5.5], 15);
    expect(capture.gate).toEqual([0, 0, 12, 12, 0]);
    expect(capture.control).toEqual([2.5, 2.5, 2.5, 2.75, 2.75]);
  });

  it('gives the same samples however the .dat is cut into chunks', () => {
    for (const [base, options] of [
      ['unit-rw0142-ascii-1999', {}],
      ['unit-rw0142-binary-2013', {}],
      ['unit-rw0207-binary32-1999', { channelMap: parseChannelMap('sync=TP1,ramp=TP2,gate=TP3') }],
      ['unit-rw0311-float32-2013', {}],
    ] as const) {
      const whole = readFixture(base, { ...options, blockSamples: 2 });
      const size = fixtureBytes(`${base}.dat`).length;
      fc.assert(
        fc.property(fc.array(fc.integer({ min: 0, max: size }), { maxLength: 10 }), (cuts) => {
          const pieces = readFixture(base, { ...options, blockSamples: 2 }, cuts);
          expect(pieces.sync).toEqual(whole.sync);
          expect(pieces.gate).toEqual(whole.gate);
          expect(pieces.timeS).toEqual(whole.timeS);
          expect(pieces.blocks.map((block) => block.afterGap)).toEqual(whole.blocks.map((block) => block.afterGap));
        }),
        { numRuns: 100 },
      );
    }
  });
});

describe('createComtradeDataReader: clear errors', () => {
  it('lists the channels there are when a role has none', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0207-binary32-1999.cfg'));
    const error = errorOf(() => createComtradeDataReader(config, { source: 'unit-rw0207.dat' }));
    expect(error.message).toContain('no channel for sync, ramp, gate');
    expect(error.message).toContain('the record has analog 1 "TP1", analog 2 "TP2", digital 1 "D01"');
    expect(error.message).toContain('(20 in all): name the channel for each role with --map, e.g. --map sync=TP1,ramp=TP2,');
    const mapped = errorOf(() => createComtradeDataReader(config, { channelMap: parseChannelMap('sync=TP1,ramp=TP9,gate=TP3') }));
    expect(mapped.message).toContain('no channel "TP9" for ramp (--map ramp=TP9)');
  });

  it('names a record cut short by its number and size', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0142-binary-2013.cfg'));
    const reader = createComtradeDataReader(config, { source: 'short.dat' });
    reader.push(fixtureBytes('unit-rw0142-binary-2013.dat').subarray(0, 40));
    expect(errorOf(() => reader.finish()).message).toBe(
      'short.dat: the data ends inside record 3: 8 of its 16 bytes (4 analog, 0 digital, BINARY); is the .cfg the one for this .dat?',
    );
  });

  it('names a ragged ASCII row, a non-number, a bad digital state', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0142-ascii-1999.cfg'));
    const read = (text: string) => {
      const reader = createComtradeDataReader(config, { source: 'a.dat' });
      reader.push(text);
      return reader.finish();
    };
    expect(errorOf(() => read('1,0,1,2,3,0\n2,100,1,2,3\n')).message).toContain('a.dat, line 2: the row has 5 fields; n, timestamp, 3 analog and 1 digital make 6');
    expect(errorOf(() => read('1,0,1,2x,3,0\n')).message).toContain('line 1: channel RAMP (ramp) holds "2x", which is not a number');
    expect(errorOf(() => read('1,0,1,2,3,7\n')).message).toContain('digital channel gate (gate) holds "7", expected 0 or 1');
    expect(errorOf(() => read('\n\n')).message).toContain('holds no samples');
  });

  it('needs timestamps when there is no sample rate', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0311-float32-2013.cfg'));
    const reader = createComtradeDataReader(config, { source: 'f.dat' });
    const record = new Uint8Array(24);
    new DataView(record.buffer).setUint32(4, 0xffffffff, true);
    expect(errorOf(() => reader.push(record)).message).toContain('f.dat, record 1: the timestamp is missing and the configuration gives no sample rate');
  });

  it('refuses a rate line of 0 among others, and endsamp that goes back', () => {
    const text = fixtureText('unit-rw0142-ascii-1999.cfg');
    const mixed = text.replace('1\r\n10000,5', '2\r\n10000,2\r\n0,5');
    expect(errorOf(() => createComtradeDataReader(parseComtradeConfig(mixed))).message).toContain('mixes sample rates with samp = 0 (10000 Hz, 0 Hz)');
    const backwards = text.replace('1\r\n10000,5', '2\r\n10000,4\r\n5000,3');
    expect(errorOf(() => createComtradeDataReader(parseComtradeConfig(backwards))).message).toContain('endsamp of rate 2 (3) is not after that of rate 1 (4)');
  });

  it('refuses text chunks for binary data', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0142-binary-2013.cfg'));
    expect(errorOf(() => createComtradeDataReader(config).push('1,2,3')).message).toContain('BINARY data is binary');
  });
});
