import { describe, expect, it } from 'vitest';
import { alphaForAverageOutputDeg, averageOutputV } from '../../../app/power/rectifierOutput';

// Check values from REFERENCES.md (rectifier facts): 230 V rms mains (V_m 325.27 V), resistive load,
// half-wave / full-wave averages at four firing angles. Given to 3 decimals, so 1 mV is the tolerance.
const cases: Array<[number, number, number]> = [
  [0, 103.536, 207.073],
  [60, 77.652, 155.305],
  [90, 51.768, 103.536],
  [120, 25.884, 51.768],
];

describe('average rectifier output, resistive load', () => {
  it.each(cases)('alpha %d deg gives %f V half-wave and %f V full-wave', (alphaDeg, halfWaveV, fullWaveV) => {
    expect(averageOutputV('half-wave', 230, alphaDeg)).toBeCloseTo(halfWaveV, 2);
    expect(averageOutputV('full-wave', 230, alphaDeg)).toBeCloseTo(fullWaveV, 2);
    expect(Math.abs(averageOutputV('half-wave', 230, alphaDeg) - halfWaveV)).toBeLessThan(1e-3);
    expect(Math.abs(averageOutputV('full-wave', 230, alphaDeg) - fullWaveV)).toBeLessThan(1e-3);
  });

  it('falls to zero at 180 degrees', () => {
    expect(averageOutputV('full-wave', 230, 180)).toBeCloseTo(0, 9);
  });

  // Near 0 degrees the output barely moves with alpha (slope ~ sin alpha), so a table value rounded to 1 mV
  // cannot pin alpha there: the table inverse is checked from 60 degrees on, the exact round trip everywhere.
  it.each(cases.slice(1))('the inverse of the table recovers alpha %d deg', (alphaDeg, halfWaveV, fullWaveV) => {
    expect(alphaForAverageOutputDeg('half-wave', 230, halfWaveV)).toBeCloseTo(alphaDeg, 2);
    expect(alphaForAverageOutputDeg('full-wave', 230, fullWaveV)).toBeCloseTo(alphaDeg, 2);
  });

  it.each([0, 5, 45, 90, 150, 180])('alpha %d deg survives the round trip', (alphaDeg) => {
    const outputV = averageOutputV('full-wave', 120, alphaDeg);
    expect(alphaForAverageOutputDeg('full-wave', 120, outputV)).toBeCloseTo(alphaDeg, 4);
  });
});
