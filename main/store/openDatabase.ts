/**
 * Opening a logbook file: refuse anything that is not ours before writing a single byte to it, then set the
 * journal up and bring the schema to the latest version.
 *
 * Journal: WAL, so readers (the Logbook screen, `rampwright log`) never block the session writer and a crash at any
 * instant leaves the last committed transaction intact (sqlite.org, "Write-Ahead Logging").
 * synchronous=NORMAL: in WAL mode a commit then only appends to the WAL without an fsync; the WAL is synced at
 * checkpoints. A killed process (kill -9, a crash) loses nothing committed, because the data already sits in the
 * operating system's cache; a power cut can roll back the transactions since the last checkpoint but never corrupts
 * the file (sqlite.org, "PRAGMA synchronous"). We take that trade so a commit never waits on the disk while the
 * serial reader shares the thread; a bench on doubtful power can ask for `durability: 'power-cut'` (synchronous=FULL:
 * one fsync per batch, at most five a second with the default batching).
 */
import Database from 'better-sqlite3';
import { closeSync, openSync, readFileSync, readSync, statSync } from 'node:fs';
import { dirname } from 'node:path';
import { InputError } from '../../app/errors';
import { latestSchemaVersion, logbookApplicationId, migrations } from './schema';
import { errorCode, ownerWords, storageFaultOf, storageInputError, writeAccessProblem } from './storageFaults';

export type SqliteDatabase = Database.Database;

export interface OpenLogbookDatabaseOptions {
  /** 'process-crash' (default): synchronous=NORMAL. 'power-cut': synchronous=FULL. */
  durability?: 'process-crash' | 'power-cut';
  /** Open for reading only: no schema change, no recovery writes; a read-only file or a full disk can be read. */
  readOnly?: boolean;
}

const sqliteHeader = 'SQLite format 3\u0000';

function readHeader(path: string): string | null {
  let stats;
  try {
    stats = statSync(path);
  } catch {
    return null; // a new logbook
  }
  if (stats.isDirectory()) throw new InputError('is a folder, not a logbook file', path);
  if (stats.size === 0) return null;
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (error) {
    throw new InputError(`cannot be read (${ownerWords(path) || errorCode(error)}): ask its owner for access`, path);
  }
  try {
    const bytes = Buffer.alloc(16);
    const read = readSync(fd, bytes, 0, 16, 0);
    return bytes.subarray(0, read).toString('latin1');
  } finally {
    closeSync(fd);
  }
}

/** How long an opener waits for another process's lock while the schema may be changing (ms). */
const openBusyTimeoutMs = 15_000;

/**
 * Brings the schema to the latest version in one IMMEDIATE transaction: it takes the write lock before reading the
 * version, so of several processes opening a new logbook at once one migrates and the others, once it commits,
 * find the schema current and change nothing (the probe saw "table board_designs already exists" without it).
 */
function migrate(db: SqliteDatabase): void {
  db.transaction(() => {
    const version = db.pragma('user_version', { simple: true }) as number;
    for (let next = version; next < latestSchemaVersion; next += 1) {
      db.exec(migrations[next]);
      if (next === 0) db.pragma(`application_id = ${logbookApplicationId}`);
      db.pragma(`user_version = ${next + 1}`);
    }
  }).immediate();
}

/** Reads the schema facts in one snapshot and refuses a file that is not a logbook this version can use. */
function checkLogbookFile(db: SqliteDatabase, path: string): { version: number } {
  let version: number;
  let applicationId: number;
  let tables: number;
  try {
    // One read transaction: a snapshot, so another opener's migration is seen whole or not at all.
    ({ version, applicationId, tables } = db.transaction(() => ({
      version: db.pragma('user_version', { simple: true }) as number,
      applicationId: db.pragma('application_id', { simple: true }) as number,
      tables: (db.prepare("SELECT count(*) AS n FROM sqlite_master WHERE type = 'table'").get() as { n: number }).n,
    }))());
  } catch (error) {
    const code = errorCode(error);
    if (code === 'SQLITE_CORRUPT' || code === 'SQLITE_NOTADB') {
      throw new InputError(`is damaged (SQLite cannot read its table list); it was left untouched. Restore it from a backup, or try rampwright salvage --db ${path}`, path);
    }
    const fault = storageFaultOf(error, path);
    if (fault) throw new InputError(fault.message, path);
    throw error;
  }
  if (applicationId !== 0 && applicationId !== logbookApplicationId) {
    throw new InputError('is an SQLite database of another program, not a Rampwright logbook; it was left untouched', path);
  }
  if (version > latestSchemaVersion) {
    throw new InputError(
      `was written by a newer Rampwright (logbook schema ${version}; this version knows up to ${latestSchemaVersion}); update Rampwright to open it. The file was left untouched`,
      path,
    );
  }
  if (version === 0 && tables > 0) {
    throw new InputError('is an SQLite database but not a Rampwright logbook; it was left untouched', path);
  }
  return { version };
}

