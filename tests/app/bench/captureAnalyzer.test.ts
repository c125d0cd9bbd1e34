import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { SampleBlock } from '../../../app/capture/samples';
import { createCaptureAnalyzer, type CaptureAnalyzerOptions } from '../../../app/bench/captureAnalyzer';
import type { CaptureReadings, CycleReading } from '../../../app/bench/readings';
import { synthesize, type SyntheticBoard } from './syntheticBoard';

function analyze(blocks: readonly SampleBlock[], options: CaptureAnalyzerOptions): { readings: CaptureReadings; live: CycleReading[] } {
  const analyzer = createCaptureAnalyzer(options);
  const live: CycleReading[] = [];
  for (const block of blocks) live.push(...analyzer.push(block));
  return { readings: analyzer.finish(), live };
}

function mean(values: number[]): number {
  return values.reduce((sum, value) => sum + value, 0) / values.length;
}

/** Cuts the blocks' samples into blocks of the given sizes (cycled). */
function recut(blocks: readonly SampleBlock[], sizes: number[]): SampleBlock[] {
  const join = (key: 'sync' | 'ramp' | 'gate'): Float64Array => Float64Array.from(blocks.flatMap((block) => Array.from(block[key])));
  const sync = join('sync');
  const ramp = join('ramp');
  const gate = join('gate');
  const rate = blocks[0].sampleRateHz;
  const out: SampleBlock[] = [];
  let from = 0;
  let s = 0;
  while (from < sync.length) {
    const to = Math.min(sync.length, from + sizes[s++ % sizes.length]);
    out.push({ startS: from / rate, sampleRateHz: rate, sync: sync.slice(from, to), ramp: ramp.slice(from, to), gate: gate.slice(from, to), control: null, afterGap: false });
    from = to;
  }
  return out;
}

