/**
 * CSV as instruments and spreadsheets write it (files of our own, in the forms such files take): header blocks,
 * units in the names or on a line of their own, time in s, ms or us, a sample interval instead of a time column,
 * semicolons, tabs, the decimal comma, byte order marks, CRLF, trailing empty columns, quoted fields. Every value
 * expected is worked out by hand from the text.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseChannelMap } from '../../../app/capture/channelMap';
import { createCsvReader, type CsvReaderOptions } from '../../../app/formats/csvReader';
import { inputErrorOf as errorOf } from '../../helpers/inputError';
import { readInPieces } from './readAll';

const bytesOf = (text: string) => new TextEncoder().encode(text);
const map = (text: string) => parseChannelMap(text);

function read(text: string, options: CsvReaderOptions = {}) {
  const reader = createCsvReader({ source: 'bench.csv', ...options });
  const capture = readInPieces(reader, bytesOf(text));
  return { ...capture, readAs: reader.readAs() };
}

describe('CSV dialects: what is sniffed, and said', () => {
  it('a header block with a sample interval and no time column: times k x interval', () => {
    const text = ['Model,bench recorder (our scenario)', 'Sample Interval,2.000000E-05', 'Record Length,3', 'CH1,CH2,CH3', '0.5,1,0', '0.25,2,0', '-0.5,3,12', ''].join('\n');
    const capture = read(text, { channelMap: map('sync=CH1,ramp=CH2,gate=CH3') });
    // 2e-5 s a sample: 50 kS/s, times 0, 20, 40 us.
    expect(capture.blocks[0].sampleRateHz).toBe(50000);
    expect(capture.timeS).toEqual([0, 1 / 50000, 2 / 50000]);
    expect(capture.sync).toEqual([0.5, 0.25, -0.5]);
    expect(capture.gate).toEqual([0, 0, 12]);
    expect(capture.readAs).toBe('read 3 columns (names on line 4), no time column, sample interval 0.00002 s (50 kS/s) from line 2, sync=CH1, ramp=CH2, gate=CH3');
  });

  it('units in the names: time in us, a channel in mV, brackets and parentheses', () => {
    const capture = read('Time [us],sync [mV],ramp (V),gate\n0,500,1,0\n50,-250,1.5,12\n100,0,2,12\n');
    // 50 us steps: 20 kS/s; 500 mV = 0.5 V.
    expect(capture.blocks[0].sampleRateHz).toBeCloseTo(20000, 6);
    expect(capture.timeS[2]).toBeCloseTo(100e-6, 15);
    expect(capture.sync).toEqual([0.5, -0.25, 0]);
    expect(capture.readAs).toContain('time in us from the header (Time [us])');
  });

  it('names on one line, units on the next; the quantity / unit form', () => {
    const twoLines = read('Time,CH1,CH2,CH3\n(ms),(V),(mV),(V)\n0,1,200,0\n0.1,2,400,12\n', { channelMap: map('sync=CH1,ramp=CH2,gate=CH3') });
    expect(twoLines.blocks[0].sampleRateHz).toBeCloseTo(10000, 6);
    expect(twoLines.ramp).toEqual([0.2, 0.4]);
    expect(twoLines.readAs).toContain('names on line 1, units on line 2');
    const slashed = read('t / ms,sync / V,ramp / V,gate / V\n0,1,2,3\n0.05,1,2,3\n');
    expect(slashed.blocks[0].sampleRateHz).toBeCloseTo(20000, 6);
  });

  it('semicolons with a decimal comma, a byte order mark, CRLF, trailing empty columns and an empty row', () => {
    const text = '\uFEFFZeit;CH1;CH2;CH3;;\r\nms;V;V;V;;\r\n0,00;1,5;0,25;0;;\r\n;;;;;\r\n0,05;-1,5;0,5;12;;\r\n0,10;2,25e-1;0,75;12;\r\n';
    const capture = read(text, { channelMap: map('time=Zeit,sync=CH1,ramp=CH2,gate=CH3') });
    expect(capture.sync).toEqual([1.5, -1.5, 0.225]);
    expect(capture.ramp).toEqual([0.25, 0.5, 0.75]);
    // 0.05 ms steps: 20 kS/s.
    expect(capture.blocks[0].sampleRateHz).toBeCloseTo(20000, 6);
    expect(capture.readAs).toContain('separator semicolon, decimal comma, time in ms from the header (Zeit)');
  });

  it('tabs with a decimal comma, and quoted names and values with commas', () => {
    const tabbed = read('t\tsync\tramp\tgate\n0\t0,5\t1\t0\n0,001\t-0,5\t2\t12\n');
    expect(tabbed.sync).toEqual([0.5, -0.5]);
    expect(tabbed.readAs).toContain('separator tab, decimal comma');
    const quoted = read('"Time (s)","Sync, TP1","Ramp, TP4","Gate","Note"\n"0.000","1.5","2","0","start, cold"\n"0.001"," 2.5 ","3","12",""\n', {
      channelMap: map('sync="Sync, TP1",ramp="Ramp, TP4",gate=Gate'),
    });
    expect(quoted.sync).toEqual([1.5, 2.5]);
    expect(quoted.blocks[0].sampleRateHz).toBeCloseTo(1000, 6);
  });

  it('a time column without a unit: seconds when only seconds give a usable rate', () => {
    const capture = read('time,sync,ramp,gate\n0,1,2,3\n0.0001,1,2,3\n0.0002,1,2,3\n');
    expect(capture.blocks[0].sampleRateHz).toBeCloseTo(10000, 6);
    expect(capture.readAs).toContain('time in s (time)');
  });

  it('gives the same samples however an instrument file is cut into chunks', () => {
    const text = '\uFEFFRecorder;x\r\nSample interval;0,0001\r\nCH1;CH2;CH3\r\n' + Array.from({ length: 40 }, (_, index) => `${index},5;${index / 4};${index % 7 === 0 ? 12 : 0}`.replace(/\./g, ',')).join('\r\n');
    const bytes = bytesOf(text);
    const options = { channelMap: map('sync=CH1,ramp=CH2,gate=CH3'), blockSamples: 7 };
    const whole = readInPieces(createCsvReader(options), bytes);
    expect(whole.sync).toHaveLength(40);
    expect(whole.ramp[9]).toBe(2.25);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: bytes.length }), { maxLength: 10 }), (cuts) => {
        const pieces = readInPieces(createCsvReader(options), bytes, cuts);
        expect(pieces.sync).toEqual(whole.sync);
        expect(pieces.ramp).toEqual(whole.ramp);
        expect(pieces.timeS).toEqual(whole.timeS);
      }),
      { numRuns: 200 },
    );
  });
});

describe('CSV dialects: two readings are refused with the file, the line and the option', () => {
  it('a time column without a unit whose steps read as ms', () => {
    const text = 'Time,CH1,CH2,CH3\n0,1,2,3\n0.02,1,2,3\n0.04,1,2,3\n';
    const message = errorOf(() => read(text, { channelMap: map('sync=CH1,ramp=CH2,gate=CH3') })).message;
    expect(message).toBe('bench.csv, line 1: the time column "Time" has no unit, and its steps of 0.02 give in s 50 S/s, in ms 50 kS/s: say which with --time-unit s|ms|us');
    const settled = read(text, { channelMap: map('sync=CH1,ramp=CH2,gate=CH3'), timeUnit: 'ms' });
    expect(settled.blocks[0].sampleRateHz).toBeCloseTo(50000, 6);
    expect(settled.readAs).toContain('time in ms (--time-unit)');
  });

  it('no time column and no sample interval', () => {
    expect(errorOf(() => read('CH1,CH2,CH3\n1,2,3\n', { channelMap: map('sync=CH1,ramp=CH2,gate=CH3') })).message).toBe(
      'bench.csv, line 1: there is no time column (t, time or timestamp) and no sample interval in the lines above the rows: give the sample rate with --rate <Hz>, or name the time column with --map time=<column>',
    );
    const settled = read('CH1,CH2,CH3\n1,2,3\n4,5,6\n', { channelMap: map('sync=CH1,ramp=CH2,gate=CH3'), sampleRateHz: 25000 });
    expect(settled.timeS).toEqual([0, 1 / 25000]);
  });

  it('a decimal comma the first 256 KiB did not show', () => {
    // 30000 rows of whole numbers (over 256 KiB, the sniffed start), then one with a decimal comma.
    const rows = Array.from({ length: 30000 }, (_, index) => `${index};1;2;3`);
    const text = `t;sync;ramp;gate\n${rows.join('\n')}\n30000;1,5;2;3\n`;
    const message = errorOf(() => read(text)).message;
    expect(message).toBe('bench.csv, line 30002: column sync holds "1,5", which is not a number (if the file writes a decimal comma, give --decimal comma)');
    expect(read(text, { decimal: 'comma' }).sync[30000]).toBe(1.5);
  });

  it('a text line that breaks the rows', () => {
    const text = 't,sync,ramp,gate\n0,1,2,3\n0.001,1,2,3\n--- trigger ---\n0.002,1,2,3\n0.003,1,2,3\n0.004,1,2,3\n';
    expect(errorOf(() => read(text)).message).toBe(
      'bench.csv, line 4: line 4 breaks the rows of numbers (rows above it from line 2) (line 4: "--- trigger ---"): remove it, or say where the column names are with --header-line',
    );
  });

  it('the column names on a stated line', () => {
    const text = 'Test 14;sync;ramp;gate\nt;sync;ramp;gate\n0;1;2;3\n1e-4;4;5;6\n';
    expect(read(text, { headerLine: 2 }).gate).toEqual([3, 6]);
    const unnamed = read('0;1;2;3\n1e-4;4;5;6\n', { headerLine: 0, channelMap: map('time=1,sync=2,ramp=3,gate=4') });
    expect(unnamed.ramp).toEqual([2, 5]);
  });

  it('a mapped column whose cells are text', () => {
    const message = errorOf(() => read('t,sync,ramp,gate,note\n0,1,2,3,a\n0.1,1,2,3,b\n', { channelMap: map('sync=note,ramp=ramp,gate=gate') })).message;
    expect(message).toBe('bench.csv, line 2: column note holds "a", which is not a number');
  });
});
