// Step logic as plain functions: which readings belong to which step, verdict rules, recorded vs live steps.
import { describe, expect, it } from 'vitest';
import { parseBoardDesign } from '../../../app/board/parseBoardDesign';
import { alphaForControl } from '../../../app/board/firingAngle';
import { predictRamp } from '../../../app/board/rampModel';
import type { CaptureReadings } from '../../../app/bench/readings';
import { controlRangeOf } from '../../../app/board/controlRange';
import { noExtremes } from '../../../main/session/benchPipeline';
import { currentStepOf, idealTransfer, measureSteps, readingFromCheck, recordStep, stepReports, type StepInputs } from '../../../main/session/steps';

// Our own scenario board (half-wave, 50 Hz, 6 V ramp).
const design = parseBoardDesign({
  name: 'Test board HW-6',
  mainsHz: 50,
  rectifier: 'half-wave',
  supplyV: 15,
  rampTargetV: 6,
  alphaMaxDeg: 165,
  parts: { rEmitter: { ohm: 7500, ref: 'R7' }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 }, rControlTop: { ohm: 18000 }, potControl: { ohm: 10000 } },
});

function readings(overrides: { peakV?: number; alphaDeg?: number; controlV?: number } = {}): CaptureReadings {
  const prediction = predictRamp(design);
  const controlV = overrides.controlV ?? 3;
  const alphaDeg = overrides.alphaDeg ?? alphaForControl(design, controlV)!;
  return {
    frequencyHz: 50.01,
    cycles: 40,
    ramp: { floorV: prediction.floorV, peakV: overrides.peakV ?? 6, slopeVPerMs: prediction.slopeVPerS / 1000, nonlinearityPct: 0.5, clipped: false, clippedIntervals: 0, chargingIntervals: 40, startDelayDeg: 360 * 50 * prediction.startDelayS, resetUs: 300, peakMinV: 5.9, peakMaxV: 6.1 },
    pulse: { count: 40, alphaDeg, alphaStdDeg: 0.1, alphaMinDeg: alphaDeg - 0.2, alphaMaxDeg: alphaDeg + 0.2, widthUs: 200, amplitudeV: 15, wrongHalfCycle: 0, missing: 0, multiplePulses: 0, gateLowV: 0, gateHighV: 15, controlV } as CaptureReadings['pulse'],
    transfer: null,
    perCycle: [],
    rectifier: 'half-wave',
    syncPhaseDeg: 0,
    sampleRateHz: 25000,
    durationS: 1,
    firingIntervals: 40,
    frequencyDriftHz: 0,
    frequencyDriftHzPerS: 0,
    periodJitterUs: 1,
    syncOffsetV: 0,
    syncAmplitudeV: 10,
    gaps: 0,
    invalidSamples: 0,
    balance: null,
  };
}

function inputs(overrides: Partial<StepInputs> = {}): StepInputs {
  return { design, window: readings(), transferFit: null, extremes: noExtremes, recorded: {}, recheckNeeded: false, trimsApplied: 0, signedOff: false, ...overrides };
}

