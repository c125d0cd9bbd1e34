import { describe, expect, it } from 'vitest';
import { HalfCycleBalance } from '../../../app/bench/halfCycleBalance';
import type { CycleReading } from '../../../app/bench/readings';

const periodS = 0.02;

/** Half-cycle k of a 50 Hz full-wave board: positive halves fire `splitDeg` earlier, on a control swept at `sweepDegPerS`. */
function reading(k: number, splitDeg: number, sweepDegPerS: number, peakSplitV = 0): CycleReading {
  const positive = k % 2 === 0;
  const t = (k * periodS) / 2;
  return {
    t, halfCycle: positive ? 'positive' : 'negative', periodS,
    alphaDeg: 90 + sweepDegPerS * t + (positive ? -splitDeg / 2 : splitDeg / 2),
    controlV: null, pulses: 1, wrongHalfCyclePulses: 0,
    rampPeakV: 6 + (positive ? peakSplitV / 2 : -peakSplitV / 2),
    rampFloorV: 0.1, slopeVPerMs: 0.6, startDelayDeg: 2.7, nonlinearityPct: 0.3, clipped: false, resetUs: 300,
  };
}

describe('HalfCycleBalance', () => {
  it('measures positive minus negative, and a linear sweep cancels (neighbours straddle each half-cycle)', () => {
    const balance = new HalfCycleBalance();
    // 60 deg/s is a fast sweep: 0.6 deg from one half-cycle to the next, larger than the split itself.
    for (let k = 0; k < 40; k++) balance.add(reading(k, 0.4, 60, 0.05));
    const result = balance.reading();
    expect(result.alphaDeg).toBeCloseTo(-0.4, 10);
    expect(result.rampPeakV).toBeCloseTo(0.05, 10);
    // 40 half-cycles give 38 neighbouring triples.
    expect(result.alphaTriples).toBe(38);
  });

  it('never pairs across a gap or a missing half-cycle, and skips half-cycles without a pulse', () => {
    const balance = new HalfCycleBalance();
    for (const k of [0, 1, 2, 4, 5, 6, 7]) balance.add(reading(k, 1, 0));
    // Triples (0,1,2), (4,5,6), (5,6,7): the jump from 2 to 4 breaks the run.
    expect(balance.reading().alphaTriples).toBe(3);
    expect(balance.reading().alphaDeg).toBeCloseTo(-1, 10);
    const unfired = new HalfCycleBalance();
    for (let k = 0; k < 6; k++) unfired.add({ ...reading(k, 1, 0), alphaDeg: k === 3 ? null : reading(k, 1, 0).alphaDeg });
    // Half-cycle 3 takes out the three triples it sits in; its ramp still counts.
    expect(unfired.reading().alphaTriples).toBe(1);
    expect(unfired.reading().rampTriples).toBe(4);
    expect(new HalfCycleBalance().reading()).toEqual({ alphaDeg: null, rampPeakV: null, alphaTriples: 0, rampTriples: 0 });
  });
});
