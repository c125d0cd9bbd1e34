// 10^4 mutated session archives through `rampwright import`: each run ends in a clear outcome (commandFuzz.ts),
// and whatever was imported reads back in the logbook's own views.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSqliteLogbook } from '../../main/store/sqliteLogbook';
import { tempFolder, type TempFolder } from '../main/store/storeFixtures';
import { fuzzArchives } from './archiveFuzz';
import { clearOutcomeProblem, fuzzRuns, fuzzSeed } from './commandFuzz';

let folder: TempFolder;
beforeAll(() => {
  folder = tempFolder('rampwright-fuzz-archives-');
});
afterAll(() => folder.remove());

describe('mutated archives through the command line', () => {
  it('every run ends with exit 0 and finite output, or exit 2 in words; every session imported can be viewed', async () => {
    const result = await fuzzArchives(folder.path, fuzzRuns(), fuzzSeed());
    expect(result.failures, `seed ${result.seed}`).toEqual([]);
    expect(result.ran).toBe(fuzzRuns());
    const db = folder.file('target.sqlite');
    const logbook = await openSqliteLogbook(db);
    const sessions = await logbook.listSessions();
    await logbook.close();
    expect(sessions.length).toBeGreaterThan(0);
    for (const session of sessions) {
      expect(await clearOutcomeProblem(['report', '--db', db, '--session', String(session.id), '--out', folder.file(`record-${session.id}.html`)])).toBeNull();
    }
    expect(await clearOutcomeProblem(['log', '--db', db, '--json'])).toBeNull();
  }, 600_000);
});
