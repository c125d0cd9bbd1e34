// One control range for the transfer sweep and the Limits step, from the board model and the design's limits.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { controlEndsSeen, controlRangeOf, controlWithinRange } from '../../../app/board/controlRange';
import { controlLimitsOf } from '../../../app/board/controlDivider';
import { parseBoardDesign } from '../../../app/board/parseBoardDesign';
import { alphaForControl } from '../../../app/board/firingAngle';

const design = (name: string) => parseBoardDesign(JSON.parse(readFileSync(new URL(`../../../fixtures/boards/${name}.board.json`, import.meta.url), 'utf8')), name);

describe('controlRangeOf', () => {
  for (const name of ['charger-ch50h', 'field-fd50f', 'heater-ht60f']) {
    it(`${name}: fires at the design's smallest alpha at the low end and stops at the pot's top`, () => {
      const board = design(name);
      const range = controlRangeOf(board);
      // Low end: the board model fires exactly at alphaMinDeg there (1e-6 deg: the model inverted both ways).
      expect(range.alphaAtLowDeg).toBeCloseTo(board.alphaMinDeg, 6);
      // High end: the control divider's top, V pot/(top + pot) (controlDivider.ts).
      expect(range.highV).toBeCloseTo(controlLimitsOf(board).controlMaxV, 12);
      expect(range.alphaAtHighDeg).toBeCloseTo(alphaForControl(board, range.highV)!, 12);
      // The top stays inside the design's largest alpha: following the range never passes the Limits step's limit.
      expect(range.alphaAtHighDeg!).toBeLessThanOrEqual(board.alphaMaxDeg);
      // The end margin moves alpha by the design's alpha tolerance along the line through the two ends.
      const gain = (range.alphaAtHighDeg! - range.alphaAtLowDeg!) / (range.highV - range.lowV);
      expect(range.endMarginV * gain).toBeCloseTo(board.tolerances.alphaDeg, 9);
    });
  }

  it('a sweep has seen an end when its control came within the margin, or (no control channel) its alpha did', () => {
    const range = controlRangeOf(design('charger-ch50h'));
    const sweep = { controlMinV: range.lowV + 0.5 * range.endMarginV, controlMaxV: range.highV - 0.5 * range.endMarginV, alphaMinDeg: null, alphaMaxDeg: null };
    expect(controlEndsSeen(range, sweep)).toEqual({ low: true, high: true });
    expect(controlEndsSeen(range, { ...sweep, controlMinV: range.lowV + 2 * range.endMarginV })).toEqual({ low: false, high: true });
    expect(controlEndsSeen(range, { ...sweep, controlMaxV: (range.lowV + range.highV) / 2 })).toEqual({ low: true, high: false });
    const byAlpha = { controlMinV: null, controlMaxV: null, alphaMinDeg: range.alphaAtLowDeg! + 1, alphaMaxDeg: range.alphaAtHighDeg! - 1 };
    expect(controlEndsSeen(range, byAlpha)).toEqual({ low: true, high: true });
    expect(controlEndsSeen(range, { ...byAlpha, alphaMaxDeg: 90 })).toEqual({ low: true, high: false });
    expect(controlEndsSeen(range, { controlMinV: null, controlMaxV: null, alphaMinDeg: null, alphaMaxDeg: null })).toEqual({ low: false, high: false });
  });

  it('leaves out control below the low end, beyond a quarter of the margin', () => {
    const range = controlRangeOf(design('charger-ch50h'));
    expect(controlWithinRange(range, range.lowV)).toBe(true);
    expect(controlWithinRange(range, range.lowV - 0.2 * range.endMarginV)).toBe(true);
    expect(controlWithinRange(range, range.lowV - 0.3 * range.endMarginV)).toBe(false);
    expect(controlWithinRange(range, 0.17)).toBe(false);
    expect(controlWithinRange(range, range.highV + 1)).toBe(true);
  });
});
