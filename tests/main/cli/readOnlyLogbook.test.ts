// A read-only logbook: the probe saw every command crash with "attempt to write a readonly database" and a stack
// trace. Reading commands (log, report, export) open it read-only and work; writing commands (record, import)
// refuse at once, saying the file is read-only and who owns it. The commands run as a user who cannot write the
// file (root with its capabilities dropped, when the suite runs as root).
import Database from 'better-sqlite3';
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, readFileSync, statSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { runCliAsOtherUser, runsAsRoot } from '../../helpers/otherUser';
import { chargerDesign, cycleReading, tempFolder, type TempFolder } from '../store/storeFixtures';
import { runCli } from './cliRun';

/** The pid of a process that has just ended. */
function deadPid(): number {
  const child = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(child.stdout);
}

let folder: TempFolder;
let dbPath = '';
let archivePath = '';

beforeAll(async () => {
  folder = tempFolder('rampwright-readonly-');
  dbPath = folder.file('logbook.sqlite');
  const logbook = await openSqliteLogbook(dbPath);
  const writer = await logbook.startSession({ unitSerial: 'RW-0733', design: chargerDesign(), operator: 'bench 2' });
  writer.addCycle(cycleReading(0, { alphaDeg: 81 }));
  writer.addCycle(cycleReading(0.02, { alphaDeg: 83 }));
  await writer.close();
  // A second session whose recorder died: left open, its process gone. A writing opener would mark it interrupted;
  // that write is what made even `log` fail on a read-only or full logbook.
  const orphan = await logbook.startSession({ unitSerial: 'RW-0733', design: chargerDesign(), operator: 'bench 2' });
  orphan.addCycle(cycleReading(0, { alphaDeg: 82 }));
  await orphan.flush();
  await logbook.close();
  const raw = new Database(dbPath);
  raw.prepare('UPDATE sessions SET writer_pid = ? WHERE id = ?').run(deadPid(), orphan.sessionId);
  raw.close();
  // An archive to import, made before the logbook turns read-only.
  archivePath = folder.file('session.rwsession');
  expect((await runCli(['export', '--db', dbPath, '--session', '1', '--out', archivePath])).code).toBe(0);
  // The folder is the user's own (writable, so SQLite can keep its index file beside the logbook); the logbook is not.
  chmodSync(folder.path, 0o777);
  chmodSync(archivePath, 0o444);
  chmodSync(dbPath, 0o444);
});
afterAll(() => folder.remove());

describe('a read-only logbook', () => {
  it('log, report and export read it', async () => {
    const before = readFileSync(dbPath);
    const log = await runCliAsOtherUser(['log', '--db', dbPath, '--json']);
    expect(log.stderr).toBe('');
    expect(log.code).toBe(0);
    // The orphaned session shows as interrupted (what the next writer will store) without being written.
    expect((JSON.parse(log.stdout) as { sessions: Array<{ unit: string; cycles: number }> }).sessions).toMatchObject([
      { unit: 'RW-0733', cycles: 2, status: 'closed' },
      { unit: 'RW-0733', cycles: 1, status: 'interrupted' },
    ]);
    const report = await runCliAsOtherUser(['report', '--db', dbPath, '--session', '1', '--out', folder.file('record.html')]);
    expect(report.code, report.stderr).toBe(0);
    expect(readFileSync(folder.file('record.html'), 'utf8')).toContain('RW-0733');
    // The other user's own data folder holds its bench signing key.
    mkdirSync(folder.file('data'), { mode: 0o777 });
    chmodSync(folder.file('data'), 0o777);
    const exported = await runCliAsOtherUser(['export', '--db', dbPath, '--session', '1', '--out', folder.file('again.rwsession')], { env: { XDG_DATA_HOME: folder.file('data') } });
    expect(exported.code, exported.stderr).toBe(0);
    expect(statSync(folder.file('again.rwsession')).size).toBeGreaterThan(100);
    // Nothing was written to it.
    expect(readFileSync(dbPath).equals(before)).toBe(true);
  }, 60_000);

  it('record and import refuse at once, saying it is read-only and who owns it; no stack trace', async () => {
    const owner = runsAsRoot ? /owned by root \(uid 0\), mode r--r--r--/ : /owned by \S+ \(uid \d+\), mode r--r--r--/;
    const record = await runCliAsOtherUser(['record', '--port', folder.file('ttyACM0'), '--db', dbPath, '--unit', 'RW-0734', '--design', 'fixtures/boards/charger-ch50h.board.json']);
    const imported = await runCliAsOtherUser(['import', '--db', dbPath, archivePath]);
    for (const result of [record, imported]) {
      expect(result.code).toBe(2);
      expect(result.stderr).toContain(`${dbPath}: is read-only (`);
      expect(result.stderr).toMatch(owner);
      expect(result.stderr).toMatch(/reading commands \(log, report, export\) still work/);
      expect(result.stderr).not.toMatch(/\n\s+at |internal error/);
    }
    expect(existsSync(`${dbPath}-wal`) ? statSync(`${dbPath}-wal`).size : 0).toBe(0);
  }, 60_000);
});
