import { describe, expect, it } from 'vitest';
import { formatFixed, formatReading, formatSi } from '../../../renderer/shaping/formatSi';

// Prefix symbols and powers from the SI Brochure (BIPM, 9th edition, table 7): p 1e-12, n 1e-9, µ 1e-6, m 1e-3, k 1e3, M 1e6, G 1e9.
describe('formatSi', () => {
  it.each([
    [7500, 'Ω', '7.5 kΩ'],
    [4.7e-7, 'F', '470 nF'],
    [0.00047, 'F', '470 µF'],
    [2.2e-11, 'F', '22 pF'],
    [6.0, 'V', '6 V'],
    [6.02, 'V', '6.02 V'],
    [0.0126, 'A', '12.6 mA'],
    [50, 'Hz', '50 Hz'],
    [50_000, 'Hz', '50 kHz'],
    [2.5e6, 'Hz', '2.5 MHz'],
    [-0.35, 'V', '-350 mV'],
    [0, 'V', '0 V'],
  ])('%d %s reads %s', (value, unit, expected) => {
    expect(formatSi(value, unit)).toBe(expected);
  });

  it('carries a rounding into the next prefix instead of printing 1000', () => {
    // 999.96 at 3 significant digits rounds to 1000, which is 1 k (SI Brochure: one prefix per value).
    expect(formatSi(999.96, 'V')).toBe('1 kV');
    expect(formatSi(0.00099996, 'A')).toBe('1 mA');
  });

  it('keeps the requested significant digits', () => {
    expect(formatSi(123456, 'Ω', { digits: 4 })).toBe('123.5 kΩ');
    expect(formatSi(1 / 3, 'V', { digits: 2 })).toBe('330 mV');
  });

  it('keeps trailing zeros when asked, for readings whose resolution matters', () => {
    expect(formatSi(50, 'Hz', { digits: 4, keepZeros: true })).toBe('50.00 Hz');
    expect(formatSi(59.996, 'Hz', { digits: 4, keepZeros: true })).toBe('60.00 Hz');
    expect(formatSi(7500, 'Ω', { digits: 3, keepZeros: true })).toBe('7.50 kΩ');
    expect(formatSi(1234, 'V', { digits: 2, keepZeros: true })).toBe('1.2 kV');
  });

  it('shows missing values as a dash rather than NaN', () => {
    expect(formatSi(null, 'V')).toBe('–');
    expect(formatSi(Number.NaN, 'V')).toBe('–');
    expect(formatSi(Number.POSITIVE_INFINITY, 'V', { missing: 'n/a' })).toBe('n/a');
  });
});

describe('formatFixed and formatReading', () => {
  it('writes degrees without a space and never shows minus zero', () => {
    expect(formatFixed(12.46, '°')).toBe('12.5°');
    expect(formatFixed(-0.01, '°')).toBe('0.0°');
    expect(formatFixed(2.14, '%')).toBe('2.1 %');
  });

  it('brings contract units back to base units before choosing a prefix', () => {
    expect(formatReading(200, 'us')).toBe('200 µs');
    expect(formatReading(1500, 'us')).toBe('1.5 ms');
    expect(formatReading(0, 'us')).toBe('0 µs');
    expect(formatReading(20, 'ms')).toBe('20 ms');
    expect(formatReading(91.25, 'deg')).toBe('91.3°');
    expect(formatReading(7500, 'ohm')).toBe('7k5');
    expect(formatReading(3, '')).toBe('3');
    expect(formatReading(1.234, 'V/ms')).toBe('1.23 V/ms');
    // Mains drift matters in hundredths of a hertz (common practice): four significant digits for Hz.
    expect(formatReading(50.023, 'Hz')).toBe('50.02 Hz');
    expect(formatReading(50, 'Hz')).toBe('50.00 Hz');
    // Degrees take no SI prefix (SI Brochure: the degree is a unit accepted for use with the SI, not an SI unit).
    expect(formatReading(0.606, 'deg/V')).toBe('0.61°/V');
    expect(formatReading(23.85, 'deg/V')).toBe('23.85°/V');
  });
});
