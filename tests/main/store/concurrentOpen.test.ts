// Several recorders creating the same new logbook at once: the probe saw one fail with "table board_designs
// already exists" and lose its session. Every process here starts at the same instant on a fresh file; each must
// record its session, and the logbook must hold them all under one schema.
import { spawn } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openLogbook } from '../../../main/store/openLogbook';
import { latestSchemaVersion } from '../../../main/store/schema';
import { chargerDesign, tempFolder, type TempFolder } from './storeFixtures';

let folder: TempFolder;
beforeAll(() => {
  folder = tempFolder('rampwright-concurrent-');
});
afterAll(() => folder.remove());

function runChild(dbPath: string, startAtMs: number, unit: string): Promise<{ code: number | null; output: string }> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'tests/main/store/concurrentOpenChild.ts', dbPath, JSON.stringify(chargerDesign()), String(startAtMs), unit], { cwd: process.cwd(), stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  child.stdout.setEncoding('utf8').on('data', (chunk: string) => (output += chunk));
  child.stderr.setEncoding('utf8').on('data', (chunk: string) => (output += chunk));
  return new Promise((resolve) => child.on('exit', (code) => resolve({ code, output })));
}

describe('a new logbook opened by several processes at once', () => {
  it('each of 5 processes records its session (twice); the schema is made once', async () => {
    for (let round = 0; round < 2; round += 1) {
      const dbPath = folder.file(`round-${round}.sqlite`);
      // Far enough ahead for every process to have loaded before the agreed instant.
      const startAtMs = Date.now() + 6000;
      const units = Array.from({ length: 5 }, (_, index) => `RW-C${round}${index}`);
      const results = await Promise.all(units.map((unit) => runChild(dbPath, startAtMs, unit)));
      for (const result of results) {
        expect(result.output).toMatch(/^ok \d+\n$/);
        expect(result.code).toBe(0);
      }
      const logbook = await openLogbook(dbPath, { mustExist: true });
      const sessions = await logbook.listSessions();
      await logbook.close();
      expect(sessions.map((row) => row.unit).sort()).toEqual(units);
      expect(sessions.every((row) => row.status === 'closed' && row.cycles === 1)).toBe(true);
      const { default: Database } = await import('better-sqlite3');
      const db = new Database(dbPath, { readonly: true });
      expect(db.pragma('user_version', { simple: true })).toBe(latestSchemaVersion);
      expect((db.prepare('SELECT count(*) AS n FROM board_designs').get() as { n: number }).n).toBe(1);
      db.close();
    }
  }, 120_000);
});