describe('measureSteps', () => {
  it('waits for data before any verdict: every step "not measured yet", none can be recorded', () => {
    const steps = measureSteps(inputs({ window: null }));
    for (const step of ['sync', 'ramp', 'trim', 'transfer', 'limits'] as const) {
      expect(steps[step].status).toBe('waiting');
      expect(steps[step].verdict).toBe('not-measured');
      expect(recordStep(steps[step])).toMatchObject({ refused: expect.stringMatching(/nothing measured/) });
    }
    // The sign-off card: every earlier step "not measured yet", never a red cross for a step not recorded.
    expect(steps['sign-off'].readings.map((reading) => reading.verdict)).toEqual(['not-measured', 'not-measured', 'not-measured', 'not-measured', 'not-measured']);
  });

  it('gives the sync step no verdict on a dash: information readings carry none', () => {
    const steps = measureSteps(inputs());
    for (const reading of steps.sync.readings.filter((candidate) => candidate.key !== 'frequencyHz')) expect(reading.verdict).toBeNull();
    expect(steps.sync.verdict).toBe('in-tolerance');
  });

  it('puts each reading in its step and judges against the design (3 % ramp tolerance: 6.15 V in, 6.25 V out)', () => {
    const onTarget = measureSteps(inputs({ window: readings({ peakV: 6.05 }) }));
    expect(onTarget.sync.readings.map((reading) => reading.key)).toContain('frequencyHz');
    expect(onTarget.ramp.readings.map((reading) => reading.key)).toEqual(['rampPeakV', 'rampStartDelayDeg', 'rampClipped', 'slopeVPerMs', 'rampFloorV', 'nonlinearityPct', 'alphaJitterDeg']);
    // The control held (no transfer line in the window): its alpha spread is firing jitter, for information.
    expect(onTarget.ramp.readings.find((reading) => reading.key === 'alphaJitterDeg')).toMatchObject({ value: 0.1, verdict: null });
    expect(onTarget.ramp.verdict).toBe('in-tolerance');
    expect(onTarget.trim.note).toMatch(/no trim needed/);
    const peak = onTarget.ramp.readings[0];
    // Band is target +-3 %: 5.82 to 6.18 V.
    expect(peak.low).toBeCloseTo(5.82, 9);
    expect(peak.high).toBeCloseTo(6.18, 9);
    const short = measureSteps(inputs({ window: readings({ peakV: 5.5 }) }));
    expect(short.ramp.verdict).toBe('out-of-tolerance');
    expect(short.trim.note).toMatch(/open the trim plan/);
    expect(short.limits.readings.map((reading) => reading.key)).toEqual(['alphaMaxDeg', 'alphaMinDeg', 'pulseWidthUs', 'wrongHalfCyclePulses', 'missingPulses', 'multiplePulses']);
  });

  it('judges the transfer curve where its line meets the ends of the design\'s control range, once the sweep reached both', () => {
    const range = controlRangeOf(design);
    const lowDeg = alphaForControl(design, range.lowV)!;
    const highDeg = alphaForControl(design, range.highV)!;
    const gain = (highDeg - lowDeg) / (range.highV - range.lowV);
    // A fit that is exactly the model's line through the two ends, over a sweep that covered them.
    const fit = { points: 200, gainDegPerV: gain, offsetDeg: lowDeg - gain * range.lowV, maxDeviationDeg: 0.3, controlMinV: range.lowV, controlMaxV: range.highV, thinningErrorDeg: 0 };
    const steps = measureSteps(inputs({ transferFit: fit }));
    expect(steps.transfer.status).toBe('measuring');
    expect(steps.transfer.readings.slice(0, 2).map((reading) => [reading.key, reading.verdict])).toEqual([['alphaAtControlLowDeg', 'in-tolerance'], ['alphaAtControlHighDeg', 'in-tolerance']]);
    expect(steps.transfer.verdict).toBe('in-tolerance');
    // 5 degrees off at the top end, beyond the design's 2 degree alpha tolerance.
    const skewedGain = gain + 5 / (range.highV - range.lowV);
    const skewed = measureSteps(inputs({ transferFit: { ...fit, gainDegPerV: skewedGain, offsetDeg: lowDeg - skewedGain * range.lowV } }));
    expect(skewed.transfer.verdict).toBe('out-of-tolerance');
    // A sweep that stopped half way: the top end is not judged on an extrapolated line, and the step has no verdict.
    const half = measureSteps(inputs({ transferFit: { ...fit, controlMaxV: (range.lowV + range.highV) / 2 } }));
    expect(half.transfer.readings[1]).toMatchObject({ key: 'alphaAtControlHighDeg', value: null, verdict: 'not-measured' });
    expect(half.transfer.verdict).toBe('not-measured');
    expect(half.transfer.note).toMatch(/sweep on to the top/);
    expect(recordStep(half.transfer)).toMatchObject({ refused: expect.stringMatching(/not measured yet/) });
  });

  it('before a sweep the transfer step waits, its alpha at the control for information only', () => {
    const steps = measureSteps(inputs());
    expect(steps.transfer.status).toBe('waiting');
    expect(steps.transfer.verdict).toBe('not-measured');
    expect(steps.transfer.readings.map((reading) => [reading.key, reading.verdict])).toEqual([['alphaDeg', null]]);
  });

  it('judges the limits only once the control reached both ends of its range, from the alpha seen inside it', () => {
    const range = controlRangeOf(design);
    const swept = { ...noExtremes, alphaMinDeg: 12, alphaMaxDeg: 170, controlMinV: range.lowV, controlMaxV: range.highV, cycles: 300 };
    const steps = measureSteps(inputs({ extremes: swept }));
    const alphaMax = steps.limits.readings.find((reading) => reading.key === 'alphaMaxDeg')!;
    expect(alphaMax.value).toBe(170);
    // 165 deg limit, 2 deg tolerance: 5 deg past it is out of tolerance.
    expect(alphaMax.verdict).toBe('out-of-tolerance');
    expect(alphaMax.high).toBe(167);
    expect(alphaMax.low).toBeNull();
    // The control held at one voltage: the same alpha extremes are not the board's limits; nothing is judged.
    const held = measureSteps(inputs({ extremes: { ...swept, controlMinV: 3, controlMaxV: 3.1 } }));
    expect(held.limits.readings.filter((reading) => reading.key === 'alphaMaxDeg' || reading.key === 'alphaMinDeg').map((reading) => reading.verdict)).toEqual(['not-measured', 'not-measured']);
    expect(held.limits.verdict).toBe('not-measured');
    expect(held.limits.note).toMatch(/turn the control to both ends/);
    // Cycles fired below the range are left out, and the step says how many.
    expect(measureSteps(inputs({ extremes: { ...swept, cyclesBelowRange: 12 } })).limits.note).toMatch(/12 cycles fired below/);
  });

  it('with a load in the design, the limits step judges latching at the largest alpha and gives the load voltage range', () => {
    // A 230 V heater of our own: 50 ohm resistive, thyristor latching at 60 mA.
    const heater = parseBoardDesign({ ...design, load: { mainsRmsV: 230, ohm: 50, latchingCurrentA: 0.06 } });
    const heaterRange = controlRangeOf(heater);
    const steps = measureSteps(inputs({ design: heater, extremes: { ...noExtremes, alphaMinDeg: 30, alphaMaxDeg: 160, controlMinV: heaterRange.lowV, controlMaxV: heaterRange.highV, cycles: 300 } }));
    const byKey = (key: string) => steps.limits.readings.find((reading) => reading.key === key)!;
    // Resistive load: no inductance to wait for, so no minimum width; the note says why.
    expect(byKey('pulseLatchUs')).toMatchObject({ value: 200, expected: null, low: null, high: null, verdict: 'in-tolerance' });
    expect(byKey('pulseLatchUs').note).toContain('resistive load');
    // Half-wave average into a resistor, V_m/(2 pi) (1 + cos alpha) (any power-electronics handbook): at 30 deg
    // 325.27/6.2832 x 1.8660 = 96.60 V; at 160 deg 51.768 x 0.060307 = 3.122 V (hand values).
    expect(byKey('loadAtAlphaMinV').value).toBeCloseTo(96.60, 1);
    expect(byKey('loadAtAlphaMaxV').value).toBeCloseTo(3.122, 2);
    expect(byKey('loadAtAlphaMaxV').verdict).toBeNull();
    // The design's own limits give the expected values: alpha min 0 deg (default) is the whole half-wave, 0.45 x 230 V.
    expect(byKey('loadAtAlphaMinV').expected).toBeCloseTo(0.45 * 230, 0);
    // Without a load the step has neither reading.
    expect(measureSteps(inputs()).limits.readings.map((reading) => reading.key)).not.toContain('pulseLatchUs');
  });
});

