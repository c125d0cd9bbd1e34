import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isNotANumberText, parseAsciiNumber, scanAsciiNumber, scanState } from '../../../app/formats/asciiNumber';

const bytesOf = (text: string) => new TextEncoder().encode(text);
const parse = (text: string) => {
  const bytes = bytesOf(text);
  return parseAsciiNumber(bytes, 0, bytes.length);
};

describe('parseAsciiNumber', () => {
  // The outside reference is the JavaScript engine's own decimal conversion, Number(text), correctly rounded (ECMA-262).
  it('equals Number() for the shortest text of any finite double', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (value) => {
        expect(Object.is(parse(String(value)), Number(String(value)))).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });

  it('equals Number() for fixed-decimal text as loggers and our writer print it', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 12 }), (value, digits) => {
        const text = value.toFixed(digits);
        expect(parse(text)).toBe(Number(text));
      }),
      { numRuns: 3000 },
    );
  });

  it('equals Number() for 16 to 19 significant digits at any decimal point (the double-double path)', () => {
    const digits = fc.array(fc.integer({ min: 0, max: 9 }), { minLength: 16, maxLength: 19 });
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9 }), digits, fc.integer({ min: -8, max: 22 }), fc.boolean(), (first, rest, point, negative) => {
        const all = `${first}${rest.join('')}`;
        // The point anywhere from 8 zeros before the digits to past their end.
        const text = point <= 0 ? `0.${'0'.repeat(-point)}${all}` : point >= all.length ? `${all}${'0'.repeat(point - all.length)}` : `${all.slice(0, point)}.${all.slice(point)}`;
        const signed = negative ? `-${text}` : text;
        expect(Object.is(parse(signed), Number(signed))).toBe(true);
      }),
      { numRuns: 20000 },
    );
  });

  it('equals Number() for whole digit strings either side of 2^53, where the one-rounding path stops', () => {
    // 2^53 = 9007199254740992: below it the digits are exact in a double and one division rounds them.
    for (const digits of ['9007199254740991', '9007199254740992', '9007199254740993', '9007199254740999', '8999999999999999', '90071992547409915', '9007199254740990123']) {
      for (const point of [1, 3, 8, digits.length - 1]) {
        const text = `${digits.slice(0, point)}.${digits.slice(point)}`;
        expect(Object.is(parse(text), Number(text))).toBe(true);
        expect(Object.is(parse(`-${text}`), Number(`-${text}`))).toBe(true);
      }
    }
  });

  it('equals Number() at exact halfway points, where only the tie rule decides', () => {
    // Halfway between neighbouring doubles, each exact in 17 to 19 digits (hand-derived from 2^53 and 2^54):
    // 2^53 + 1, 2^53 + 3 (ties to even go down and up), 2^54 + 2, 2^54 + 6, and the same scaled by 10^-k.
    for (const text of ['9007199254740993', '9007199254740995', '18014398509481986', '18014398509481990', '900719925474099.3', '0.9007199254740993', '1801439850948198.6e2']) {
      expect(Object.is(parse(text), Number(text))).toBe(true);
    }
    // Just under a power of two the tie is at a quarter of the upper ulp: 2^53 - 0.5 is halfway to 2^53 - 1.
    for (const text of ['9007199254740991.5', '9007199254740991.49', '9007199254740991.51', '4503599627370495.75']) {
      expect(Object.is(parse(text), Number(text))).toBe(true);
    }
  });

  it('equals Number() for hand-picked forms: signs, exponents, leading dots, padding, long mantissas', () => {
    for (const text of ['0', '-0', '+7', '.5', '5.', '-.25e1', '1e-7', '1E+21', '123456789012345678', '0.000000000000000000000000012', ' 3.25 ', '\t-4\t', '9007199254740993', '1.7976931348623157e308', '4.9e-324']) {
      expect(Object.is(parse(text), Number(text.trim()))).toBe(true);
    }
  });

  it('rejects what is not a plain decimal number', () => {
    for (const text of ['', ' ', '-', '.', 'e5', '1e', '1e+', '1.2.3', '1,5', '0x10', 'Infinity', 'NaN', '1 2', '--1', '1-']) {
      expect(Number.isNaN(parse(text))).toBe(true);
    }
  });

  it('scanning stops at the first byte that cannot continue the number', () => {
    const bytes = bytesOf('12.5 ,x');
    expect(scanAsciiNumber(bytes, 0, bytes.length)).toBe(12.5);
    expect(scanState.stop).toBe(5);
  });

  it('accepts NaN in any letter case as the missing-sample marker', () => {
    for (const text of ['NaN', 'nan', ' NAN ']) expect(isNotANumberText(bytesOf(text), 0, text.length)).toBe(true);
    for (const text of ['NaNa', 'na', '']) expect(isNotANumberText(bytesOf(text), 0, text.length)).toBe(false);
  });
});
