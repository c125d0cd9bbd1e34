import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createCsvReader } from '../../../app/formats/csvReader';
import { inputErrorOf as errorOf } from '../../helpers/inputError';
import { fixtureBytes } from './fixtureBytes';
import { readInPieces } from './readAll';

const bytesOf = (text: string) => new TextEncoder().encode(text);

function readText(text: string, options: Parameters<typeof createCsvReader>[0] = {}) {
  return readInPieces(createCsvReader(options), bytesOf(text));
}

describe('createCsvReader: our fixtures, values worked out by hand', () => {
  it('reads unit-rw0142.csv: six rows 50 us apart, so 20 kS/s', () => {
    const capture = readInPieces(createCsvReader({ source: 'unit-rw0142.csv' }), fixtureBytes('unit-rw0142.csv'));
    expect(capture.blocks).toHaveLength(1);
    const [block] = capture.blocks;
    // Rate = (6 - 1) rows / (0.00025 s - 0 s) = 20000 Hz; tolerance: the printed times are exact to double rounding.
    expect(block.sampleRateHz).toBeCloseTo(20000, 6);
    expect(block.startS).toBe(0);
    expect(capture.sync).toEqual([0, 1, 2, 3, 4, 5]);
    expect(capture.ramp).toEqual([0.4, 0.5, 0.6, 0.7, 0.8, 0.9]);
    expect(capture.gate).toEqual([0, 0, 0, 12, 12, 0]);
    expect(capture.control).toEqual([4.5, 4.5, 4.5, 4.5, 4.5, 4.5]);
    expect(block.afterGap).toBe(false);
  });

  it('reads unit-rw0142-messy.csv: BOM, CRLF, odd header, extra column, blank line, jitter, a gap', () => {
    const capture = readInPieces(createCsvReader(), fixtureBytes('unit-rw0142-messy.csv'));
    expect(capture.blocks).toHaveLength(2);
    const [first, second] = capture.blocks;
    // First stretch: t = 0, 101, 199, 300 us; rate = 3 intervals / 300 us = 10 kHz despite the +-1 us jitter.
    expect(first.sampleRateHz).toBeCloseTo(10000, 6);
    expect(first.afterGap).toBe(false);
    expect([...first.sync]).toEqual([0, 1, 2, 3]);
    expect([...first.ramp]).toEqual([0.4, 0.5, 0.6, 0.7]);
    expect([...first.gate]).toEqual([0, 0, 12, 12]);
    expect(first.control).toBeNull();
    // 300 us -> 800 us is 5 periods (> 1.5): a gap. Second stretch 800, 900 us: 10 kHz again.
    expect(second.afterGap).toBe(true);
    expect(second.startS).toBeCloseTo(0.0008, 12);
    expect(second.sampleRateHz).toBeCloseTo(10000, 6);
    expect([...second.sync]).toEqual([5, 6]);
  });
});

describe('createCsvReader: forms and timing', () => {
  it('takes the form without t when given the rate, times k / rate', () => {
    const capture = readText('sync,ramp,gate\n1,2,3\n4,5,6\n7,8,9\n', { sampleRateHz: 1000, blockSamples: 2 });
    expect(capture.blocks.map((block) => block.startS)).toEqual([0, 0.002]);
    expect(capture.blocks.every((block) => block.sampleRateHz === 1000)).toBe(true);
    expect(capture.gate).toEqual([3, 6, 9]);
  });

  it('cuts blocks at the requested size and keeps the rate measured over the whole stretch', () => {
    const rows = Array.from({ length: 10 }, (_, index) => `${(index * 0.001).toFixed(3)},${index},0,0`).join('\n');
    const capture = readText(`t,sync,ramp,gate\n${rows}\n`, { blockSamples: 4 });
    expect(capture.blocks.map((block) => block.sync.length)).toEqual([4, 4, 2]);
    expect(capture.blocks.map((block) => block.startS)).toEqual([0, 0.004, 0.008]);
    for (const block of capture.blocks) expect(block.sampleRateHz).toBeCloseTo(1000, 6);
    expect(capture.sync).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
  });

  it('reads NaN as a missing sample', () => {
    const capture = readText('t,sync,ramp,gate\n0,1,NaN,3\n0.1,1,2,nan\n');
    expect(Number.isNaN(capture.ramp[0])).toBe(true);
    expect(Number.isNaN(capture.gate[1])).toBe(true);
  });

  it('gives the same samples however the file is cut into chunks, even inside a UTF-8 character', () => {
    const text = '\uFEFFt,sync,ramp,gate,note µ\r\n0,1.5,2,3,Ω\r\n0.001,-1e-3,2.25,3,€\r\n0.002,1,2,3,x\r\n0.005,4,5,6,y';
    const bytes = bytesOf(text);
    const whole = readInPieces(createCsvReader(), bytes);
    expect(whole.sync).toEqual([1.5, -0.001, 1, 4]);
    expect(whole.blocks.map((block) => block.afterGap)).toEqual([false, true]);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: bytes.length }), { maxLength: 12 }), (cuts) => {
        const pieces = readInPieces(createCsvReader(), bytes, cuts);
        expect(pieces.sync).toEqual(whole.sync);
        expect(pieces.timeS).toEqual(whole.timeS);
        expect(pieces.blocks.map((block) => block.afterGap)).toEqual([false, true]);
      }),
      { numRuns: 300 },
    );
  });

  it('takes string chunks, including a surrogate pair cut in two', () => {
    const text = 't,sync,ramp,gate,😀\n0,1,2,3,😀\n0.5,1,2,3,x\n';
    const reader = createCsvReader();
    const cut = text.indexOf('😀') + 1;
    const blocks = [...reader.push(text.slice(0, cut)), ...reader.push(text.slice(cut)), ...reader.finish()];
    expect(blocks[0].sampleRateHz).toBe(2);
  });
});