/**
 * A logbook opened for reading only (log, report, export): nothing is written, not even the recovery of sessions
 * whose writer is gone, so a read-only file or a full disk can still be read.
 */
function openReadOnly(path: string, header: string | null): SqliteDatabase {
  if (header === null) throw new InputError('is empty: there is no logbook here yet', path);
  let db: SqliteDatabase;
  try {
    db = new Database(path, { readonly: true, fileMustExist: true });
    db.pragma('busy_timeout = 250');
    // The first read: where a missing index file shows.
    db.prepare('SELECT count(*) FROM sqlite_master').get();
  } catch (error) {
    // A logbook in write-ahead mode needs an index file (-shm) beside it even to be read; on a full disk or in a
    // read-only folder SQLite cannot make one. With nothing waiting in the write-ahead log, the file alone holds
    // everything: it is read into memory instead.
    const code = errorCode(error);
    const noIndexFile = code === 'SQLITE_READONLY_DIRECTORY' || code === 'SQLITE_CANTOPEN' || code === 'SQLITE_FULL' || code.startsWith('SQLITE_IOERR');
    if (!noIndexFile) {
      if (error instanceof InputError) throw error;
      const fault = storageFaultOf(error, path);
      throw new InputError(fault ? fault.message : `cannot open the logbook: ${error instanceof Error ? error.message : String(error)}`, path);
    }
    db = openCopyInMemory(path, code === 'SQLITE_READONLY_DIRECTORY' ? `its folder is read-only (${ownerWords(dirname(path))})` : 'the disk is full');
  }
  try {
    const { version } = checkLogbookFile(db, path);
    if (version === 0) throw new InputError('is empty: there is no logbook here yet', path);
    if (version < latestSchemaVersion) {
      throw new InputError(
        `has logbook schema ${version}, older than this version's ${latestSchemaVersion}; bringing it up to date needs write access: run a command that writes to it (record, import) once, or read a copy`,
        path,
      );
    }
    return db;
  } catch (error) {
    db.close();
    throw storageInputError(error, path);
  }
}

/** The logbook file read whole into memory, marked as a rollback-journal database so SQLite reads it as it is. */
function openCopyInMemory(path: string, why: string): SqliteDatabase {
  let walBytes = 0;
  try {
    walBytes = statSync(`${path}-wal`).size;
  } catch {
    walBytes = 0;
  }
  if (walBytes > 0) {
    throw new InputError(`cannot be read now: ${why}, and its write-ahead log (${path}-wal) holds data not yet in the file; free some space or copy the logbook with its -wal file to a folder you can write`, path);
  }
  const bytes = readFileSync(path);
  // File format bytes 18 and 19 (sqlite.org, "Database File Format"): 2 for WAL, 1 for the rollback journal.
  if (bytes.length > 19 && bytes[18] === 2 && bytes[19] === 2) {
    bytes[18] = 1;
    bytes[19] = 1;
  }
  return new Database(bytes, { readonly: true });
}

export function openLogbookDatabase(path: string, options: OpenLogbookDatabaseOptions = {}): SqliteDatabase {
  const header = readHeader(path);
  if (header !== null && header !== sqliteHeader) {
    throw new InputError('is not a Rampwright logbook (not an SQLite database); it was left untouched', path);
  }
  if (options.readOnly) return openReadOnly(path, header);
  const accessProblem = writeAccessProblem(path);
  if (accessProblem) throw new InputError(accessProblem, path);
  let db: SqliteDatabase;
  try {
    db = new Database(path);
  } catch (error) {
    const fault = storageFaultOf(error, path);
    throw new InputError(fault ? fault.message : `cannot open the logbook: ${error instanceof Error ? error.message : String(error)}`, path);
  }
  try {
    // Another process may be creating or migrating this logbook this very moment: wait for its lock (a migration
    // takes well under a second) rather than fail. Lowered below once the schema is current.
    db.pragma(`busy_timeout = ${openBusyTimeoutMs}`);
    const { version } = checkLogbookFile(db, path);
    db.pragma('journal_mode = WAL');
    db.pragma(options.durability === 'power-cut' ? 'synchronous = FULL' : 'synchronous = NORMAL');
    db.pragma('foreign_keys = ON');
    if (version < latestSchemaVersion) migrate(db);
    // Wait at most 250 ms for another process's write lock (another bench program writing its own batch): the
    // session writer shares the thread with the serial reader, so it gives up and retries on its next tick with
    // its queue intact rather than stall the reader (logbookWriter.ts).
    db.pragma('busy_timeout = 250');
    return db;
  } catch (error) {
    db.close();
    throw storageInputError(error, path);
  }
}
