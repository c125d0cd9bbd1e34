/**
 * Each board fault shows what its one-line description promises, measured from the outside and checked
 * against the board model or a hand computation.
 */
import { describe, expect, it } from 'vitest';
import { alphaForControl } from '../../../app/board/firingAngle';
import { predictRamp, rampVoltageAt } from '../../../app/board/rampModel';
import { isInputError } from '../../../app/errors';
import { faultDescriptions, faultNames, parseFaults, type FaultName } from '../../../app/sim/faults';
import { createVirtualBoard } from '../../../app/sim/virtualBoard';
import { fallingCrossings, fullWaveBoard, gateEdges, halfWaveBoard, join, mean, peaksBetween, risingCrossings } from './simFixtures';

const rateHz = 25_000;
const clean = { sampleRateHz: rateHz, noiseV: 0, adcBits: 16, seed: 11 } as const;
const design = halfWaveBoard();
const nominal = predictRamp(design);

function run(faults: FaultName[], extra: Record<string, unknown> = {}) {
  const board = createVirtualBoard(design, { ...clean, faults, ...extra });
  return { board, signals: join([board.nextBlock(25_000)]) };
}

function medianPeak(signals: ReturnType<typeof join>): number {
  const peaks = peaksBetween(signals.ramp, risingCrossings(signals.sync)).sort((a, b) => a - b);
  return peaks[Math.floor(peaks.length / 2)];
}

