// 10^4 mutated captures (CSV, COMTRADE pairs, single files) through `rampwright analyze`: each run ends in a clear
// outcome (commandFuzz.ts). A failure prints its seed; RAMPWRIGHT_FUZZ_SEED replays it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tempFolder, type TempFolder } from '../main/store/storeFixtures';
import { fuzzRuns, fuzzSeed } from './commandFuzz';
import { fuzzCaptures } from './captureFuzz';

let folder: TempFolder;
beforeAll(() => {
  folder = tempFolder('rampwright-fuzz-captures-');
});
afterAll(() => folder.remove());

describe('mutated captures through the command line', () => {
  it('every run ends with exit 0 and finite output, or exit 2 in words', async () => {
    const result = await fuzzCaptures(folder.path, fuzzRuns(), fuzzSeed());
    expect(result.failures, `seed ${result.seed}`).toEqual([]);
    expect(result.ran).toBe(fuzzRuns());
  }, 600_000);
});
