import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { controlLimitsOf } from '../../../app/board/controlDivider';
import { boardDesignSchema } from '../../../app/board/design';
import { alphaForControl, alphaRangeOf, controlForAlpha } from '../../../app/board/firingAngle';
import { predictRamp } from '../../../app/board/rampModel';
import { designArbitrary } from './boardArbitraries';

// The example of issue 3 with a stiff Early voltage so the ramp is straight enough for a hand calculation.
const board = boardDesignSchema.parse({
  name: 'example', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 5.5, alphaMaxDeg: 165,
  parts: {
    rEmitter: { ohm: 7500 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 },
    rControlTop: { ohm: 18000, ref: 'R9' }, potControl: { ohm: 10000, ref: 'RV1' },
  },
  transistor: { vebV: 0.65, beta: 150, earlyV: 1000 },
});

describe('firing angle (ramp-and-comparator, common practice)', () => {
  it('matches a hand calculation on a nearly straight ramp', () => {
    // Hand: I_C = 150/151 x 269.70 uA = 267.91 uA, slope 570.0 V/s, floor 10 ohm x I_C = 2.68 mV.
    // 2.85 V is reached (2.85 - 0.00268)/570.0 = 4.9955 ms after the ramp starts, which is 150 us after the crossing:
    // alpha = 360 x 50 x (0.150 + 4.9955) ms = 92.62 deg. 0.3 deg covers the 0.3 % droop left at V_A = 1000 V.
    expect(alphaForControl(board, 2.85)).toBeCloseTo(92.62, 0);
    expect(Math.abs((alphaForControl(board, 2.85) ?? 0) - 92.62)).toBeLessThan(0.3);
  });

  it('adds the sync lag: the ramp is timed from the sync, which lags the mains', () => {
    const lagging = boardDesignSchema.parse({ ...board, syncPhaseDeg: 5 });
    expect((alphaForControl(lagging, 2.85) ?? 0) - (alphaForControl(board, 2.85) ?? 0)).toBeCloseTo(5, 9);
  });

  it('no pulse when the control is above the ramp or at/below its floor', () => {
    const prediction = predictRamp(board);
    expect(alphaForControl(board, prediction.peakV + 0.01, { prediction })).toBeNull();
    expect(alphaForControl(board, prediction.floorV, { prediction })).toBeNull();
    expect(controlForAlpha(board, 179, { prediction })).toBeNull();
    const range = alphaRangeOf(board, prediction);
    expect(range.startDeg).toBeCloseTo(2.7, 9); // 150 us x 18000 deg/s
    expect(range.endDeg).toBeCloseTo(177.3, 9);
  });

  it('property: controlForAlpha inverts alphaForControl and alpha rises with the control voltage', () => {
    fc.assert(
      fc.property(designArbitrary, fc.double({ min: 0.05, max: 0.95, noNaN: true }), (design, fraction) => {
        const prediction = predictRamp(design);
        const range = alphaRangeOf(design, prediction);
        const alphaDeg = range.startDeg + fraction * (range.endDeg - range.startDeg);
        const controlV = controlForAlpha(design, alphaDeg, { prediction });
        expect(controlV).not.toBeNull();
        // On the saturated tail of a clipped ramp the level hardly changes, so a level does not fix an instant there.
        if ((controlV ?? 0) > prediction.clipV) return;
        const back = alphaForControl(design, controlV ?? 0, { prediction });
        expect(back).not.toBeNull();
        expect(Math.abs((back ?? 0) - alphaDeg)).toBeLessThan(1e-6);
        const higher = alphaForControl(design, (controlV ?? 0) * 0.99 + prediction.floorV * 0.01, { prediction });
        if (higher !== null) expect(higher).toBeLessThanOrEqual((back ?? 0) + 1e-9);
      }),
      { numRuns: 150 },
    );
  });
});

describe('control divider', () => {
  it('largest control voltage is V pot/(top + pot) (voltage divider)', () => {
    // 15 x 10000/28000 = 5.3571 V.
    const limits = controlLimitsOf(board);
    expect(limits.controlMaxV).toBeCloseTo(5.3571, 4);
    expect(limits.alphaMaxDeg).not.toBeNull();
  });

  it('the limit resistor fitted exactly puts the pot end on alphaMaxDeg', () => {
    const limits = controlLimitsOf(board);
    expect(limits.limitResistorOhm).not.toBeNull();
    const fitted = controlLimitsOf(board, { partOverrides: { rControlTop: limits.limitResistorOhm ?? 0 } });
    expect(fitted.alphaMaxDeg).toBeCloseTo(165, 6);
    // A larger top resistor lowers the pot's end, so alpha max falls.
    const larger = controlLimitsOf(board, { partOverrides: { rControlTop: (limits.limitResistorOhm ?? 0) * 1.1 } });
    expect(larger.alphaMaxDeg ?? 0).toBeLessThan(165);
  });

  it('without a top resistor the pot reaches the supply, past the ramp: the board can stop firing', () => {
    const bare = boardDesignSchema.parse({ ...board, parts: { ...board.parts, rControlTop: undefined } });
    const limits = controlLimitsOf(bare);
    expect(limits.controlMaxV).toBe(15);
    expect(limits.alphaMaxDeg).toBeNull();
  });
});