describe('recorded steps and the step flow', () => {
  it('keeps recorded steps, reopens ramp and trim after a fitted change, and moves the current step on', () => {
    const live = measureSteps(inputs());
    const recorded = { sync: { ...live.sync, status: 'done' as const }, ramp: { ...live.ramp, status: 'done' as const } };
    expect(currentStepOf({ recorded, recheckNeeded: false, signedOff: false })).toBe('trim');
    expect(currentStepOf({ recorded, recheckNeeded: true, signedOff: false })).toBe('ramp');
    const shown = stepReports(inputs({ recorded, recheckNeeded: true }));
    expect(shown.find((step) => step.step === 'sync')?.status).toBe('done');
    expect(shown.find((step) => step.step === 'ramp')?.status).toBe('measuring');
    expect(shown.find((step) => step.step === 'trim')?.verdict).toBe('not-measured');
  });

  it('the sign-off card shows each step as recorded, or "not measured yet" while it is not', () => {
    const live = measureSteps(inputs({ window: readings({ peakV: 6.5 }) }));
    const recorded = { sync: { ...live.sync, status: 'done' as const }, ramp: { ...live.ramp, status: 'done' as const } };
    const signOff = measureSteps(inputs({ recorded }))['sign-off'];
    expect(signOff.readings.map((reading) => [reading.key, reading.verdict])).toEqual([
      ['syncVerdict', 'in-tolerance'], ['rampVerdict', 'out-of-tolerance'], ['trimVerdict', 'not-measured'], ['transferVerdict', 'not-measured'], ['limitsVerdict', 'not-measured'],
    ]);
    expect(signOff.note).toMatch(/needs a written reason for: Check ramp: out of tolerance \(Ramp peak\); Trim if needed: not recorded/);
  });

  it('shows a yes/no check with words instead of a number', () => {
    const reading = readingFromCheck({ key: 'rampClipped', label: 'Ramp clipping', measured: true, expected: false, toleranceAbs: null, unit: '', verdict: 'out-of-tolerance', note: null });
    expect(reading).toMatchObject({ value: null, expected: null, note: 'yes', verdict: 'out-of-tolerance' });
  });
});

describe('idealTransfer', () => {
  it('follows the model from the ramp floor to the pot top, alpha rising with control', () => {
    const line = idealTransfer(design);
    expect(line.length).toBeGreaterThan(30);
    for (let index = 1; index < line.length; index++) expect(line[index].alphaDeg).toBeGreaterThan(line[index - 1].alphaDeg);
    // Control divider top: 15 V * 10000 / (18000 + 10000) (REFERENCES.md: divider; controlDivider.ts).
    expect(line[line.length - 1].controlV).toBeCloseTo((15 * 10000) / 28000, 6);
  });
});
