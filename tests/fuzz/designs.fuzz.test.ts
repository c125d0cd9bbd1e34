// 10^4 mutated board designs (fields replaced by out-of-range or wrong-typed values, removed, duplicated; bytes
// changed) through `rampwright analyze`, `trim` and `sim`: each run ends in a clear outcome (commandFuzz.ts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tempFolder, type TempFolder } from '../main/store/storeFixtures';
import { fuzzRuns, fuzzSeed } from './commandFuzz';
import { fuzzDesigns } from './designFuzz';

let folder: TempFolder;
beforeAll(() => {
  folder = tempFolder('rampwright-fuzz-designs-');
});
afterAll(() => folder.remove());

describe('mutated designs through the command line', () => {
  it('every run ends with exit 0 and finite output, or exit 2 in words', async () => {
    const result = await fuzzDesigns(folder.path, fuzzRuns(), fuzzSeed());
    expect(result.failures, `seed ${result.seed}`).toEqual([]);
    expect(result.ran).toBe(fuzzRuns());
  }, 600_000);
});
