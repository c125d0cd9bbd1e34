import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createComtradeCffReader } from '../../../app/formats/comtradeCffReader';
import { inputErrorOf as errorOf } from '../../helpers/inputError';
import { fixtureBytes } from './fixtureBytes';
import { readInPieces } from './readAll';

const read = (text: string) => readInPieces(createComtradeCffReader({ source: 'x.cff' }), new TextEncoder().encode(text));

describe('createComtradeCffReader (single-file COMTRADE, 2013)', () => {
  it('reads the ASCII single file to the same volts as its .cfg/.dat pair', () => {
    const capture = readInPieces(createComtradeCffReader(), fixtureBytes('unit-rw0142-ascii-2013.cff'));
    // Hand-worked in comtradeDataReader.test.ts: sync a = 0.01 V, ramp (0.5 x + 100) mV, gate digital.
    expect(capture.sync.map((value) => (Number.isNaN(value) ? null : Number(value.toFixed(9))))).toEqual([12, -3, null, 0, -12]);
    expect(capture.ramp.map((value) => Number(value.toFixed(9)))).toEqual([0.3, 5, 10, 0, 15]);
    expect(capture.gate).toEqual([0, 1, 1, 0, 0]);
  });

  it('reads the BINARY single file by its byte count, however it is cut', () => {
    const bytes = fixtureBytes('unit-rw0142-binary-2013.cff');
    const whole = readInPieces(createComtradeCffReader(), bytes);
    // sync 0.005 V per count (PS = P, 200:10): 2000 -> 10, -2000 -> -10, 1000 -> 5, missing.
    expect(whole.sync.map((value) => (Number.isNaN(value) ? null : Number(value.toFixed(9))))).toEqual([10, -10, 5, null]);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: bytes.length }), { maxLength: 8 }), (cuts) => {
        const pieces = readInPieces(createComtradeCffReader({ blockSamples: 3 }), bytes, cuts);
        expect(pieces.sync).toEqual(whole.sync);
        expect(pieces.gate).toEqual(whole.gate);
      }),
      { numRuns: 200 },
    );
  });

  it('names what is wrong with the sections', () => {
    expect(errorOf(() => read('hello\n')).message).toContain('x.cff, line 1: a single-file COMTRADE record starts with "--- file type: CFG ---"');
    expect(errorOf(() => read('--- file type: CFG ---\n')).message).toContain('no DAT section');
    expect(errorOf(() => read('--- file type: DAT ASCII ---\n1,0,1\n')).message).toContain('DAT section comes before any CFG section');
    const binary = new TextDecoder('latin1').decode(fixtureBytes('unit-rw0142-binary-2013.cff'));
    expect(errorOf(() => read(binary.replace('DAT BINARY: 64', 'DAT BINARY'))).message).toContain('lacks its byte count');
    expect(errorOf(() => read(binary.replace('DAT BINARY: 64', 'DAT ASCII'))).message).toContain('the DAT section says ASCII but the CFG section says BINARY');
    const short = fixtureBytes('unit-rw0142-binary-2013.cff');
    expect(errorOf(() => readInPieces(createComtradeCffReader({ source: 'x.cff' }), short.subarray(0, short.length - 10))).message).toContain('10 bytes short');
  });
});