describe('createCsvReader: clear errors with line numbers', () => {
  it('names a ragged row', () => {
    const error = errorOf(() => readText('t,sync,ramp,gate\n0,1,2,3\n0.1,1,2\n'));
    expect(error.message).toContain('line 3');
    expect(error.message).toContain('3 fields but the header has 4');
  });

  it('names a non-number, its column and its text', () => {
    const error = errorOf(() => readText('t,sync,ramp,gate\n0,1,2,3\n0.1,1,2.x,3\n'));
    expect(error.message).toMatch(/line 3: column ramp holds "2\.x", which is not a number/);
  });

  it('names time that stands still or goes back', () => {
    expect(errorOf(() => readText('t,sync,ramp,gate\n0,1,2,3\n0.1,1,2,3\n0.1,1,2,3\n')).message).toMatch(/line 4: time does not increase .*too few decimals/);
    expect(errorOf(() => readText('t,sync,ramp,gate\n0,1,2,3\n0.1,1,2,3\n0.05,1,2,3\n')).message).toMatch(/line 4: time does not increase/);
  });

  it('names each missing required column and the option that maps one', () => {
    const error = errorOf(() => readText('t,Sync,control\n0,1,2\n'));
    expect(error.message).toContain('no channel for ramp, gate');
    expect(error.message).toContain('line 1');
    expect(error.message).toContain('--map');
  });

  it('reads semicolons and tabs as separators (instrument and spreadsheet dialects)', () => {
    expect(readText('t;sync;ramp;gate\n0;1;2;3\n0.5;4;5;6\n').gate).toEqual([3, 6]);
    expect(readText('t\tsync\tramp\tgate\n0\t1\t2\t3\n0.5\t4\t5\t6\n').ramp).toEqual([2, 5]);
  });

  it('refuses a name that fits two columns, naming both and the option', () => {
    const message = errorOf(() => readText('t,sync,ramp,gate,SYNC\n0,1,2,3,4\n')).message;
    expect(message).toContain('fits sync and SYNC');
    expect(message).toContain('--map');
  });

  it('says when the file is empty, blank, or has no samples', () => {
    expect(errorOf(() => readText('')).message).toContain('the file is empty');
    expect(errorOf(() => readText('\n  \r\n')).message).toContain('only blank lines');
    expect(errorOf(() => readText('t,sync,ramp,gate\r\n')).message).toContain('header but no samples');
  });

  it('says the rate is needed without a t column, and when one timed row cannot give it', () => {
    expect(errorOf(() => readText('sync,ramp,gate\n1,2,3\n')).message).toContain('no time column (t, time or timestamp) and no sample interval in the lines above the rows: give the sample rate with --rate');
    expect(errorOf(() => readText('t,sync,ramp,gate\n0,1,2,3\n')).message).toContain('cannot tell the sample rate');
    // With a rate given, a single timed row is readable.
    expect(readText('t,sync,ramp,gate\n0,1,2,3\n', { sampleRateHz: 500 }).blocks[0].sampleRateHz).toBe(500);
  });

  it('rejects a non-positive rate option', () => {
    expect(errorOf(() => createCsvReader({ sampleRateHz: 0 })).message).toContain('positive number of hertz');
  });
});