describe('createCaptureAnalyzer on synthetic boards (closed-form truth)', () => {
  const fullWave: SyntheticBoard = {
    rectifier: 'full-wave', frequencyHz: 50, sampleRateHz: 10007, durationS: 1.5, startPhaseDeg: 23, alphaDeg: 64,
    rampFloorV: 0.15, slopeVPerMs: 0.75, resetUs: 300, pulseWidthUs: 300, noiseV: 0.005, bits: 12, seed: 11,
  };

  it('full-wave 50 Hz: frequency, ramp, alpha, width and counts', () => {
    const { blocks, truth } = synthesize(fullWave);
    const { readings, live } = analyze(blocks, { rectifier: 'full-wave' });
    expect(readings.frequencyHz).toBeCloseTo(50, 3);
    // One firing interval per half-cycle; the one still open at the end is not complete.
    expect(readings.firingIntervals).toBe(truth.intervalStartsS.length - 1);
    expect(live).toHaveLength(readings.firingIntervals);
    expect(readings.pulse.count).toBe(readings.firingIntervals);
    expect(readings.pulse.missing).toBe(0);
    expect(readings.pulse.wrongHalfCycle).toBe(0);
    expect(readings.pulse.multiplePulses).toBe(0);
    // Peak: floor + slope (half-cycle - reset) = 0.15 + 0.75 * 9.7 = 7.425 V; 12-bit LSB 5.9 mV and 5 mV noise.
    expect(readings.ramp.peakV).toBeCloseTo(7.425, 2);
    expect(readings.ramp.floorV).toBeCloseTo(0.15, 2);
    expect(readings.ramp.slopeVPerMs).toBeCloseTo(0.75, 3);
    // Start: half the reset after the crossing = 150 us = 2.7 deg at 50 Hz.
    expect(readings.ramp.startDelayDeg).toBeCloseTo(2.7, 1);
    expect(readings.ramp.resetUs).toBeCloseTo(300, -1);
    expect(readings.ramp.clipped).toBe(false);
    // Alpha from a step edge: within half a sample (360 * 50 / 10007 / 2 = 0.9 deg) per cycle; the mean far better
    // because this rate is not locked to the mains (REFERENCES.md: firing-angle reading from a step-like edge).
    expect(Math.abs((readings.pulse.alphaDeg ?? 0) - 64)).toBeLessThan(0.1);
    expect((readings.pulse.alphaMaxDeg ?? 0) - 64).toBeLessThan(0.9 + 0.05);
    expect(64 - (readings.pulse.alphaMinDeg ?? 0)).toBeLessThan(0.9 + 0.05);
    // Width from two sampled edges: each within half a sample (50 us); mean over cycles close to 300 us.
    expect(Math.abs((readings.pulse.widthUs ?? 0) - 300)).toBeLessThan(15);
    expect(readings.pulse.gateHighV).toBeCloseTo(5, 1);
    expect(readings.transfer).toBeNull();
    expect(readings.perCycle).toHaveLength(readings.firingIntervals);
    // Every interval starts at a true zero crossing (within a microsecond).
    for (const reading of live) {
      const nearest = truth.intervalStartsS.reduce((best, startS) => (Math.abs(startS - reading.t) < Math.abs(best - reading.t) ? startS : best));
      // 5 mV noise at the sync slope of 1571 V/s is 3.2 us per sample; the fit over about 100 band samples cuts that
      // to about 0.4 us, so 3 us is a 7-sigma bound.
      expect(Math.abs(nearest - reading.t)).toBeLessThan(3e-6);
    }
  });

  it('gives the same readings however the samples are cut into blocks (property)', () => {
    const { blocks } = synthesize({ ...fullWave, durationS: 0.5, blockSamples: 1000 });
    const reference = analyze(blocks, { rectifier: 'full-wave' }).readings;
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: 3000 }), { minLength: 1, maxLength: 8 }), (sizes) => {
        expect(analyze(recut(blocks, sizes), { rectifier: 'full-wave' }).readings).toEqual(reference);
      }),
      { numRuns: 12 },
    );
  });

  it('half-wave 60 Hz: fires from the rising crossing; stray and missing pulses are counted', () => {
    const board: SyntheticBoard = {
      rectifier: 'half-wave', frequencyHz: 60, sampleRateHz: 20000, durationS: 1, startPhaseDeg: 300, alphaDeg: 120, strayPulseDeg: 250, missingEvery: 5,
      rampFloorV: 0.4, slopeVPerMs: 1.2, resetUs: 200, noiseV: 0.01, bits: 10, seed: 4,
    };
    const { blocks, truth } = synthesize(board);
    const { readings } = analyze(blocks, { rectifier: 'half-wave' });
    expect(readings.frequencyHz).toBeCloseTo(60, 3);
    expect(readings.firingIntervals).toBe(truth.intervalStartsS.length - 1);
    // Every interval has its stray pulse in the negative half; every fifth interval lacks its firing pulse.
    const complete = truth.alphaDeg.slice(0, readings.firingIntervals);
    expect(readings.pulse.wrongHalfCycle).toBe(readings.firingIntervals);
    expect(readings.pulse.missing).toBe(complete.filter((alpha) => Number.isNaN(alpha)).length);
    expect(readings.pulse.count).toBe(readings.firingIntervals + complete.filter((alpha) => !Number.isNaN(alpha)).length);
    expect(readings.pulse.alphaDeg).toBeCloseTo(120, 0);
    // Ramp charges over the positive half only: 0.4 + 1.2 * (8.333 - 0.2) ms.
    expect(readings.ramp.peakV).toBeCloseTo(0.4 + 1.2 * (1000 / 120 - 0.2), 1);
    expect(readings.ramp.chargingIntervals).toBe(readings.firingIntervals);
  });

  it('a swept control voltage gives the transfer curve', () => {
    const { blocks } = synthesize({
      rectifier: 'full-wave', frequencyHz: 50, sampleRateHz: 25000, durationS: 2, alphaDeg: 0,
      transfer: { offsetDeg: 12, gainDegPerV: 21.5, controlFromV: 0.5, controlToV: 7 }, noiseV: 0.002, bits: 14,
    });
    const { readings } = analyze(blocks, { rectifier: 'full-wave' });
    expect(readings.transfer).not.toBeNull();
    expect(readings.transfer?.points).toBe(readings.firingIntervals);
    expect(readings.transfer?.gainDegPerV).toBeCloseTo(21.5, 1);
    expect(readings.transfer?.offsetDeg).toBeCloseTo(12, 0);
    // Residuals are the sampling of the edges: within half a sample, 0.36 deg at 25 kS/s.
    expect(readings.transfer?.maxDeviationDeg).toBeLessThan(0.4);
    expect(readings.transfer?.controlMinV).toBeGreaterThan(0.5);
    expect(readings.transfer?.controlMaxV).toBeLessThan(7);
    const points = readings.perCycle.filter((cycle) => cycle.controlV !== null);
    expect(points.length).toBe(readings.firingIntervals);
  });

  it('a clipped ramp is flagged and its peak is the clip level', () => {
    const { blocks } = synthesize({ ...fullWave, clipV: 5.5 });
    const { readings } = analyze(blocks, { rectifier: 'full-wave' });
    expect(readings.ramp.clipped).toBe(true);
    expect(readings.ramp.clippedIntervals).toBe(readings.ramp.chargingIntervals);
    expect(readings.ramp.peakV).toBeCloseTo(5.5, 2);
  });

  it('the sync phase correction refers angles back to the mains crossing', () => {
    const { blocks } = synthesize(fullWave);
    const plain = analyze(blocks, { rectifier: 'full-wave' }).readings;
    const corrected = analyze(blocks, { rectifier: 'full-wave', syncPhaseDeg: 8.5 }).readings;
    expect((corrected.pulse.alphaDeg ?? 0) - (plain.pulse.alphaDeg ?? 0)).toBeCloseTo(8.5, 9);
    expect((corrected.ramp.startDelayDeg ?? 0) - (plain.ramp.startDelayDeg ?? 0)).toBeCloseTo(8.5, 9);
  });

  it('never joins across a gap: no interval spans it, and the frequency stays right', () => {
    const { blocks } = synthesize({ ...fullWave, blockSamples: 500 });
    // Drop blocks 12-14 (about 0.15 s) and flag the next as after a gap.
    const withGap = [...blocks.slice(0, 12), { ...blocks[15], afterGap: true }, ...blocks.slice(16)];
    const { readings, live } = analyze(withGap, { rectifier: 'full-wave' });
    expect(readings.gaps).toBe(1);
    expect(readings.frequencyHz).toBeCloseTo(50, 3);
    for (const reading of live) expect(reading.periodS).toBeCloseTo(0.02, 4);
    expect(readings.pulse.missing).toBe(0);
    // A block whose start time jumps without the flag is a gap too.
    const jumped = [...blocks.slice(0, 12), ...blocks.slice(15)];
    expect(analyze(jumped, { rectifier: 'full-wave' }).readings.gaps).toBe(1);
  });

  it('tracks drifting mains frequency', () => {
    const { blocks } = synthesize({ ...fullWave, frequencyHz: 49.5, driftHzPerS: 0.5, durationS: 2 });
    const { readings } = analyze(blocks, { rectifier: 'full-wave' });
    expect(readings.frequencyDriftHzPerS).toBeCloseTo(0.5, 2);
    // Mean frequency over the run: about 49.5 + 0.5 * 1 s.
    expect(readings.frequencyHz).toBeCloseTo(50, 1);
  });

  it('a dead sync gives no cycles and no crash; short captures still finish', () => {
    const { blocks } = synthesize({ ...fullWave, syncAmplitudeV: 0, noiseV: 0.001, durationS: 0.3 });
    const { readings } = analyze(blocks, { rectifier: 'full-wave' });
    expect(readings.frequencyHz).toBeNull();
    expect(readings.cycles).toBe(0);
    expect(readings.firingIntervals).toBe(0);
    const empty = createCaptureAnalyzer({ rectifier: 'half-wave' }).finish();
    expect(empty.cycles).toBe(0);
    expect(empty.ramp.peakV).toBeNull();
  });

  it('a sync that comes alive after the first levels were learned is found in a later window, whatever the blocks', () => {
    const { blocks, truth } = synthesize(fullWave);
    // The sync probe is clipped on at 0.55 s: before that the channel shows only a few millivolts of noise.
    const liveFromS = 0.55;
    const late = blocks.map((block) => {
      const sync = Float64Array.from(block.sync, (value, index) => (block.startS + index / block.sampleRateHz < liveFromS ? 0.002 * Math.sin(index) : value));
      return { ...block, sync };
    });
    const { readings } = analyze(late, { rectifier: 'full-wave' });
    // Windows of 0.2 s in samples: [0, 0.2) learns nothing, [0.2, 0.4) nothing, [0.4, 0.6) finds the sync, and
    // crossings are tracked from the end of that window on.
    const trackedFromS = (3 * Math.round(0.2 * fullWave.sampleRateHz)) / fullWave.sampleRateHz;
    expect(readings.frequencyHz).toBeCloseTo(50, 3);
    expect(readings.firingIntervals).toBe(truth.intervalStartsS.filter((startS) => startS > trackedFromS).length - 1);
    expect(readings.ramp.peakV).toBeCloseTo(7.425, 2);
    expect(readings.pulse.alphaDeg).toBeCloseTo(64, 0);
    // The same readings however the samples are cut.
    expect(analyze(recut(late, [37, 1000, 5, 4096]), { rectifier: 'full-wave' }).readings).toEqual(readings);
  });

  it('keepPerCycle false keeps the summary and drops the per-interval list', () => {
    const { blocks } = synthesize({ ...fullWave, durationS: 0.6 });
    const kept = analyze(blocks, { rectifier: 'full-wave' }).readings;
    const dropped = analyze(blocks, { rectifier: 'full-wave', keepPerCycle: false }).readings;
    expect(dropped.perCycle).toHaveLength(0);
    expect({ ...dropped, perCycle: kept.perCycle }).toEqual(kept);
    expect(mean(kept.perCycle.map((cycle) => cycle.alphaDeg ?? 0))).toBeCloseTo(kept.pulse.alphaDeg ?? 0, 9);
  });
});

