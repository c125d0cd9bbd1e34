import { legacySignOffOf, legacySignOffReason } from '../../../app/exchange/legacySignOff';
import Database from 'better-sqlite3';
import { readFileSync, writeFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { InputError } from '../../../app/errors';
import { openLogbookDatabase } from '../../../main/store/openDatabase';
import { latestSchemaVersion, logbookApplicationId, migrations } from '../../../main/store/schema';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { chargerDesign, tempFolder, type TempFolder } from './storeFixtures';

let folder: TempFolder;
beforeEach(() => {
  folder = tempFolder();
});
afterEach(() => folder.remove());

function expectRefused(path: string, pattern: RegExp): void {
  const before = readFileSync(path);
  let caught: unknown;
  try {
    openLogbookDatabase(path).close();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(InputError);
  expect((caught as Error).message).toContain(path);
  expect((caught as Error).message).toMatch(pattern);
  // Never overwrite what is not ours: the file is byte for byte what it was.
  expect(readFileSync(path).equals(before)).toBe(true);
}

describe('openLogbookDatabase', () => {
  it('creates every table of the schema, marks the file as ours and sets WAL with synchronous NORMAL', () => {
    const db = openLogbookDatabase(folder.file('new.sqlite'));
    const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name").all() as Array<{ name: string }>).map((row) => row.name);
    expect(tables).toEqual(['board_designs', 'captures', 'cycles', 'link_events', 'part_measurements', 'sessions', 'shared_copies', 'transfer_points', 'trims', 'units']);
    expect(db.pragma('user_version', { simple: true })).toBe(latestSchemaVersion);
    expect(db.pragma('application_id', { simple: true })).toBe(logbookApplicationId);
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    // sqlite.org: synchronous NORMAL is 1, FULL is 2.
    expect(db.pragma('synchronous', { simple: true })).toBe(1);
    expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
    db.close();
  });

  it('asks for synchronous FULL when the bench wants power-cut durability', () => {
    const db = openLogbookDatabase(folder.file('full.sqlite'), { durability: 'power-cut' });
    expect(db.pragma('synchronous', { simple: true })).toBe(2);
    db.close();
  });

  it('reopens a logbook without running its migrations again and keeps its contents', async () => {
    const path = folder.file('kept.sqlite');
    const logbook = await openSqliteLogbook(path);
    const writer = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1' });
    await writer.close();
    await logbook.close();
    const again = await openSqliteLogbook(path);
    const sessions = await again.listSessions();
    expect(sessions.map((row) => [row.unit, row.status])).toEqual([['RW-0142', 'closed']]);
    await again.close();
  });

  it('brings a logbook of the first schema up to date, keeping its sessions, and then records what is new', async () => {
    // A logbook as the first release wrote it: migration 1 only.
    const path = folder.file('first.sqlite');
    const old = new Database(path);
    old.pragma(`application_id = ${logbookApplicationId}`);
    old.exec(migrations[0]);
    old.pragma('user_version = 1');
    old.close();
    const logbook = await openSqliteLogbook(path);
    const writer = await logbook.startSession({ unitSerial: 'RW-0143', design: chargerDesign(), operator: 'bench 2' });
    writer.addPartMeasurement({ part: 'rEmitter', value: 8200, designValue: 6800 });
    const row = await writer.close();
    const detail = await logbook.session(row.id);
    expect(detail?.partMeasurements.map(({ part, value, designValue }) => ({ part, value, designValue }))).toEqual([{ part: 'rEmitter', value: 8200, designValue: 6800 }]);
    await logbook.close();
    const db = new Database(path);
    expect(db.pragma('user_version', { simple: true })).toBe(latestSchemaVersion);
    db.close();
  });

  it('brings a logbook of schema 2 up to date, and a new session names its bench, in the logbook and in its archive', async () => {
    const path = folder.file('second.sqlite');
    const old = new Database(path);
    old.pragma(`application_id = ${logbookApplicationId}`);
    old.exec(migrations[0]);
    old.exec(migrations[1]);
    old.pragma('user_version = 2');
    old.close();
    const logbook = await openSqliteLogbook(path);
    const writer = await logbook.startSession({ unitSerial: 'RW-0144', design: chargerDesign(), operator: 'bench 3', bench: 'bench 3 at the window' });
    const row = await writer.close();
    expect(row.bench).toBe('bench 3 at the window');
    expect(row.sharedAt).toBeNull();
    expect((await logbook.archiveSession(row.id)).session.record.bench).toBe('bench 3 at the window');
    await logbook.close();
  });

  it('leaves the bench out of the archive of a session recorded before benches were named (its hash stays)', async () => {
    const path = folder.file('unnamed.sqlite');
    const logbook = await openSqliteLogbook(path);
    const writer = await logbook.startSession({ unitSerial: 'RW-0145', design: chargerDesign(), operator: 'bench 3' });
    const row = await writer.close();
    const before = await logbook.sessionContentHash(row.id);
    await logbook.close();
    const db = openLogbookDatabase(path);
    db.prepare('UPDATE sessions SET bench = NULL WHERE id = ?').run(row.id);
    db.close();
    const again = await openSqliteLogbook(path);
    const archived = await again.archiveSession(row.id);
    expect(Object.keys(archived.session.record)).not.toContain('bench');
    expect(await again.sessionContentHash(row.id)).not.toBe(before);
    expect((await again.listSessions())[0].bench).toBeNull();
    await again.close();
  });

  it('brings a logbook of the schema before (3) up to date, telling sign-offs from sessions closed without one', async () => {
    // A logbook as schema 3 wrote it: a sign-off was a plain "closed" with the sign-off step among the recorded
    // steps, whatever their verdicts, and a summary line in the notes.
    const path = folder.file('third.sqlite');
    const old = new Database(path);
    old.pragma(`application_id = ${logbookApplicationId}`);
    for (const migration of migrations.slice(0, 3)) old.exec(migration);
    old.pragma('user_version = 3');
    const step = (name: string, verdict: string | null, readings: Array<[string, string | null]> = []) => ({
      step: name, status: 'done', verdict, cycles: 50, note: null,
      readings: readings.map(([label, readingVerdict]) => ({ key: label, label, unit: 'deg', value: 9, expected: 10, low: 8, high: null, verdict: readingVerdict, note: null })),
    });
    const allIn = ['sync', 'ramp', 'trim', 'transfer', 'limits'].map((name) => step(name, 'in-tolerance'));
    const failing = [step('sync', 'in-tolerance'), step('ramp', 'marginal'), step('trim', 'in-tolerance'), step('limits', 'out-of-tolerance', [['Largest alpha', 'in-tolerance'], ['Smallest alpha', 'out-of-tolerance']])];
    const design = JSON.stringify(chargerDesign());
    old.prepare("INSERT INTO board_designs (name, version, content_hash, design_json, saved_at_ms) VALUES ('CH-50H', 1, 'h1', ?, 0)").run(design);
    old.prepare("INSERT INTO units (serial, design_name, created_at_ms) VALUES ('RW-0901', 'CH-50H', 0)").run();
    const insert = old.prepare('INSERT INTO sessions (unit_id, design_id, operator, started_at_ms, ended_at_ms, status, notes, steps_json) VALUES (1, 1, ?, ?, ?, ?, ?, ?)');
    const stepsOf = (steps: object[]) => JSON.stringify(steps);
    insert.run('bench 1', 1000, 2000, 'closed', 'signed off with every step recorded', stepsOf([...allIn, step('sign-off', 'in-tolerance')]));
    insert.run('bench 1', 3000, 4000, 'closed', 'signed off without transfer', stepsOf([...failing, step('sign-off', 'out-of-tolerance')]));
    insert.run('bench 2', 5000, 6000, 'closed', 'stopped for the day', stepsOf(allIn));
    insert.run('bench 2', 7000, 8000, 'interrupted', null, null);
    insert.run('bench 2', 9000, null, 'open', null, null);
    const keptSteps = (old.prepare('SELECT steps_json AS json FROM sessions WHERE id = 2').get() as { json: string }).json;
    old.close();

    const logbook = await openSqliteLogbook(path);
    const rows = await logbook.listSessions();
    expect(rows.map((row) => [row.status, row.outcome])).toEqual([
      ['closed', 'signed-off'],
      ['closed', 'signed-off-with-exceptions'],
      ['closed', 'closed'],
      ['interrupted', 'interrupted'],
      // The fifth was left open by a writer that is long gone: opening marks it interrupted, as it always did.
      ['interrupted', 'interrupted'],
    ]);
    expect(rows[0]).toMatchObject({ signOffReason: null, signOffExceptions: [] });
    // The failing sign-off: each step that stood in the way, with the failing reading, and a reason saying none
    // was asked for then.
    expect(rows[1].signOffExceptions).toEqual([
      { step: 'transfer', problem: 'not-recorded', readings: [] },
      { step: 'limits', problem: 'out-of-tolerance', readings: ['Smallest alpha'] },
    ]);
    expect(rows[1].signOffReason).toBe(legacySignOffReason);
    // The classification in SQL agrees with the one import uses for archives of the same age.
    expect(legacySignOffOf(keptSteps)).toEqual({ kind: 'signed-off-with-exceptions', reason: legacySignOffReason, exceptions: rows[1].signOffExceptions });
    // Nothing stored was lost or changed.
    const detail = await logbook.session(rows[1].id);
    expect(detail?.notes).toBe('signed off without transfer');
    expect(detail?.stepsJson).toBe(keptSteps);
    await logbook.close();
    const db = new Database(path);
    expect(db.pragma('user_version', { simple: true })).toBe(latestSchemaVersion);
    db.close();
  });

  it('accepts an empty file as a new logbook', () => {
    const path = folder.file('empty.sqlite');
    writeFileSync(path, '');
    const db = openLogbookDatabase(path);
    expect(db.pragma('user_version', { simple: true })).toBe(latestSchemaVersion);
    db.close();
  });

  it('refuses a file that is not SQLite at all, naming it, and leaves it untouched', () => {
    const path = folder.file('notes.sqlite');
    writeFileSync(path, 'unit RW-0142 ramp peak 7.31 V\n'.repeat(200));
    expectRefused(path, /not an SQLite database/);
  });

  it('refuses a logbook written by a newer schema, naming both versions', () => {
    const path = folder.file('newer.sqlite');
    const db = new Database(path);
    db.pragma(`application_id = ${logbookApplicationId}`);
    db.exec('CREATE TABLE future (x)');
    db.pragma(`user_version = ${latestSchemaVersion + 3}`);
    db.close();
    expectRefused(path, new RegExp(`schema ${latestSchemaVersion + 3}.*up to ${latestSchemaVersion}`));
  });

  it("refuses another program's SQLite database", () => {
    const path = folder.file('other.sqlite');
    const db = new Database(path);
    db.exec('CREATE TABLE contacts (name TEXT)');
    db.close();
    expectRefused(path, /not a Rampwright logbook/);
  });

  it('refuses a damaged logbook whose schema page is overwritten', async () => {
    const path = folder.file('damaged.sqlite');
    const logbook = await openSqliteLogbook(path);
    await logbook.close();
    // Checkpoint the WAL into the main file, leave rollback mode so no -wal file hides the damage.
    const db = new Database(path);
    db.pragma('journal_mode = DELETE');
    db.close();
    const bytes = readFileSync(path);
    // Page 1 holds sqlite_master after the 100-byte header: scribble over its b-tree page header and cells.
    bytes.fill(0xa5, 100, 4096);
    writeFileSync(path, bytes);
    expectRefused(path, /damaged|malformed|not a Rampwright logbook/);
  });

  it('says a folder is a folder', () => {
    expect(() => openLogbookDatabase(folder.path)).toThrow(/is a folder/);
  });
});
