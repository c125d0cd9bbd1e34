// Step logic as plain functions: which readings belong to which step, verdict rules, recorded vs live steps.
import { describe, expect, it } from 'vitest';
import { parseBoardDesign } from '../../../app/board/parseBoardDesign';
import { alphaForControl } from '../../../app/board/firingAngle';
import { predictRamp } from '../../../app/board/rampModel';
import type { CaptureReadings } from '../../../app/bench/readings';
import { currentStepOf, idealTransfer, measureSteps, readingFromCheck, stepReports, worstVerdict, type StepInputs } from '../../../main/session/steps';

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
  return { design, window: readings(), transferFit: null, extremes: { alphaMinDeg: null, alphaMaxDeg: null, cycles: 0 }, recorded: {}, recheckNeeded: false, trimsApplied: 0, signedOff: false, ...overrides };
}

describe('measureSteps', () => {
  it('waits for data before any verdict', () => {
    const steps = measureSteps(inputs({ window: null }));
    for (const step of ['sync', 'ramp', 'trim', 'transfer', 'limits'] as const) {
      expect(steps[step].status).toBe('waiting');
      expect(steps[step].verdict).toBeNull();
    }
  });

  it('puts each reading in its step and judges against the design (3 % ramp tolerance: 6.15 V in, 6.25 V out)', () => {
    const onTarget = measureSteps(inputs({ window: readings({ peakV: 6.05 }) }));
    expect(onTarget.sync.readings.map((reading) => reading.key)).toContain('frequencyHz');
    expect(onTarget.ramp.readings.map((reading) => reading.key)).toEqual(['rampPeakV', 'rampStartDelayDeg', 'rampClipped', 'slopeVPerMs', 'rampFloorV', 'nonlinearityPct']);
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

  it('judges the transfer curve at both ends of the sweep against the model', () => {
    // A fit that is exactly the model's line through two of its points: both ends in tolerance.
    const lowV = 1;
    const highV = 5;
    const lowDeg = alphaForControl(design, lowV)!;
    const highDeg = alphaForControl(design, highV)!;
    const gain = (highDeg - lowDeg) / (highV - lowV);
    const fit = { points: 200, gainDegPerV: gain, offsetDeg: lowDeg - gain * lowV, maxDeviationDeg: 0.3, controlMinV: lowV, controlMaxV: highV, thinningErrorDeg: 0 };
    const steps = measureSteps(inputs({ transferFit: fit }));
    expect(steps.transfer.status).toBe('measuring');
    expect(steps.transfer.readings.slice(0, 2).map((reading) => reading.verdict)).toEqual(['in-tolerance', 'in-tolerance']);
    // 5 degrees off at the top end, beyond the design's 2 degree alpha tolerance.
    const skewed = measureSteps(inputs({ transferFit: { ...fit, gainDegPerV: gain + 5 / (highV - lowV), offsetDeg: lowDeg - (gain + 5 / (highV - lowV)) * lowV } }));
    expect(skewed.transfer.verdict).toBe('out-of-tolerance');
  });

  it('uses the swept alpha extremes for the limits', () => {
    const steps = measureSteps(inputs({ extremes: { alphaMinDeg: 12, alphaMaxDeg: 170, cycles: 300 } }));
    const alphaMax = steps.limits.readings.find((reading) => reading.key === 'alphaMaxDeg')!;
    expect(alphaMax.value).toBe(170);
    // 165 deg limit, 2 deg tolerance: 5 deg past it is out of tolerance.
    expect(alphaMax.verdict).toBe('out-of-tolerance');
    expect(alphaMax.high).toBe(167);
    expect(alphaMax.low).toBeNull();
  });

  it('with a load in the design, the limits step judges latching at the largest alpha and gives the load voltage range', () => {
    // A 230 V heater of our own: 50 ohm resistive, thyristor latching at 60 mA.
    const heater = parseBoardDesign({ ...design, load: { mainsRmsV: 230, ohm: 50, latchingCurrentA: 0.06 } });
    const steps = measureSteps(inputs({ design: heater, extremes: { alphaMinDeg: 30, alphaMaxDeg: 160, cycles: 300 } }));
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
    expect(shown.find((step) => step.step === 'trim')?.verdict).toBeNull();
  });

  it('takes the worst verdict', () => {
    expect(worstVerdict(['in-tolerance', null, 'marginal'])).toBe('marginal');
    expect(worstVerdict(['marginal', 'out-of-tolerance', 'in-tolerance'])).toBe('out-of-tolerance');
    expect(worstVerdict([null, null])).toBeNull();
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
