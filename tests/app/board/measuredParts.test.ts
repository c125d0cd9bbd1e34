import { describe, expect, it } from 'vitest';
import { boardDesignSchema } from '../../../app/board/design';
import { checkMeasuredParts, describeMeasuredParts, parseMeasuredParts, partRoleNamed } from '../../../app/board/measuredParts';
import { inputErrorOf } from '../../helpers/inputError';

function expectInputError(action: () => unknown, where: string, words: string): void {
  const error = inputErrorOf(action);
  expect(error.where).toBe(where);
  expect(error.message).toContain(words);
}

// A board of our own: R7 emitter, R5/R6 divider, C3 ramp capacitor, no control parts named.
const board = boardDesignSchema.parse({
  name: 'bench board', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 6, alphaMaxDeg: 165,
  parts: { rEmitter: { ohm: 7500, ref: 'R7' }, rBiasTop: { ohm: 22000, ref: 'R5' }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7, ref: 'C3' } },
  transistor: { vebV: 0.65, beta: 150, earlyV: 60 },
});

describe('measured part values', () => {
  it('names a part by role in any case or by its designator', () => {
    expect(partRoleNamed(board, 'R7')).toBe('rEmitter');
    expect(partRoleNamed(board, 'r7')).toBe('rEmitter');
    expect(partRoleNamed(board, 'REMITTER')).toBe('rEmitter');
    expect(partRoleNamed(board, 'c3')).toBe('cRamp');
    expect(partRoleNamed(board, 'R6')).toBeNull();
  });

  it('parses values as printed on parts', () => {
    expect(parseMeasuredParts(board, ['R7=5k1', 'rBiasBottom=82k', 'C3=560n'])).toEqual({ rEmitter: 5100, rBiasBottom: 82000, cRamp: 5.6e-7 });
    expect(parseMeasuredParts(board, [])).toEqual({});
  });

  it('refuses what is not a measurement of this board, naming it', () => {
    expectInputError(() => parseMeasuredParts(board, ['5k1']), '--part', 'is not DESIGNATOR=VALUE');
    expectInputError(() => parseMeasuredParts(board, ['R7=five']), '--part', '"five" in "R7=five" is not a part value');
    expectInputError(() => parseMeasuredParts(board, ['R9=1k']), '--part', '"R9" is not a part of the design bench board');
    // 5.1 ohm for a 7.5 kohm part: a forgotten k.
    expectInputError(() => parseMeasuredParts(board, ['R7=5.1']), '--part', 'the measured emitter resistor R7 5R1 is more than 10 times off its design value 7k5');
    expectInputError(() => parseMeasuredParts(board, ['C3=560']), '--part', 'more than 10 times off');
    expectInputError(() => parseMeasuredParts(board, ['R7=5k1', 'rEmitter=6k8']), '--part', 'the emitter resistor R7 is given twice');
    expectInputError(() => parseMeasuredParts(board, ['R7=5k1', 'R7=6k8']), '--part', 'the emitter resistor R7 is given twice');
    // The design names no control resistor: nothing to measure there.
    expectInputError(() => checkMeasuredParts(board, { rControlTop: 8200 }, 'measuredParts'), 'measuredParts', 'has no control limit resistor');
    expectInputError(() => checkMeasuredParts(board, { R7: -1 }, 'measuredParts'), 'measuredParts', 'must be a positive number');
    expectInputError(() => checkMeasuredParts(board, { R7: Number.NaN }, 'measuredParts'), 'measuredParts', 'must be a positive number');
  });

  it('says in words what the planner was told', () => {
    expect(describeMeasuredParts(board, { rEmitter: 5100, cRamp: 5.6e-7, rBiasBottom: 82000 })).toEqual(['emitter resistor R7 taken as 5k1', 'ramp capacitor C3 taken as 560n', 'lower bias resistor taken as 82k']);
  });
});
