import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { driftTrend } from '../../../main/store/driftTrend';
import { canonicalJson } from '../../../main/store/canonicalJson';

const dayMs = 86_400_000;

describe('drift trend', () => {
  it('recovers the slope of any exact straight line with zero standard error', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1, max: 1, noNaN: true }),
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.uniqueArray(fc.integer({ min: 0, max: 3650 }), { minLength: 3, maxLength: 20 }),
        (perDay, intercept, days) => {
          const origin = Math.min(...days);
          const trend = driftTrend(days.map((day) => ({ atMs: Date.UTC(2026, 0, 1) + day * dayMs, value: intercept + perDay * (day - origin) })));
          // Tolerance: double rounding of values up to ~3750 summed over 20 points (a few ulps, far below 1e-9).
          expect(trend?.perDay).toBeCloseTo(perDay, 9);
          expect(trend?.intercept).toBeCloseTo(intercept, 6);
          expect(trend?.perDayStandardError ?? 0).toBeLessThan(1e-8);
        },
      ),
    );
  });

  it('skips sessions without the figure and needs two distinct instants', () => {
    expect(driftTrend([{ atMs: 0, value: 1 }, { atMs: dayMs, value: null }])).toBeNull();
    expect(driftTrend([{ atMs: dayMs, value: 1 }, { atMs: dayMs, value: 2 }])).toBeNull();
    // Two points: a slope, but no standard error (n - 2 = 0 degrees of freedom).
    expect(driftTrend([{ atMs: 0, value: 1 }, { atMs: 2 * dayMs, value: 2 }, { atMs: dayMs, value: null }])).toEqual({ perDay: 0.5, perDayStandardError: null, intercept: 1, sessions: 2 });
  });
});

describe('canonical JSON of a design', () => {
  it('is the same whatever order the keys come in, at every level', () => {
    const value = fc.letrec((tie) => ({
      node: fc.oneof({ depthSize: 'small' }, fc.double({ noNaN: true, noDefaultInfinity: true }), fc.string(), fc.boolean(), fc.array(tie('node'), { maxLength: 3 }), fc.dictionary(fc.string(), tie('node'), { maxKeys: 4 })),
    })).node;
    const reversed = (input: unknown): unknown => {
      if (Array.isArray(input)) return input.map(reversed);
      if (input !== null && typeof input === 'object') return Object.fromEntries(Object.entries(input).reverse().map(([k, v]) => [k, reversed(v)]));
      return input;
    };
    fc.assert(
      fc.property(value, (input) => {
        expect(canonicalJson(reversed(input))).toBe(canonicalJson(input));
        expect(JSON.parse(canonicalJson(input))).toEqual(JSON.parse(JSON.stringify(input)));
      }),
    );
  });
});
