import { describe, expect, it } from 'vitest';
import { intervalOfHeaderLine } from '../../../app/formats/csvHeaderBlock';

describe('intervalOfHeaderLine: the sampling an instrument states above its columns', () => {
  it('reads intervals and rates in their usual words and units (values worked out by hand)', () => {
    expect(intervalOfHeaderLine('Sample Interval,2.000000E-05', '.')).toBe(2e-5);
    expect(intervalOfHeaderLine('Sampling period: 20 us', '.')).toBeCloseTo(20e-6, 18);
    expect(intervalOfHeaderLine('Sample interval;0,00004;s', ',')).toBeCloseTo(40e-6, 18);
    // 50 kS/s is 20 us a sample; 2 MS/s is 0.5 us; 25000 Hz is 40 us.
    expect(intervalOfHeaderLine('Sample rate;50 kS/s', '.')).toBeCloseTo(20e-6, 18);
    expect(intervalOfHeaderLine('Sampling frequency = 2 MS/s', '.')).toBeCloseTo(0.5e-6, 18);
    expect(intervalOfHeaderLine('Sample Rate,25000,Hz', '.')).toBeCloseTo(40e-6, 18);
  });

  it('leaves lines that state no sampling, or an unknown unit', () => {
    expect(intervalOfHeaderLine('Record Length,100000', '.')).toBeNull();
    expect(intervalOfHeaderLine('Model,bench recorder', '.')).toBeNull();
    expect(intervalOfHeaderLine('Sample interval,20,parsecs', '.')).toBeNull();
    expect(intervalOfHeaderLine('Sample interval,-1', '.')).toBeNull();
  });
});
