import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseQuantity } from '../../../app/board/parseQuantity';

describe('parseQuantity (part values as written on parts, common practice)', () => {
  it('reads plain numbers, SI prefixes and the prefix-as-decimal-point form', () => {
    expect(parseQuantity('15')).toBe(15);
    expect(parseQuantity('4.7e-7')).toBe(4.7e-7);
    expect(parseQuantity('470n')).toBeCloseTo(4.7e-7, 20);
    expect(parseQuantity('0.47u')).toBeCloseTo(4.7e-7, 20);
    expect(parseQuantity('4k7')).toBe(4700);
    expect(parseQuantity('7.5k')).toBe(7500);
    expect(parseQuantity('2M2')).toBe(2.2e6);
    expect(parseQuantity('200uA')).toBeCloseTo(2e-4, 15);
    expect(parseQuantity('10kohm')).toBe(10000);
    // IEC 60062 letter-and-digit code for ohms (REFERENCES.md): R stands for the decimal point of a value in ohm.
    expect(parseQuantity('4R7')).toBeCloseTo(4.7, 12);
    expect(parseQuantity('470R')).toBe(470);
    expect(parseQuantity('R47')).toBeCloseTo(0.47, 12);
  });

  it('gives NaN for anything else', () => {
    for (const text of ['', 'k', '4.7k7', '47x', '1..2', 'n5n', '--3']) expect(parseQuantity(text), text).toBeNaN();
  });

  it('property: never throws, and a plain number reads back as itself', () => {
    fc.assert(
      fc.property(fc.string(), (text) => {
        const value = parseQuantity(text);
        expect(typeof value).toBe('number');
      }),
      { numRuns: 500 },
    );
    fc.assert(
      fc.property(fc.double({ min: -1e12, max: 1e12, noNaN: true }), (value) => {
        // String(-0) is "0": compare with == semantics for zero.
        expect(parseQuantity(String(value)) === value).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});
