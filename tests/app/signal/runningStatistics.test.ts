import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { medianOf, RunningStatistics, StreamingMedian } from '../../../app/signal/runningStatistics';

describe('RunningStatistics (Welford)', () => {
  it('matches the two-pass mean and sample standard deviation (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 2, maxLength: 80 }), (values) => {
        const statistics = new RunningStatistics();
        for (const value of values) statistics.add(value);
        const mean = values.reduce((sum, value) => sum + value, 0) / values.length;
        const variance = values.reduce((sum, value) => sum + (value - mean) ** 2, 0) / (values.length - 1);
        expect(statistics.mean).toBeCloseTo(mean, 3);
        expect(Math.abs((statistics.standardDeviation ?? 0) - Math.sqrt(variance))).toBeLessThan(1e-6 * (Math.sqrt(variance) + 1));
        // Compared as numbers: the sign of a zero is no reading (-0 + 0 is +0; a counterexample was [-0, 0]).
        expect(statistics.minimum! + 0).toBe(Math.min(...values) + 0);
        expect(statistics.maximum! + 0).toBe(Math.max(...values) + 0);
      }),
    );
  });

  it('keeps precision with a large common offset (where a sum of squares fails)', () => {
    const statistics = new RunningStatistics();
    for (const value of [1e9 + 4, 1e9 + 7, 1e9 + 13, 1e9 + 16]) statistics.add(value);
    // Knuth's example family: variance of 4, 7, 13, 16 is 30 (n - 1).
    expect(statistics.standardDeviation).toBeCloseTo(Math.sqrt(30), 9);
  });
});

describe('medians', () => {
  it('median of odd and even counts', () => {
    expect(medianOf([3, 1, 2])).toBe(2);
    expect(medianOf([4, 1, 3, 2])).toBe(2.5);
    expect(medianOf([])).toBeNull();
  });

  it('the streaming median is exact up to its block size and close beyond it', () => {
    const exact = new StreamingMedian({ blockSize: 101 });
    const values = Array.from({ length: 101 }, (_, i) => (i * 37) % 101);
    for (const value of values.slice(0, 100)) exact.add(value);
    expect(exact.median).toBe(medianOf(values.slice(0, 100)));
    const blocked = new StreamingMedian({ blockSize: 50 });
    for (let i = 0; i < 5000; i++) blocked.add((i * 7919) % 1000);
    // Uniform 0..999: the true median is 499.5; block medians of 50 values scatter by a few counts.
    expect(Math.abs((blocked.median ?? 0) - 499.5)).toBeLessThan(30);
  });
});
