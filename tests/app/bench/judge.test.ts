import { describe, expect, it } from 'vitest';
import { boardDesignSchema } from '../../../app/board/design';
import { alphaForControl } from '../../../app/board/firingAngle';
import { predictRamp } from '../../../app/board/rampModel';
import { judgeReadings, marginalFraction, verdictFor } from '../../../app/bench/judge';
import type { CaptureReadings } from '../../../app/bench/readings';

// A board of our own (invented name), 50 Hz full-wave.
const design = boardDesignSchema.parse({
  name: 'Bench case J1', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 6, alphaMaxDeg: 165, alphaMinDeg: 10, gatePulseUs: 200,
  parts: { rEmitter: { ohm: 7500 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 } },
  tolerances: { rampPeakPct: 3, alphaDeg: 2, startDelayDeg: 3 },
});

function readings(overrides: { ramp?: Partial<CaptureReadings['ramp']>; pulse?: Partial<CaptureReadings['pulse']>; frequencyHz?: number; balance?: CaptureReadings['balance'] }): CaptureReadings {
  const prediction = predictRamp(design);
  return {
    frequencyHz: overrides.frequencyHz ?? 50.01,
    cycles: 50,
    ramp: {
      floorV: 0.1, peakV: 6, slopeVPerMs: 0.62, nonlinearityPct: 0.8, clipped: false, clippedIntervals: 0, chargingIntervals: 100,
      startDelayDeg: 360 * 50 * prediction.startDelayS, resetUs: 300, peakMinV: 5.98, peakMaxV: 6.02, ...overrides.ramp,
    },
    pulse: {
      count: 100, alphaDeg: 90, alphaStdDeg: 0.2, alphaMinDeg: 89.5, alphaMaxDeg: 90.5, widthUs: 205, amplitudeV: 5, wrongHalfCycle: 0, missing: 0,
      multiplePulses: 0, gateLowV: 0, gateHighV: 5, controlV: null, ...overrides.pulse,
    },
    transfer: null, perCycle: [], rectifier: 'full-wave', syncPhaseDeg: 0, sampleRateHz: 20000, durationS: 1, firingIntervals: 100,
    frequencyDriftHz: 0, frequencyDriftHzPerS: 0, periodJitterUs: 2, syncOffsetV: 0, syncAmplitudeV: 5, gaps: 0, invalidSamples: 0,
    balance: overrides.balance === undefined ? { alphaDeg: 0.1, rampPeakV: 0.01, alphaTriples: 98, rampTriples: 98 } : overrides.balance,
  };
}

const byKey = (checks: ReturnType<typeof judgeReadings>, key: string) => checks.find((check) => check.key === key);

describe('verdictFor (our rule: marginal beyond 75 % of the tolerance)', () => {
  it('in, marginal, out at the boundaries', () => {
    expect(marginalFraction).toBe(0.75);
    expect(verdictFor(0.74, 1)).toBe('in-tolerance');
    expect(verdictFor(-0.76, 1)).toBe('marginal');
    expect(verdictFor(1, 1)).toBe('marginal');
    expect(verdictFor(1.01, 1)).toBe('out-of-tolerance');
    expect(verdictFor(0, 0)).toBe('in-tolerance');
    expect(verdictFor(1, 0)).toBe('out-of-tolerance');
  });
});

