import fc from 'fast-check';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { validateBoardPhysics } from '../../../app/board/boardPhysics';
import { parseBoardDesign } from '../../../app/board/parseBoardDesign';
import { predictRamp } from '../../../app/board/rampModel';
import { InputError } from '../../../app/errors';

// The example design of issue 3 (our own scenario).
const example = {
  name: 'Example board', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 5.5, alphaMaxDeg: 165, syncPhaseDeg: 0,
  parts: {
    rEmitter: { ohm: 7500, tolerancePct: 5, ref: 'R7' },
    rBiasTop: { ohm: 22000, tolerancePct: 5 },
    rBiasBottom: { ohm: 100000, tolerancePct: 5 },
    cRamp: { farad: 4.7e-7, tolerancePct: 10 },
    rDischarge: { ohm: 27 }, rControlTop: { ohm: 18000 }, potControl: { ohm: 10000 },
  },
  transistor: { vebV: 0.65, beta: 150, earlyV: 60 },
  tolerances: { rampPeakPct: 3, alphaDeg: 2, startDelayDeg: 3 },
};

function withChange(change: (design: typeof example) => void): unknown {
  const copy = structuredClone(example);
  change(copy);
  return copy;
}

function errorOf(json: unknown): InputError {
  try {
    parseBoardDesign(json, 'boards/example.board.json');
  } catch (error) {
    if (error instanceof InputError) return error;
    throw error;
  }
  throw new Error('expected an InputError');
}

describe('parseBoardDesign', () => {
  it('accepts the example and fills documented defaults', () => {
    const design = parseBoardDesign(example);
    expect(design.parts.rEmitter.ref).toBe('R7');
    expect(design.syncResetUs).toBe(300);
    expect(design.transistor.vecSatV).toBe(0.2);
    expect(design.ambientC).toEqual({ minC: 0, maxC: 50 });
    const minimal = parseBoardDesign(withChange((copy) => delete (copy as Partial<typeof example>).transistor));
    expect(minimal.transistor).toEqual({ vebV: 0.65, beta: 150, earlyV: 60, vecSatV: 0.2 });
  });

  it('names the file and the field path of schema faults', () => {
    const negative = errorOf(withChange((copy) => (copy.parts.rEmitter.ohm = -7500)));
    expect(negative.message).toContain('boards/example.board.json');
    expect(negative.message).toContain('field parts.rEmitter.ohm');
    expect(negative.message).toContain('must be from 1R0 to 10M');
    // The part in words beside the key to edit, with the designator the file gives it.
    expect(negative.message).toContain(`field parts.rEmitter.ohm (emitter resistor ${example.parts.rEmitter.ref}):`);
    const missing = errorOf(withChange((copy) => delete (copy.parts as Partial<typeof example.parts>).cRamp));
    expect(missing.message).toContain('field parts.cRamp');
    const mains = errorOf(withChange((copy) => (copy.mainsHz = 400)));
    expect(mains.message).toContain('field mainsHz: mains frequency must be 45-65 Hz');
    const junction = errorOf(withChange((copy) => (copy.transistor = { ...copy.transistor, beta: -3 })));
    expect(junction.message).toContain('field transistor.beta (ramp transistor):');
    expect(errorOf(null).message).toContain('(whole design)');
  });

  it('rejects a divider that cuts the transistor off, naming the physics', () => {
    // R1 1 kohm, R2 1 Mohm: V_TH = 15 x 1000/1001 = 14.985 V, and 14.985 + 0.65 > 15 V.
    const error = errorOf(withChange((copy) => { copy.parts.rBiasTop.ohm = 1000; copy.parts.rBiasBottom.ohm = 1e6; }));
    expect(error.message).toContain('field parts.rBiasBottom.ohm');
    expect(error.message).toContain('cut off');
    expect(error.message).toContain('14.99 V');
  });

  it('rejects a target at or above the supply, and above the compliance limit', () => {
    expect(errorOf(withChange((copy) => (copy.rampTargetV = 16))).message).toMatch(/field rampTargetV: .*cannot be charged from a 15 V supply/);
    // Emitter near 12.95 V (V_TH 12.295 + V_EB 0.65), so clipping near 12.75 V: a 13.5 V target cannot be reached.
    const above = errorOf(withChange((copy) => (copy.rampTargetV = 13.5)));
    expect(above.message).toMatch(/field rampTargetV: the current source saturates at 12\.\d+ V/);
  });

  it('rejects alphaMaxDeg past the end of the ramp', () => {
    // Ramp ends at 180 - 360 x 50 x 150 us = 177.3 deg.
    const error = errorOf(withChange((copy) => (copy.alphaMaxDeg = 178)));
    expect(error.message).toContain('field alphaMaxDeg');
    expect(error.message).toContain('177.3 deg');
  });

  it('warns (not rejects) when the parts miss the target or the reset cannot discharge the capacitor', () => {
    const offTarget = parseBoardDesign(withChange((copy) => (copy.rampTargetV = 7)));
    const problems = validateBoardPhysics(offTarget);
    expect(problems.every((problem) => problem.severity === 'warning')).toBe(true);
    expect(problems.find((problem) => problem.field === 'parts.rEmitter.ohm')?.message).toContain('from the 7 V target');
    const slowReset = validateBoardPhysics(parseBoardDesign(withChange((copy) => (copy.parts.rDischarge.ohm = 1000))));
    expect(slowReset.some((problem) => problem.field === 'parts.rDischarge.ohm')).toBe(true);
  });

  it('the demo fixtures parse and their parts land within tolerance of their targets', () => {
    const folder = join(__dirname, '../../../fixtures/boards');
    const files = readdirSync(folder).filter((name) => name.endsWith('.board.json'));
    expect(files.length).toBeGreaterThanOrEqual(3);
    for (const name of files) {
      const design = parseBoardDesign(JSON.parse(readFileSync(join(folder, name), 'utf8')), name);
      const prediction = predictRamp(design);
      expect(Math.abs(prediction.peakV / design.rampTargetV - 1) * 100, name).toBeLessThanOrEqual(design.tolerances.rampPeakPct);
      expect(validateBoardPhysics(design).filter((problem) => problem.severity === 'error'), name).toEqual([]);
    }
  });

  it('property: any JSON gives a design or an InputError, never another exception', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (json) => {
        try {
          parseBoardDesign(json);
        } catch (error) {
          expect(error).toBeInstanceOf(InputError);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('property: perturbed valid designs give a design or an InputError naming a field', () => {
    const numbers = fc.oneof(fc.double(), fc.integer({ min: -1e7, max: 1e7 }), fc.constant(0));
    fc.assert(
      fc.property(numbers, numbers, numbers, numbers, (emitter, bottom, target, supply) => {
        const json = withChange((copy) => {
          copy.parts.rEmitter.ohm = emitter;
          copy.parts.rBiasBottom.ohm = bottom;
          copy.rampTargetV = target;
          copy.supplyV = supply;
        });
        try {
          const design = parseBoardDesign(json);
          expect(Number.isFinite(predictRamp(design).peakV)).toBe(true);
        } catch (error) {
          expect(error).toBeInstanceOf(InputError);
          expect((error as InputError).message).toMatch(/field [a-zA-Z.]+/);
        }
      }),
      { numRuns: 200 },
    );
  });
});