describe('createCaptureAnalyzer on hostile input (property)', () => {
  it('never throws, whatever the values, block sizes, gaps and rates; readings stay finite or null', () => {
    const value = fc.oneof(
      fc.double({ min: -50, max: 50, noNaN: true }),
      fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, 0, 1e300, -1e300),
    );
    const block = fc.record({
      length: fc.integer({ min: 0, max: 400 }),
      afterGap: fc.boolean(),
      rate: fc.constantFrom(5000, 20000, 200000),
      values: fc.array(value, { minLength: 1, maxLength: 16 }),
      sine: fc.boolean(),
    });
    fc.assert(
      fc.property(fc.array(block, { minLength: 1, maxLength: 12 }), fc.constantFrom('half-wave' as const, 'full-wave' as const), (specs, rectifier) => {
        const analyzer = createCaptureAnalyzer({ rectifier, warmupS: 0.01 });
        let startS = 0;
        for (const spec of specs) {
          const pick = (i: number, salt: number): number => spec.values[(i * 7 + salt) % spec.values.length];
          const make = (salt: number): Float64Array =>
            Float64Array.from({ length: spec.length }, (_, i) => (spec.sine && salt === 0 ? 5 * Math.sin((2 * Math.PI * 50 * (startS * spec.rate + i)) / spec.rate) : pick(i, salt)));
          analyzer.push({ startS, sampleRateHz: spec.rate, sync: make(0), ramp: make(1), gate: make(2), control: spec.length % 2 === 0 ? make(3) : null, afterGap: spec.afterGap });
          startS += spec.length / spec.rate;
        }
        const readings = analyzer.finish();
        const numbers = [readings.frequencyHz, readings.ramp.peakV, readings.ramp.floorV, readings.ramp.slopeVPerMs, readings.pulse.alphaDeg, readings.pulse.widthUs, readings.periodJitterUs];
        for (const number of numbers) expect(number === null || Number.isFinite(number)).toBe(true);
        expect(JSON.parse(JSON.stringify(readings)).cycles).toBe(readings.cycles);
      }),
      { numRuns: 150 },
    );
  });
});