describe('judgeReadings', () => {
  it('a board on its design is in tolerance throughout', () => {
    const checks = judgeReadings(readings({}), design);
    for (const check of checks) expect(check.verdict, check.key).toBe('in-tolerance');
    expect(byKey(checks, 'rampPeakV')?.toleranceAbs).toBeCloseTo(0.18, 12);
  });

  it('ramp peak: 2.5 % high is marginal, 3.5 % high is out (tolerance 3 % of 6 V)', () => {
    expect(byKey(judgeReadings(readings({ ramp: { peakV: 6.15 } }), design), 'rampPeakV')?.verdict).toBe('marginal');
    expect(byKey(judgeReadings(readings({ ramp: { peakV: 6.21 } }), design), 'rampPeakV')?.verdict).toBe('out-of-tolerance');
  });

  it('clipping, stray and missing pulses are out of tolerance', () => {
    const checks = judgeReadings(readings({ ramp: { clipped: true, clippedIntervals: 80 }, pulse: { wrongHalfCycle: 3, missing: 1 } }), design);
    expect(byKey(checks, 'rampClipped')?.verdict).toBe('out-of-tolerance');
    expect(byKey(checks, 'rampClipped')?.note).toContain('80 of 100');
    expect(byKey(checks, 'wrongHalfCyclePulses')?.verdict).toBe('out-of-tolerance');
    expect(byKey(checks, 'missingPulses')?.verdict).toBe('out-of-tolerance');
  });

  it('limits are one-sided: inside alpha max is fine, 1.8 deg past it marginal, 2.5 deg past it out', () => {
    expect(byKey(judgeReadings(readings({ pulse: { alphaMaxDeg: 150 } }), design), 'alphaMaxDeg')?.verdict).toBe('in-tolerance');
    expect(byKey(judgeReadings(readings({ pulse: { alphaMaxDeg: 166.8 } }), design), 'alphaMaxDeg')?.verdict).toBe('marginal');
    expect(byKey(judgeReadings(readings({ pulse: { alphaMaxDeg: 167.5 } }), design), 'alphaMaxDeg')?.verdict).toBe('out-of-tolerance');
    expect(byKey(judgeReadings(readings({ pulse: { alphaMinDeg: 7 } }), design), 'alphaMinDeg')?.verdict).toBe('out-of-tolerance');
  });

  it('with a control channel, alpha is judged against the board model at the measured control voltage', () => {
    const expected = alphaForControl(design, 3) ?? Number.NaN;
    expect(Number.isFinite(expected)).toBe(true);
    const near = byKey(judgeReadings(readings({ pulse: { controlV: 3, alphaDeg: expected + 0.5 } }), design), 'alphaDeg');
    expect(near?.expected).toBeCloseTo(expected, 12);
    expect(near?.verdict).toBe('in-tolerance');
    expect(byKey(judgeReadings(readings({ pulse: { controlV: 3, alphaDeg: expected + 2.5 } }), design), 'alphaDeg')?.verdict).toBe('out-of-tolerance');
  });

  it('nothing measured is "not measured yet", never a pass', () => {
    const checks = judgeReadings(readings({ ramp: { peakV: null, chargingIntervals: 0 }, pulse: { widthUs: null } }), design);
    expect(byKey(checks, 'rampPeakV')?.verdict).toBe('not-measured');
    expect(byKey(checks, 'rampClipped')?.verdict).toBe('not-measured');
    expect(byKey(checks, 'pulseWidthUs')?.verdict).toBe('not-measured');
  });
});

