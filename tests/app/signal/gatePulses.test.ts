import { describe, expect, it } from 'vitest';
import { GatePulseTracker } from '../../../app/signal/gatePulses';

describe('GatePulseTracker', () => {
  it('edges at the interpolated 50 % crossings, width, amplitude and control at the firing instant', () => {
    // 0 -> 10 V edges over one sample: rise between samples 9 (0 V) and 10 (8 V): the 5 V level at 9.625.
    const gate = Array.from({ length: 40 }, (_, i) => (i === 10 ? 8 : i > 10 && i < 20 ? 10 : i === 20 ? 4 : 0));
    const control = Array.from({ length: 40 }, (_, i) => 1 + 0.1 * i);
    const tracker = new GatePulseTracker({ lowV: 0, highV: 10 });
    const { started, completed } = tracker.push(gate, control, 1000);
    expect(started).toHaveLength(1);
    expect(completed).toHaveLength(1);
    const pulse = started[0];
    expect(pulse.riseIndex).toBeCloseTo(1009.625, 12);
    // Fall from 10 V (sample 19) to 4 V (sample 20): 5 V at 19 + 5/6.
    expect(pulse.fallIndex).toBeCloseTo(1019 + 5 / 6, 12);
    // Control interpolated at the same instant: 1 + 0.1 * 9.625.
    expect(pulse.controlV).toBeCloseTo(1.9625, 12);
    // Samples above 5 V: 8 and nine of 10 V: mean 9.8 V.
    expect(pulse.amplitudeV).toBeCloseTo(9.8, 12);
  });

  it('noise around the mesial level inside the hysteresis band makes no extra pulses', () => {
    const gate = [0, 0, 5.3, 4.8, 5.2, 4.7, 10, 10, 4.9, 5.4, 0, 0];
    const { started, completed } = new GatePulseTracker({ lowV: 0, highV: 10 }).push(gate, null, 0);
    expect(started).toHaveLength(1);
    expect(completed).toHaveLength(1);
    // The edge is the last mesial crossing before the level was passed with hysteresis (5.3 -> 4.8 -> 5.2 -> 4.7 -> 10).
    expect(started[0].riseIndex).toBeCloseTo(5 + 0.3 / 5.3, 12);
    expect(started[0].controlV).toBeNull();
  });

  it('a pulse split across blocks is the same pulse', () => {
    const tracker = new GatePulseTracker({ lowV: 0, highV: 5 });
    const first = tracker.push([0, 0, 5, 5], null, 0);
    const second = tracker.push([5, 0, 0], null, 4);
    expect(first.started).toHaveLength(1);
    expect(second.completed[0]).toBe(first.started[0]);
    expect(first.started[0].fallIndex).toBeCloseTo(4.5, 12);
  });

  it('learns levels from the stream when the first record had no pulse', () => {
    const tracker = new GatePulseTracker({ lowV: 0, highV: 0.01 });
    expect(tracker.gateLevels).toBeNull();
    const { started } = tracker.push([0, 0, 0, 12, 12, 0, 0, 12, 0], null, 0);
    // The first rise teaches the span; the second pulse is found by it.
    expect(started.length).toBeGreaterThanOrEqual(1);
    expect(started[started.length - 1].riseIndex).toBeCloseTo(6.5, 12);
  });
});

describe('GatePulseTracker, pulses no wider than a sample', () => {
  it('a pulse seen by one sample gets its edges mid-way to the neighbours (never beyond half a sample)', () => {
    // The single high sample (index 5) sits on the falling edge at 3.7 V: interpolating with it would put the rise
    // at 4.68; the true rise may be anywhere in (4, 5], so the minimax estimate is 4.5.
    const { started, completed } = new GatePulseTracker({ lowV: 0, highV: 5 }).push([0, 0, 0, 0, 0, 3.7, 0, 0], [0, 1, 2, 3, 4, 5, 6, 7], 0);
    expect(completed).toHaveLength(1);
    expect(started[0].riseIndex).toBeCloseTo(4.5, 12);
    expect(started[0].fallIndex).toBeCloseTo(5.5, 12);
    expect(started[0].controlV).toBeCloseTo(4.5, 12);
  });
});
