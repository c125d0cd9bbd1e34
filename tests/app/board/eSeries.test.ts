import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { eSeriesTables, isStandardValue, nearestStandardValue, standardValueNeighbours, standardValuesBetween } from '../../../app/board/eSeries';

// IEC 60063 values as printed in ../shared/REFERENCES.md (published standard values).
const iecE6 = [10, 15, 22, 33, 47, 68];
const iecE12 = [10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82];
const iecE24 = [10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91];
const iecE96 = `100 102 105 107 110 113 115 118 121 124 127 130 133 137 140 143 147 150 154 158 162 165 169 174 178 182 187 191 196 200
205 210 215 221 226 232 237 243 249 255 261 267 274 280 287 294 301 309 316 324 332 340 348 357 365 374 383 392 402 412 422 432 442 453
464 475 487 499 511 523 536 549 562 576 590 604 619 634 649 665 681 698 715 732 750 768 787 806 825 845 866 887 909 931 953 976`
  .split(/\s+/)
  .map(Number);

describe('E-series tables (IEC 60063)', () => {
  it('E6, E12, E24 and E96 equal the published values', () => {
    expect(eSeriesTables.E6).toEqual(iecE6);
    expect(eSeriesTables.E12).toEqual(iecE12);
    expect(eSeriesTables.E24).toEqual(iecE24);
    expect(eSeriesTables.E96).toEqual(iecE96);
  });

  it('E24 holds the eight values the formula round(10^(i/24)) does not give (REFERENCES.md: 27 30 33 36 39 43 47 82)', () => {
    const formula = Array.from({ length: 24 }, (_, index) => Math.round(10 * 10 ** (index / 24)));
    const differing = iecE24.filter((value, index) => formula[index] !== value);
    expect(differing).toEqual([27, 30, 33, 36, 39, 43, 47, 82]);
    for (const value of differing) expect(eSeriesTables.E24).toContain(value);
  });

  it('E48 is every second E96 value; E96 follows round(100 x 10^(i/96)) (REFERENCES.md)', () => {
    expect(eSeriesTables.E48).toEqual(iecE96.filter((_, index) => index % 2 === 0));
    expect(iecE96).toEqual(Array.from({ length: 96 }, (_, index) => Math.round(100 * 10 ** (index / 96))));
  });

  it('E192 follows round(100 x 10^(i/192)) except 920 where the formula gives 919 (REFERENCES.md)', () => {
    const formula = Array.from({ length: 192 }, (_, index) => Math.round(100 * 10 ** (index / 192)));
    const differences = eSeriesTables.E192.map((value, index) => [value, formula[index]]).filter(([value, computed]) => value !== computed);
    expect(differences).toEqual([[920, 919]]);
    // Each coarser series of three figures is contained in the finer one (E48 in E96 in E192).
    for (const value of eSeriesTables.E96) expect(eSeriesTables.E192).toContain(value);
  });
});

describe('nearest standard value by ratio', () => {
  it('picks by log distance, not linear distance', () => {
    // 8.9: linear distance 0.7 to 8.2 and 1.1 to 10, but ratios 1.0854 and 1.1236: 8.2 is nearer either way.
    expect(nearestStandardValue(8.9, 'E12')).toBe(8.2);
    // 9.1: linear distance 0.9 to 8.2 and 0.9 to 10; ratios 1.1098 and 1.0989: 10 is nearer by ratio.
    expect(nearestStandardValue(9.1, 'E12')).toBe(10);
    // Geometric mean of 39 and 47 is 42.81; 42.7 goes down, 42.9 goes up (E12).
    expect(nearestStandardValue(42.7, 'E12')).toBe(39);
    expect(nearestStandardValue(42.9, 'E12')).toBe(47);
  });

  it('works in any decade, keeping clean values', () => {
    expect(nearestStandardValue(7380, 'E24')).toBe(7500);
    expect(nearestStandardValue(4.6e-7, 'E12')).toBe(4.7e-7);
    expect(nearestStandardValue(0.0214, 'E96')).toBe(0.0215);
    expect(nearestStandardValue(9.9e6, 'E6')).toBe(1e7);
    expect(nearestStandardValue(1000, 'E24')).toBe(1000);
    expect(standardValueNeighbours(1000, 'E24')).toEqual({ below: 1000, above: 1000 });
    expect(standardValueNeighbours(7380, 'E24')).toEqual({ below: 6800, above: 7500 });
    expect(standardValuesBetween(1000, 2000, 'E12')).toEqual([1000, 1200, 1500, 1800]);
    expect(isStandardValue(4700, 'E6')).toBe(true);
    expect(isStandardValue(5100, 'E12')).toBe(false);
  });

  it('property: the nearest value is a table value within half a step by ratio, and no table value is nearer', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-12, max: 1e9, noNaN: true }), fc.constantFrom('E6', 'E12', 'E24', 'E48', 'E96', 'E192' as const), (value, series) => {
        const nearest = nearestStandardValue(value, series);
        const { below, above } = standardValueNeighbours(value, series);
        // Within the bracketing pair, and nearer by ratio than the other one (1e-9 for float rounding).
        expect(below).toBeLessThanOrEqual(value * (1 + 1e-9));
        expect(above).toBeGreaterThanOrEqual(value * (1 - 1e-9));
        const distance = Math.abs(Math.log(nearest / value));
        expect(distance).toBeLessThanOrEqual(Math.abs(Math.log(below / value)) + 1e-9);
        expect(distance).toBeLessThanOrEqual(Math.abs(Math.log(above / value)) + 1e-9);
        // Its significant figures are in the table.
        const figures = Math.round(nearest / 10 ** (Math.floor(Math.log10(nearest) + 1e-12) - (eSeriesTables[series][0] >= 100 ? 2 : 1)));
        expect(eSeriesTables[series]).toContain(figures === 1000 || figures === 100 ? eSeriesTables[series][0] : figures);
      }),
      { numRuns: 300 },
    );
  });
});