describe('the gate pulse against the load it must latch (design with a load)', () => {
  // REFERENCES.md worked value: I_L 100 mA, 200 V, 20 ohm, 0.2 H gives 100.5 us. The anode sees 200 V at 90 deg
  // on a mains of 200/sqrt 2 V rms; hand check: -(0.2/20) ln(1 - 0.1 x 20/200) = 0.01 x 0.0100503 s = 100.503 us.
  const loaded = boardDesignSchema.parse({ ...design, load: { mainsRmsV: 200 / Math.SQRT2, ohm: 20, henry: 0.2, latchingCurrentA: 0.1 } });
  const latch = (pulse: Partial<CaptureReadings['pulse']>) => byKey(judgeReadings(readings({ pulse }), loaded), 'pulseLatchUs');

  it('judges the width at the largest alpha measured against the latching minimum, with twice it for margin', () => {
    const wide = latch({ alphaMaxDeg: 90, widthUs: 250 });
    expect(wide?.expected).toBeCloseTo(100.503, 2);
    expect(wide?.verdict).toBe('in-tolerance');
    expect(wide?.label).toBe('Gate pulse against latching at 90.0 deg');
    expect(latch({ alphaMaxDeg: 90, widthUs: 150 })?.verdict).toBe('marginal');
    expect(latch({ alphaMaxDeg: 90, widthUs: 80 })?.verdict).toBe('out-of-tolerance');
    expect(latch({ alphaMaxDeg: 90, widthUs: null })?.verdict).toBe('not-measured');
  });

  it('past the angle where the load current can reach the latching current no width fires it, and it says so', () => {
    // 179.5 deg: 200 V x sin(0.5 deg) = 1.75 V, at most 87 mA into 20 ohm, under the 100 mA latching current.
    const late = latch({ alphaMaxDeg: 179.5, widthUs: 5000 });
    expect(late?.expected).toBeNull();
    expect(late?.verdict).toBe('out-of-tolerance');
    expect(late?.note).toContain('never reaches the 100 mA latching current');
  });

  it('takes the design alpha max when no pulse was measured, and a design without a load has no such check', () => {
    expect(latch({ alphaMaxDeg: null, widthUs: 200 })?.label).toBe('Gate pulse against latching at 165.0 deg');
    expect(byKey(judgeReadings(readings({}), design), 'pulseLatchUs')).toBeUndefined();
  });

  it('refuses a load that is not one, naming the field', () => {
    for (const [load, path] of [
      [{ mainsRmsV: 0, ohm: 20, latchingCurrentA: 0.1 }, 'load.mainsRmsV'],
      [{ mainsRmsV: 230, ohm: -1, latchingCurrentA: 0.1 }, 'load.ohm'],
      [{ mainsRmsV: 230, ohm: 20, henry: -0.1, latchingCurrentA: 0.1 }, 'load.henry'],
      [{ mainsRmsV: 230, ohm: 20 }, 'load.latchingCurrentA'],
    ] as const) {
      const parsed = boardDesignSchema.safeParse({ ...design, load });
      expect(parsed.success).toBe(false);
      expect(parsed.error?.issues.map((issue) => issue.path.join('.'))).toContain(path);
    }
  });
});

describe('half-cycle balance (full-wave boards)', () => {
  const balanced = (balance: CaptureReadings['balance']) => judgeReadings(readings({ balance }), design);

  it('judges positive minus negative alpha against the alpha tolerance and the ramp peaks against the peak tolerance', () => {
    // 2 deg alpha tolerance: 1.4 deg apart is in tolerance, 1.6 marginal (beyond 75 %), 2.3 out.
    const alpha = (deg: number) => byKey(balanced({ alphaDeg: deg, rampPeakV: 0, alphaTriples: 50, rampTriples: 50 }), 'alphaBalanceDeg')?.verdict;
    expect(alpha(1.4)).toBe('in-tolerance');
    expect(alpha(-1.6)).toBe('marginal');
    expect(alpha(-2.3)).toBe('out-of-tolerance');
    // The offset that explains 3.44 deg: sin(1.72 deg) = 3.0 % of the sync peak (the sine's geometry).
    const note = byKey(balanced({ alphaDeg: -3.438, rampPeakV: 0, alphaTriples: 50, rampTriples: 50 }), 'alphaBalanceDeg')?.note;
    expect(note).toBe('the positive half-cycle fires early: as a DC offset of 3.0 % of the sync peak would (check the sync coupling capacitor, winding and divider)');
    expect(byKey(balanced({ alphaDeg: 0.2, rampPeakV: 0, alphaTriples: 50, rampTriples: 50 }), 'alphaBalanceDeg')?.note).toBeNull();
    // 3 % of the 6 V target is 0.18 V.
    const peak = byKey(balanced({ alphaDeg: 0, rampPeakV: 0.2, alphaTriples: 50, rampTriples: 50 }), 'rampPeakBalanceV');
    expect(peak).toMatchObject({ expected: 0, toleranceAbs: expect.closeTo(0.18, 9), verdict: 'out-of-tolerance' });
  });

  it('has no balance checks on a half-wave capture, and none measured is "not measured yet"', () => {
    expect(byKey(balanced(null), 'alphaBalanceDeg')).toBeUndefined();
    expect(byKey(balanced({ alphaDeg: null, rampPeakV: null, alphaTriples: 0, rampTriples: 0 }), 'alphaBalanceDeg')?.verdict).toBe('not-measured');
  });
});
