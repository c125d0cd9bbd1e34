import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../app/errors';
import { loadBoardDesign, saveBoardDesign } from '../../../main/board/loadBoardDesign';

let folder = '';
const fixture = join(__dirname, '../../../fixtures/boards/heater-ht60f.board.json');

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-board-'));
});
afterAll(() => rmSync(folder, { recursive: true, force: true }));

async function faultOf(path: string): Promise<InputError> {
  try {
    await loadBoardDesign(path);
  } catch (error) {
    if (error instanceof InputError) return error;
    throw error;
  }
  throw new Error('expected an InputError');
}

describe('loadBoardDesign', () => {
  it('loads a demo design with its refs', async () => {
    const design = await loadBoardDesign(fixture);
    expect(design.name).toBe('Heater firing board HT-60F (demo)');
    expect(design.parts.rEmitter.ref).toBe('R7');
    expect(design.mainsHz).toBe(60);
  });

  it('names the file for missing files, folders, bad JSON and bad text', async () => {
    const missing = await faultOf(join(folder, 'none.board.json'));
    expect(missing.message).toContain('none.board.json: no such board design file');
    mkdirSync(join(folder, 'adir.board.json'));
    expect((await faultOf(join(folder, 'adir.board.json'))).message).toContain('is a folder');
    writeFileSync(join(folder, 'broken.board.json'), '{ "name": "x", ');
    expect((await faultOf(join(folder, 'broken.board.json'))).message).toMatch(/broken\.board\.json: not valid JSON/);
    writeFileSync(join(folder, 'latin.board.json'), Buffer.from([0x7b, 0xe9, 0x7d]));
    expect((await faultOf(join(folder, 'latin.board.json'))).message).toContain('not UTF-8');
  });

  it('names the file and the field for content faults', async () => {
    writeFileSync(join(folder, 'cutoff.board.json'), JSON.stringify({
      name: 'cut off', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 6, alphaMaxDeg: 160,
      parts: { rEmitter: { ohm: 7500 }, rBiasTop: { ohm: 1000 }, rBiasBottom: { ohm: 1e6 }, cRamp: { farad: 4.7e-7 } },
    }));
    const error = await faultOf(join(folder, 'cutoff.board.json'));
    expect(error.message).toContain('cutoff.board.json');
    expect(error.message).toContain('field parts.rBiasBottom.ohm');
    expect(error.message).toContain('cut off');
  });

  it('saves a design that loads back equal', async () => {
    const design = await loadBoardDesign(fixture);
    const path = join(folder, 'copy.board.json');
    await saveBoardDesign(path, design);
    expect(await loadBoardDesign(path)).toEqual(design);
  });
});
