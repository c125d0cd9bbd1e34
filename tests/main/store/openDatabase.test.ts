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
