// The cycle fold the service sends: degree mapping, min-max buckets keep narrow peaks, bounded history.
import { describe, expect, it } from 'vitest';
import type { SampleBlock } from '../../../app/capture/samples';
import { createFoldKeeper, foldCycleFromRing, foldTraceMinMax } from '../../../main/session/fold';
import { createSampleRing } from '../../../main/session/sampleRing';
import { createThrottle, type ClockLike } from '../../../main/session/throttle';

function block(startS: number, sampleRateHz: number, samples: number, shape: (timeS: number) => { sync: number; ramp: number; gate: number }, afterGap = false): SampleBlock {
  const sync = new Float64Array(samples);
  const ramp = new Float64Array(samples);
  const gate = new Float64Array(samples);
  for (let index = 0; index < samples; index++) {
    const value = shape(startS + index / sampleRateHz);
    sync[index] = value.sync;
    ramp[index] = value.ramp;
    gate[index] = value.gate;
  }
  return { startS, sampleRateHz, sync, ramp, gate, control: null, afterGap };
}

// 50 Hz sine sync; a 100 us gate pulse at 90 degrees (5 ms into each 20 ms cycle).
const mains = (timeS: number) => {
  const phase = (timeS % 0.02) / 0.02;
  return { sync: 10 * Math.sin(2 * Math.PI * 50 * timeS), ramp: 6 * phase, gate: phase >= 0.25 && phase < 0.255 ? 15 : 0 };
};

describe('foldTraceMinMax', () => {
  it('maps one cycle onto 0-360 degrees and keeps a 100 us gate pulse that is narrower than a bucket', () => {
    const blocks = [block(0, 25_000, 500, mains)];
    // 60 buckets of 6 degrees (333 us) each: the pulse lasts 1.8 degrees, a third of a bucket.
    const gate = foldTraceMinMax(blocks, 'gate', 0, 0.02, 60)!;
    expect(Math.max(...gate.v)).toBe(15);
    const highDeg = gate.deg.filter((_, index) => gate.v[index] === 15);
    // Pulse from 90.0 to 91.8 degrees; samples are 0.36 degrees apart.
    expect(Math.min(...highDeg)).toBeGreaterThanOrEqual(90 - 1e-9);
    expect(Math.max(...highDeg)).toBeLessThan(91.8);
    expect(gate.deg.length).toBeLessThanOrEqual(120);
    for (let index = 1; index < gate.deg.length; index++) expect(gate.deg[index]).toBeGreaterThanOrEqual(gate.deg[index - 1]);
    const sync = foldTraceMinMax(blocks, 'sync', 0, 0.02, 60)!;
    // Sine peaks at 90 and 270 degrees: a bucket's max/min is the sample nearest (0.36 degree spacing: cos(0.36 deg) error below 2e-5).
    expect(Math.max(...sync.v)).toBeCloseTo(10, 3);
    expect(Math.min(...sync.v)).toBeCloseTo(-10, 3);
  });

  it('spans blocks and ignores samples outside the cycle', () => {
    const blocks = [block(0, 10_000, 150, mains), block(0.015, 10_000, 150, mains)];
    const ramp = foldTraceMinMax(blocks, 'ramp', 0, 0.02, 36)!;
    expect(ramp.deg[0]).toBe(0);
    expect(Math.max(...ramp.deg)).toBeLessThan(360);
    expect(Math.max(...ramp.v)).toBeCloseTo(6 * 199 / 200, 6);
  });
});

describe('sample ring and fold keeper', () => {
  it('holds only the last seconds, and a gap empties it', () => {
    const ring = createSampleRing({ keepS: 0.1 });
    for (let index = 0; index < 20; index++) ring.push(block(index * 0.02, 10_000, 200, mains));
    expect(ring.newestS()).toBeCloseTo(0.4, 9);
    expect(ring.lastSeconds(10).length).toBeLessThanOrEqual(6);
    expect(ring.blocksBetween(0, 0.2)).toEqual([]);
    ring.push(block(0.5, 10_000, 200, mains, true));
    expect(ring.lastSeconds(10)).toHaveLength(1);
  });

  it('folds a cycle with its markers in degrees and keeps the newest cycles', () => {
    const ring = createSampleRing({ keepS: 1 });
    ring.push(block(0, 25_000, 1000, mains));
    const folded = foldCycleFromRing(ring, { index: 0, startS: 0.02, endS: 0.04, zeroCrossingsS: [0.02, 0.03, 0.04], firingS: [0.025] }, 90)!;
    // Degrees from seconds in double precision: equal within 1e-9 degree.
    expect(folded.zeroCrossingsDeg).toHaveLength(3);
    [0, 180, 360].forEach((deg, index) => expect(folded.zeroCrossingsDeg[index]).toBeCloseTo(deg, 9));
    expect(folded.firingDeg).toHaveLength(1);
    expect(folded.firingDeg[0]).toBeCloseTo(90, 9);
    expect(folded.periodMs).toBeCloseTo(20, 9);
    const keeper = createFoldKeeper(3);
    for (let index = 0; index < 5; index++) keeper.add({ ...folded, index });
    expect(keeper.cycles().map((cycle) => cycle.index)).toEqual([2, 3, 4]);
  });
});

describe('createThrottle', () => {
  it('sends at most one value per interval and the latest one wins', () => {
    let nowMs = 0;
    const timers: Array<{ atMs: number; callback: () => void } | null> = [];
    const clock: ClockLike = {
      now: () => nowMs,
      setTimeout: (callback, delayMs) => timers.push({ atMs: nowMs + delayMs, callback }) - 1,
      clearTimeout: (handle) => (timers[handle as number] = null),
    };
    const advance = (toMs: number) => {
      nowMs = toMs;
      timers.forEach((timer, index) => {
        if (timer && timer.atMs <= nowMs) {
          timers[index] = null;
          timer.callback();
        }
      });
    };
    const sent: number[] = [];
    const throttle = createThrottle<number>((value) => sent.push(value), 50, clock);
    throttle.offer(1);
    for (let value = 2; value <= 10; value++) throttle.offer(value);
    advance(49);
    expect(sent).toEqual([1]);
    advance(50);
    expect(sent).toEqual([1, 10]);
    throttle.offer(11);
    throttle.flush();
    expect(sent).toEqual([1, 10, 11]);
  });
});
