// A damaged logbook: the probe overwrote inner pages and got stack traces for some sessions and silence for
// others. Here the cycle pages of one session of six are overwritten: commands say the logbook is damaged and how
// to salvage it; `salvage` names what SQLite's integrity check finds and which sessions can be read, and copies
// the readable ones into a new logbook, whole (their content hashes unchanged).
import Database from 'better-sqlite3';
import { closeSync, openSync, readFileSync, writeSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { chargerDesign, cycleReading, tempFolder, type TempFolder } from '../store/storeFixtures';
import { runCli } from './cliRun';

let folder: TempFolder;
let damaged = '';
const hashes = new Map<number, string>();

beforeAll(async () => {
  folder = tempFolder('rampwright-salvage-');
  damaged = folder.file('damaged.sqlite');
  const logbook = await openSqliteLogbook(damaged);
  for (let session = 1; session <= 6; session += 1) {
    const writer = await logbook.startSession({ unitSerial: `RW-05${session}0`, design: chargerDesign(), operator: 'bench 5', startedAt: new Date(Date.UTC(2026, 2, session, 9)) });
    for (let index = 0; index < 600; index += 1) writer.addCycle(cycleReading(index * 0.02, { alphaDeg: 80 + session + (index % 7) * 0.1 }));
    writer.addLinkEvent('crc-failures', 'a few', 2);
    await writer.close();
    hashes.set(session, await logbook.sessionContentHash(session));
  }
  await logbook.close();
  // The leaf pages of the cycles table in key order (session, seq); overwrite three in the middle of session 3's.
  const db = new Database(damaged, { readonly: true });
  const pageSize = db.pragma('page_size', { simple: true }) as number;
  const leaves = (db.prepare("SELECT pageno FROM dbstat WHERE name = 'cycles' AND pagetype = 'leaf' ORDER BY path").all() as Array<{ pageno: number }>).map((row) => row.pageno);
  db.close();
  const perSession = leaves.length / 6;
  const middleOfThird = Math.floor(2.5 * perSession);
  const fd = openSync(damaged, 'r+');
  let seed = 7;
  for (const pageno of leaves.slice(middleOfThird - 1, middleOfThird + 2)) {
    const garbage = Buffer.alloc(pageSize);
    for (let index = 0; index < pageSize; index += 1) {
      seed = (seed * 1103515245 + 12345) >>> 0;
      garbage[index] = seed >>> 24;
    }
    writeSync(fd, garbage, 0, pageSize, (pageno - 1) * pageSize);
  }
  closeSync(fd);
});
afterAll(() => folder.remove());

describe('a damaged logbook', () => {
  it('report of the damaged session says so in words and points to salvage; an intact session still reports', async () => {
    const broken = await runCli(['report', '--db', damaged, '--session', '3', '--out', folder.file('three.html')]);
    expect(broken.code).toBe(2);
    expect(broken.stderr).toContain(`${damaged}: is damaged (SQLite finds malformed pages): run rampwright salvage --db ${damaged}`);
    expect(broken.stderr).not.toMatch(/\n\s+at |internal error/);
    const intact = await runCli(['report', '--db', damaged, '--session', '5', '--out', folder.file('five.html')]);
    expect(intact.code, intact.stderr).toBe(0);
    expect(readFileSync(folder.file('five.html'), 'utf8')).toContain('RW-0550');
  });

  it('salvage names the damage and which sessions can be read (exit 2), changing nothing', async () => {
    const before = readFileSync(damaged);
    const check = await runCli(['salvage', '--db', damaged]);
    expect(check.code).toBe(2);
    expect(check.stdout).toMatch(/SQLite's integrity check finds the file damaged \(\d+( or more)? problems\)/);
    expect(check.stdout).toContain('5 of 6 sessions can be read whole:');
    expect(check.stdout).toMatch(/session 3 \(unit RW-0530, 2026-03-03 09:00:00Z\): cannot be read: its rows sit on damaged pages/);
    for (const id of [1, 2, 4, 5, 6]) expect(check.stdout).toMatch(new RegExp(`session ${id} \\(unit RW-05${id}0, [^)]*\\): readable`));
    expect(check.stdout).toContain(`rampwright salvage --db ${damaged} --into <new file>`);
    expect(readFileSync(damaged).equals(before)).toBe(true);
  });

  it('salvage --into copies the readable sessions whole into a new logbook', async () => {
    const into = folder.file('rescued.sqlite');
    const result = await runCli(['salvage', '--db', damaged, '--into', into, '--json']);
    expect(result.code).toBe(2);
    const report = JSON.parse(result.stdout) as { sessions: Array<{ id: number; readable: boolean; copiedAs?: number }> };
    expect(report.sessions.filter((session) => session.copiedAs !== undefined).map((session) => session.id)).toEqual([1, 2, 4, 5, 6]);
    const rescued = await openSqliteLogbook(into);
    const rows = await rescued.listSessions();
    expect(rows.map((row) => [row.unit, row.cycles, row.linkErrors])).toEqual([1, 2, 4, 5, 6].map((id) => [`RW-05${id}0`, 600, 2]));
    for (const session of report.sessions) {
      if (session.copiedAs !== undefined) expect(await rescued.sessionContentHash(session.copiedAs)).toBe(hashes.get(session.id));
    }
    await rescued.close();
    const check = await runCli(['salvage', '--db', into]);
    expect(check.code).toBe(0);
    expect(check.stdout).toContain("SQLite's integrity check finds nothing wrong.");
  });
});
