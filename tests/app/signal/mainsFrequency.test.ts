import { describe, expect, it } from 'vitest';
import { MainsFrequencyTracker } from '../../../app/signal/mainsFrequency';

describe('MainsFrequencyTracker', () => {
  it('frequency from alternating crossings, robust to unequal half-cycles', () => {
    const tracker = new MainsFrequencyTracker();
    // 59.94 Hz with a residual offset making positive half-cycles 40 us longer than negative ones.
    const periodS = 1 / 59.94;
    for (let k = 0; k < 121; k++) {
      const skewS = k % 2 === 1 ? 20e-6 : 0;
      tracker.add(0.01 + (k * periodS) / 2 + skewS, k % 2 === 0 ? 'rising' : 'falling');
    }
    const reading = tracker.reading();
    expect(reading.cycles).toBe(60);
    // The alternating 20 us skew contributes to the fitted slope only through the end effect: 20e-6 / 120 half periods.
    expect(reading.frequencyHz).toBeCloseTo(59.94, 3);
    expect(reading.periodJitterUs).toBeCloseTo(0, 6);
  });

  it('drift: a linear frequency ramp is measured as its slope', () => {
    const tracker = new MainsFrequencyTracker();
    // f(t) = 49.8 + 0.02 t Hz for 100 s; rising crossings where the phase integral is whole.
    const phaseAt = (tS: number): number => 49.8 * tS + 0.01 * tS * tS;
    const timeOfCycle = (cycle: number): number => (-49.8 + Math.sqrt(49.8 ** 2 + 0.04 * cycle)) / 0.02;
    for (let cycle = 0; phaseAt(timeOfCycle(cycle)) < 100 * 49.8 + 100; cycle++) {
      tracker.add(timeOfCycle(cycle), 'rising');
      tracker.add(timeOfCycle(cycle + 0.5), 'falling');
    }
    const reading = tracker.reading();
    // 1/period at the period's midpoint is the frequency there to second order: the slope is exact to 1e-6 Hz/s.
    expect(reading.frequencyDriftHzPerS).toBeCloseTo(0.02, 6);
    expect(reading.frequencyDriftHz).toBeCloseTo(0.02 * (timeOfCycle(reading.cycles - 0.5) - timeOfCycle(0.5)), 3);
    // Mean frequency over the run: cycles / duration.
    expect(reading.frequencyHz).toBeCloseTo(reading.cycles / (timeOfCycle(reading.cycles) - timeOfCycle(0)), 2);
  });

  it('cycle-to-cycle jitter: alternating periods of T +- 10 us give 20 / sqrt 2 * sqrt 2 ... = RMS difference 20 us / sqrt 2', () => {
    const tracker = new MainsFrequencyTracker();
    let tS = 0;
    for (let k = 0; k < 50; k++) {
      tracker.add(tS, 'rising');
      tracker.add(tS + 0.01, 'falling');
      tS += 0.02 + (k % 2 === 0 ? 10e-6 : -10e-6);
    }
    // Successive differences are +-20 us: RMS 20 us, divided by sqrt 2.
    expect(tracker.reading().periodJitterUs).toBeCloseTo(20 / Math.SQRT2, 4);
  });

  it('never joins two stretches across a gap', () => {
    const tracker = new MainsFrequencyTracker();
    for (let k = 0; k < 11; k++) tracker.add(k * 0.01, k % 2 === 0 ? 'rising' : 'falling');
    tracker.restart();
    // After a gap of 0.333 s the next stretch starts off the old rhythm; no period spans the gap.
    for (let k = 0; k < 11; k++) tracker.add(0.433 + k * 0.01, k % 2 === 0 ? 'rising' : 'falling');
    const reading = tracker.reading();
    expect(reading.cycles).toBe(10);
    expect(reading.frequencyHz).toBeCloseTo(50, 9);
    expect(reading.periodMaxUs).toBeCloseTo(20000, 6);
  });
});
