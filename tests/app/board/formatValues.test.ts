import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatFarad, formatOhm, formatPartValue } from '../../../app/board/formatValues';
import { parseQuantity } from '../../../app/board/parseQuantity';

describe('part values in the IEC 60062 letter-and-digit code (REFERENCES.md)', () => {
  it('writes the examples of the standard as printed on drawings', () => {
    // REFERENCES.md: 8k2 = 8.2 kohm, 330n = 330 nF, 4R7 = 4.7 ohm.
    expect(formatOhm(8200)).toBe('8k2');
    expect(formatFarad(330e-9)).toBe('330n');
    expect(formatOhm(4.7)).toBe('4R7');
    expect(formatOhm(470)).toBe('470R');
    expect(formatOhm(0.47)).toBe('R47');
    expect(formatOhm(10_000)).toBe('10k');
    expect(formatOhm(1_500_000)).toBe('1M5');
    expect(formatOhm(6650)).toBe('6k65');
    expect(formatFarad(4.7e-6)).toBe('4u7');
    expect(formatFarad(220e-12)).toBe('220p');
    expect(formatFarad(1e-6)).toBe('1u0');
    expect(formatOhm(3000)).toBe('3k0');
    expect(formatOhm(1e6)).toBe('1M0');
    expect(formatOhm(5)).toBe('5R0');
    expect(formatPartValue('cRamp', 3.9e-7)).toBe('390n');
    expect(formatPartValue('rEmitter', 6800)).toBe('6k8');
  });

  it('rounding that carries moves to the next letter: 999.7 ohm at three digits is 1k0, not 1000R', () => {
    expect(formatOhm(999.7)).toBe('1k0');
    expect(formatFarad(999.8e-9)).toBe('1u0');
  });

  it('more digits on request (the Board screen keeps what was typed)', () => {
    expect(formatOhm(12_345, 6)).toBe('12k345');
    expect(formatOhm(12_345)).toBe('12k3');
  });

  it('property: the code reads back (parseQuantity) to the value within its three significant digits', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 9.9e8, noNaN: true }), fc.double({ min: 1e-12, max: 9e-4, noNaN: true }), (ohm, farad) => {
        expect(Math.abs(parseQuantity(formatOhm(ohm)) / ohm - 1)).toBeLessThan(5.01e-3);
        expect(Math.abs(parseQuantity(formatFarad(farad)) / farad - 1)).toBeLessThan(5.01e-3);
        expect(formatOhm(ohm)).toMatch(/^\d*[RkMG]\d*$/);
        expect(formatFarad(farad)).toMatch(/^\d*[pnum]\d*$/);
      }),
      { numRuns: 300 },
    );
  });
});
