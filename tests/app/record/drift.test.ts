/**
 * Drift forecast: the regression against numpy and published t-table values, and the warning on synthetic session
 * series with known trends.
 */
import { execFileSync } from 'node:child_process';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyseDrift, msPerDay, type DriftSample } from '../../../app/record/drift';
import { fitLinear, normalCdf, studentTCdf, studentTQuantile } from '../../../app/record/regression';

const origin = Date.parse('2026-01-05T09:00:00Z');
const series = (values: ReadonlyArray<readonly [number, number]>): DriftSample[] =>
  values.map(([day, value], index) => ({ sessionId: index + 1, startedAt: new Date(origin + day * msPerDay).toISOString(), value }));

/** Seeded normal draws (mulberry32 + Box-Muller), so the statistical checks give the same answer every run. */
function gaussian(seed: number): () => number {
  let state = seed >>> 0;
  const uniform = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

describe('regression statistics', () => {
  it('Student t quantiles match the published table', () => {
    // Two-sided 95 % critical values from any t table (e.g. NIST/SEMATECH e-Handbook, 1.3.6.7.2): 12.706 (1), 3.182 (3), 2.228 (10), 2.042 (30).
    expect(studentTQuantile(0.975, 1)).toBeCloseTo(12.706, 3);
    expect(studentTQuantile(0.975, 3)).toBeCloseTo(3.182, 3);
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
    expect(studentTQuantile(0.975, 30)).toBeCloseTo(2.042, 3);
    // One-sided 95 % with 5 degrees of freedom: 2.015 (same table).
    expect(studentTQuantile(0.95, 5)).toBeCloseTo(2.015, 3);
    expect(studentTCdf(0, 7)).toBeCloseTo(0.5, 12);
    // Standard normal: Phi(1.96) = 0.9750 (any normal table); A&S 7.1.26 is good to 1.5e-7.
    expect(normalCdf(1.96)).toBeCloseTo(0.975002, 6);
  });

  it('slope, intercept and their standard errors agree with numpy.polyfit(x, y, 1, cov=True)', () => {
    // numpy 1.24 (Debian python3-numpy) scales the covariance by SSR / (n - 2) for a line, the same estimator.
    const x = [0, 12, 29, 41, 63, 90, 118, 150];
    const y = [7.301, 7.305, 7.317, 7.322, 7.331, 7.349, 7.358, 7.377];
    const fit = fitLinear(x, y)!;
    const script = `import numpy as np, json; x=np.array(${JSON.stringify(x)},float); y=np.array(${JSON.stringify(y)},float); p,c=np.polyfit(x,y,1,cov=True); print(json.dumps([p[0],p[1],float(np.sqrt(c[0,0])),float(np.sqrt(c[1,1]))]))`;
    const [slope, intercept, slopeSe, interceptSe] = JSON.parse(execFileSync('/usr/bin/python3', ['-c', script], { encoding: 'utf8' })) as number[];
    // Relative 1e-9: both sides are double-precision least squares on eight well-conditioned points.
    expect(fit.slope).toBeCloseTo(slope, 12);
    expect(Math.abs(fit.intercept - intercept) / intercept).toBeLessThan(1e-12);
    expect(Math.abs(fit.slopeStandardError! - slopeSe) / slopeSe).toBeLessThan(1e-9);
    expect(Math.abs(fit.interceptStandardError! - interceptSe) / interceptSe).toBeLessThan(1e-9);
  });

  it('recovers any exact straight line (fast-check)', () => {
    fc.assert(
      fc.property(fc.double({ min: -5, max: 5, noNaN: true }), fc.double({ min: -100, max: 100, noNaN: true }), fc.integer({ min: 3, max: 20 }), (slope, intercept, count) => {
        const x = Array.from({ length: count }, (_, index) => index * 7 + 1);
        const fit = fitLinear(x, x.map((value) => intercept + slope * value))!;
        // Rounding only: a few ulps of the largest term.
        expect(Math.abs(fit.slope - slope)).toBeLessThan(1e-9 * (1 + Math.abs(slope) + Math.abs(intercept)));
        expect(fit.residualStd!).toBeLessThan(1e-7 * (1 + Math.abs(intercept) + Math.abs(slope) * 140));
      }),
      { numRuns: 200 },
    );
  });
});

describe('drift warning on synthetic session series', () => {
  const limits = { low: 7.081, high: 7.519 }; // 7.3 V +- 3 % (charger-ch50h.board.json)

  it('warns that a rising ramp peak will cross the upper limit, and when', () => {
    // Known trend: +0.5 mV per day from 7.30 V, sessions every 30 days for 7 months, +-1 mV of alternating scatter.
    const values = Array.from({ length: 8 }, (_, index) => [index * 30, 7.3 + 0.0005 * index * 30 + (index % 2 === 0 ? 0.001 : -0.001)] as const);
    const drift = analyseDrift(series(values), limits);
    expect(drift.warning).toBe(true);
    const high = drift.forecasts.find((forecast) => forecast.side === 'high')!;
    expect(high.status).toBe('predicted');
    // True crossing: (7.519 - 7.30) / 0.0005 = 438 days; the scatter moves the fit by well under 5 days.
    expect(high.crossingDay!).toBeGreaterThan(433);
    expect(high.crossingDay!).toBeLessThan(443);
    expect(high.crossingAt).toBe(new Date(origin + Math.floor(high.crossingDay!) * msPerDay).toISOString().slice(0, 10));
    expect(high.earliestAt! < high.crossingAt!).toBe(true);
    expect(high.crossingAt! < high.latestAt!).toBe(true);
    expect(high.confidence!).toBeGreaterThan(0.999);
    expect(drift.message).toMatch(/will cross the upper limit 7\.519 around \d{4}-\d{2}-\d{2} \(95 % band: .* to .*\); confidence that the trend points that way: above 99\.99 %\.$/);
  });

  it('warns on a falling figure towards the lower limit', () => {
    const values = Array.from({ length: 6 }, (_, index) => [index * 20, 7.3 - 0.001 * index * 20] as const);
    const drift = analyseDrift(series(values), limits);
    const low = drift.forecasts.find((forecast) => forecast.side === 'low')!;
    expect(drift.warning).toBe(true);
    expect(low.status).toBe('predicted');
    // (7.3 - 7.081) / 0.001 = 219 days; exact data, so to rounding.
    expect(low.crossingDay!).toBeCloseTo(219, 6);
    expect(drift.forecasts.find((forecast) => forecast.side === 'high')!.status).toBe('moving-away');
  });

  it('stays quiet for scatter without a trend', () => {
    const draw = gaussian(11);
    const values = Array.from({ length: 10 }, (_, index) => [index * 25, 7.3 + 0.01 * draw()] as const);
    const drift = analyseDrift(series(values), limits);
    expect(drift.warning).toBe(false);
    for (const forecast of drift.forecasts) expect(['moving-away', 'beyond-horizon', 'flat']).toContain(forecast.status);
  });

  it('a slow trend whose crossing lies beyond the horizon is stated but not warned', () => {
    const values = Array.from({ length: 6 }, (_, index) => [index * 30, 7.3 + 0.0001 * index * 30] as const);
    const drift = analyseDrift(series(values), limits, { horizonDays: 365 });
    expect(drift.warning).toBe(false);
    expect(drift.forecasts.find((forecast) => forecast.side === 'high')!.status).toBe('beyond-horizon');
    expect(drift.message).toMatch(/would cross, beyond the horizon,/);
  });

  it('warns when the line is already beyond the limit at the last session', () => {
    const drift = analyseDrift(series([[0, 7.45], [30, 7.50], [60, 7.55]]), limits);
    expect(drift.warning).toBe(true);
    expect(drift.forecasts.find((forecast) => forecast.side === 'high')!.status).toBe('already-beyond');
  });

  it('states the trend in the figure\'s unit per day, with its standard error and the limit in that unit', () => {
    const values = Array.from({ length: 8 }, (_, index) => [index * 30, 7.3 + 0.0005 * index * 30 + (index % 2 === 0 ? 0.001 : -0.001)] as const);
    const drift = analyseDrift(series(values), limits, { unit: 'V' });
    expect(drift.message).toMatch(/^trend \+0\.0004\d\d V per day \(standard error [\d.e-]+ V per day\) over 8 sessions; the line will cross the upper limit 7\.519 V around /);
  });

  it('sessions within a day show a change, not a drift: no trend per day, no forecast, no warning', () => {
    // Measured, trimmed and measured again in one afternoon: 10 and 50 minutes apart, the last beyond the upper limit.
    const minutes = (count: number): number => count / (24 * 60);
    const drift = analyseDrift(series([[0, 7.3], [minutes(10), 7.45], [minutes(50), 7.6]]), limits, { unit: 'V' });
    expect(drift.warning).toBe(false);
    expect(drift.forecasts).toEqual([]);
    expect(drift.message).toBe('3 sessions within 50 min: too short a time to tell a drift (a trend needs sessions at least a day apart).');
    expect(drift.message).not.toMatch(/per day/);
    // The same three readings spread over two months are a drift, and already past the limit.
    expect(analyseDrift(series([[0, 7.3], [30, 7.45], [60, 7.6]]), limits).warning).toBe(true);
  });

  it('two sessions give a line but no confidence, so no warning', () => {
    const drift = analyseDrift(series([[0, 7.3], [30, 7.4]]), limits);
    const high = drift.forecasts.find((forecast) => forecast.side === 'high')!;
    expect(high.confidence).toBeNull();
    expect(high.crossingDay!).toBeCloseTo(65.7, 1);
    expect(drift.warning).toBe(false);
    expect(drift.message).toMatch(/unknown \(two sessions give no uncertainty\)/);
  });

  it('the 95 % band around the crossing holds the true crossing day in about 95 % of noisy series', () => {
    // 400 seeded series of 8 sessions, slope 0.5 mV/day, sd 3 mV: inverse prediction from the confidence band of
    // the line is a conservative 95 % interval (Draper and Smith, inverse estimation; from memory), so the
    // coverage must sit near or a little above 95 %; 400 trials give a binomial sd of about 1.1 %.
    const draw = gaussian(2026);
    let covered = 0;
    const trials = 400;
    for (let trial = 0; trial < trials; trial++) {
      const values = Array.from({ length: 8 }, (_, index) => [index * 30, 7.3 + 0.0005 * index * 30 + 0.003 * draw()] as const);
      const high = analyseDrift(series(values), limits).forecasts.find((forecast) => forecast.side === 'high')!;
      const trueDay = (7.519 - 7.3) / 0.0005;
      const toDay = (iso: string | null) => (iso === null ? Number.POSITIVE_INFINITY : (Date.parse(`${iso}T00:00:00Z`) - Date.parse('2026-01-05T00:00:00Z')) / msPerDay);
      if (toDay(high.earliestAt) <= trueDay && trueDay <= toDay(high.latestAt) + 1) covered++;
    }
    expect(covered / trials).toBeGreaterThan(0.92);
    expect(covered / trials).toBeLessThan(0.995);
  });
});