describe('board faults', () => {
  it('wrong-emitter-resistor: the ramp is about two thirds as tall, as the divider-biased source predicts', () => {
    const { signals, board } = run(['wrong-emitter-resistor']);
    // Malvino: I_E = (V - V_TH - V_EB)/(R_E + R_TH/(beta+1)). R_TH = 22k || 100k = 18.03 kohm, /151 = 119 ohm.
    // Slope ratio (7500 + 119)/(11250 + 119) = 0.670; the Early effect and floor move it by well under 2 %.
    expect(medianPeak(signals) / nominal.peakV).toBeGreaterThan(0.670 * 0.98);
    expect(medianPeak(signals) / nominal.peakV).toBeLessThan(0.670 * 1.02);
    // And exactly the model's peak for the part as fitted, within one sample of slope plus two codes.
    const fitted = predictRamp(design, { partOverrides: { rEmitter: 11250 } });
    expect(Math.abs(medianPeak(signals) - fitted.peakV)).toBeLessThan(fitted.slopeVPerS / rateHz + 2 * board.channels[1].gainV);
  });

  it('capacitor-low: the ramp is 1/0.7 = 1.43 times as tall and fires earlier', () => {
    const { signals, board } = run(['capacitor-low']);
    // Slope = I/C (REFERENCES.md): C x 0.7 gives 1.429 times the rise; 2 % for the Early effect.
    expect(medianPeak(signals) / nominal.peakV).toBeGreaterThan(1.429 * 0.98);
    expect(medianPeak(signals) / nominal.peakV).toBeLessThan(1.429 * 1.02);
    const expected = alphaForControl(design, board.controlAt(0), { partOverrides: { cRamp: 4.7e-7 * 0.7 } })!;
    expect(expected).toBeLessThan(80);
    const rising = risingCrossings(signals.sync);
    const edge = gateEdges(signals.gate, design.supplyV)[5];
    const crossing = rising.filter((each) => each <= edge).at(-1)!;
    expect(Math.abs((360 * 50 * (edge - crossing)) / rateHz - expected)).toBeLessThanOrEqual((360 * 50) / rateHz + 0.01);
  });

  it('sync-phase-shift: the ramp starts and fires 20 degrees later after the sync zero crossing', () => {
    const shifted = run(['sync-phase-shift']).signals;
    const plain = run([]).signals;
    const alphaOf = (signals: ReturnType<typeof join>) => {
      const rising = risingCrossings(signals.sync);
      const edge = gateEdges(signals.gate, design.supplyV)[10];
      return (360 * 50 * (edge - rising.filter((each) => each <= edge).at(-1)!)) / rateHz;
    };
    // Both readings are known to one sample (0.72 deg), so their difference to two samples.
    expect(Math.abs(alphaOf(shifted) - alphaOf(plain) - 20)).toBeLessThanOrEqual(2 * 0.72);
  });

  it('missing-pulses: some cycles do not fire, while the ramp is still there', () => {
    const { signals } = run(['missing-pulses']);
    const pulses = gateEdges(signals.gate, design.supplyV).length;
    // One in five skipped on average over 50 cycles: far from 0 and from 50 for any seed (binomial, 50 x 0.2 = 10 +- 2.8).
    expect(pulses).toBeLessThan(48);
    expect(pulses).toBeGreaterThan(30);
    expect(peaksBetween(signals.ramp, risingCrossings(signals.sync)).every((peak) => peak > 0.9 * nominal.peakV)).toBe(true);
  });

  it('wrong-half-cycle-pulses: a second pulse in every negative half-cycle, 180 degrees after the right one', () => {
    const { signals } = run(['wrong-half-cycle-pulses']);
    const edges = gateEdges(signals.gate, design.supplyV);
    expect(edges).toHaveLength(100);
    const falling = fallingCrossings(signals.sync);
    const inNegativeHalf = edges.filter((edge) => {
      const lastFalling = falling.filter((each) => each <= edge).at(-1) ?? -Infinity;
      const lastRising = risingCrossings(signals.sync).filter((each) => each <= edge).at(-1) ?? -Infinity;
      return lastFalling > lastRising;
    });
    expect(inNegativeHalf).toHaveLength(50);
    // Spacing of one half-cycle (10 ms = 250 samples) within one sample.
    expect(Math.abs(edges[1] - edges[0] - 250)).toBeLessThanOrEqual(1);
  });

  it('clipped-ramp: the model says clipped, and the ramp flattens before the half-cycle ends', () => {
    const { signals, board } = run(['clipped-ramp']);
    expect(board.fitted.prediction.clipped).toBe(true);
    const rising = risingCrossings(signals.sync);
    const start = Math.ceil(rising[2]) + 10;
    const lengthSamples = Math.floor(board.fitted.prediction.chargingIntervalS * rateHz) - 20;
    const early = (signals.ramp[start + 50] - signals.ramp[start]) / 50;
    const late = (signals.ramp[start + lengthSamples] - signals.ramp[start + lengthSamples - 50]) / 50;
    // A linear ramp keeps its slope; a clipped one ends much flatter (the saturated approach of the model).
    expect(late).toBeLessThan(0.5 * early);
  });

  it('sync-offset: a full-wave board fires its positive half-cycle 2 asin(0.03) = 3.44 degrees before its negative one', () => {
    const board = fullWaveBoard();
    const signals = join([createVirtualBoard(board, { ...clean, faults: ['sync-offset'] }).nextBlock(25_000)]);
    // The mains crossings are the offset sine's crossings of its own mean (the sync's default peak is 10 V, the
    // offset 3 % of it); each pulse's alpha from the crossing before it, by polarity.
    const centred = signals.sync.map((value) => value - 0.3);
    const crossings = [...risingCrossings(centred).map((at) => ({ at, positive: true })), ...fallingCrossings(centred).map((at) => ({ at, positive: false }))].sort((a, b) => a.at - b.at);
    const alphas = { positive: [] as number[], negative: [] as number[] };
    for (const edge of gateEdges(signals.gate, board.supplyV)) {
      const before = crossings.filter((crossing) => crossing.at <= edge).at(-1);
      if (before) (before.positive ? alphas.positive : alphas.negative).push((360 * 60 * (edge - before.at)) / rateHz);
    }
    const expectedDeg = -2 * Math.asin(0.03) * (180 / Math.PI);
    // Edges are whole samples (0.86 deg at 60 Hz and 25 kS/s): the two means to one sample.
    expect(Math.abs(mean(alphas.positive) - mean(alphas.negative) - expectedDeg)).toBeLessThanOrEqual((360 * 60) / rateHz);
    // The positive half charges 4 asin(0.03) degrees longer, so its ramp is taller: peaks between the resets, which
    // sit at the raw sync's own crossings, within a sample of slope.
    const resets = [...risingCrossings(signals.sync).map((at) => ({ at, positive: true })), ...fallingCrossings(signals.sync).map((at) => ({ at, positive: false }))].sort((a, b) => a.at - b.at);
    const peaks = peaksBetween(signals.ramp, resets.map((reset) => reset.at));
    const positivePeaks = peaks.filter((_, index) => resets[index].positive);
    const negativePeaks = peaks.filter((_, index) => !resets[index].positive);
    // The model's ramp at the end of the two charging times (this board runs near its clipping level, so the
    // longer half gains less than the shorter one loses).
    const ramp = predictRamp(board);
    const shiftS = Math.asin(0.03) / (2 * Math.PI * 60);
    const expectedV = rampVoltageAt(ramp, ramp.chargingIntervalS + 2 * shiftS) - rampVoltageAt(ramp, ramp.chargingIntervalS - 2 * shiftS);
    expect(expectedV).toBeGreaterThan(0.1);
    expect(Math.abs(mean(positivePeaks) - mean(negativePeaks) - expectedV)).toBeLessThan(ramp.slopeVPerS / rateHz);
  });

  it('every fault has a one-line description, and fault words parse with clear errors', () => {
    for (const name of faultNames) {
      expect(faultDescriptions[name].length).toBeGreaterThan(20);
      expect(faultDescriptions[name]).not.toContain('\n');
      expect(name).toMatch(/^[a-z]+(-[a-z]+)*$/);
    }
    expect(parseFaults(['noisy-sync', 'drop-blocks', 'unplug-after=2.5'])).toEqual({ board: ['noisy-sync'], link: ['drop-blocks', 'unplug-after'], unplugAfterS: 2.5 });
    const message = (words: string[]) => {
      try {
        parseFaults(words);
      } catch (error) {
        expect(isInputError(error)).toBe(true);
        return String(error);
      }
      return '';
    };
    expect(message(['blown-fuse'])).toMatch(/unknown fault "blown-fuse"; known faults: wrong-emitter-resistor/);
    expect(message(['unplug-after'])).toMatch(/unplug-after needs the seconds/);
    expect(message(['noisy-sync=3'])).toMatch(/takes no value/);
  });
});
