import { describe, expect, it } from 'vitest';
import { boardDesignSchema } from '../../../app/board/design';
import { parseQuantity } from '../../../app/board/parseQuantity';
import { partValueText, readMeasuredFields } from '../../../renderer/shaping/measuredPartsForm';

// A board of our own.
const board = boardDesignSchema.parse({
  name: 'bench board', mainsHz: 60, rectifier: 'half-wave', supplyV: 12, rampTargetV: 5, alphaMaxDeg: 160,
  parts: { rEmitter: { ohm: 3300, ref: 'R12' }, rBiasTop: { ohm: 4700 }, rBiasBottom: { ohm: 22000 }, cRamp: { farad: 6.8e-7 } },
  transistor: { vebV: 0.62, beta: 220, earlyV: 35 },
});

describe('measured parts fields', () => {
  it('writes known values back the way they are typed, and they read back the same', () => {
    for (const [role, value, text] of [['rEmitter', 8200, '8k2'], ['rEmitter', 5100, '5k1'], ['rBiasBottom', 1.5e6, '1M5'], ['cRamp', 4.7e-7, '470n'], ['cRamp', 2.2e-6, '2u2'], ['rBiasTop', 330, '330R'], ['rEmitter', 6650, '6k65']] as const) {
      expect(partValueText(role, value)).toBe(text);
      expect(parseQuantity(partValueText(role, value))).toBeCloseTo(value, 15);
    }
  });

  it('reads filled fields, skips blank ones, and names what is wrong beside the field', () => {
    const result = readMeasuredFields(board, { rEmitter: ' 3k9 ', rBiasTop: '', cRamp: '0.56u', rBiasBottom: 'twenty' });
    expect(result.measured).toEqual({ rEmitter: 3900, cRamp: 5.6e-7 });
    expect(result.problems.rBiasBottom).toBe('"twenty" is not a part value: write it as marked, for example 5k1 or 470R');
    const slipped = readMeasuredFields(board, { rEmitter: '3.3', cRamp: '680' });
    expect(slipped.measured).toEqual({});
    expect(slipped.problems.rEmitter).toMatch(/^the measured emitter resistor R12 3R3 is more than 10 times off its design value 3k3/);
    expect(slipped.problems.cRamp).toContain('more than 10 times off');
  });
});
