/**
 * The logbook on the bench PC: one SQLite file (better-sqlite3), the embedded default behind the `Logbook`
 * interface. The engine runs the shared query programs synchronously (logbookOverEngine.ts), write programs in one
 * IMMEDIATE transaction; the session writer's batches are write programs too (logbookWriter.ts). Opening it marks
 * sessions whose writer is gone as interrupted (sessionRecovery.ts).
 */
import type Database from 'better-sqlite3';
import type { Logbook } from './logbookTypes';
import { createLogbookOverEngine, type LogbookEngine } from './logbookOverEngine';
import { createBatchingWriter } from './logbookWriter';
import { openLogbookDatabase, type OpenLogbookDatabaseOptions, type SqliteDatabase } from './openDatabase';
import { recoverInterruptedSessions } from './sessionRecovery';
import { runSync, type SqlProgram, type SqlStep } from './sqlProgram';

/** Prepared statements by SQL text; cleared when it grows past this (multi-row inserts come in many sizes). */
const statementCacheLimit = 400;

export function sqliteExecutor(db: SqliteDatabase): (step: SqlStep) => unknown {
  const statements = new Map<string, Database.Statement>();
  return (step) => {
    if (step.mode === 'lock') return undefined; // SQLite's write transactions are serial already
    let statement = statements.get(step.sql);
    if (!statement) {
      if (statements.size >= statementCacheLimit) statements.clear();
      statement = db.prepare(step.sql);
      statements.set(step.sql, statement);
    }
    const parameters = step.parameters.map((value) => (value instanceof Uint8Array && !Buffer.isBuffer(value) ? Buffer.from(value.buffer, value.byteOffset, value.byteLength) : value));
    if (step.mode === 'all') return statement.all(...parameters);
    if (step.mode === 'get') return statement.get(...parameters);
    statement.run(...parameters);
    return undefined;
  };
}

export async function openSqliteLogbook(path: string, options: OpenLogbookDatabaseOptions = {}): Promise<Logbook> {
  return createSqliteLogbook(openLogbookDatabase(path, options), path);
}

export function createSqliteLogbook(db: SqliteDatabase, location: string): Logbook {
  const execute = sqliteExecutor(db);
  const writeNow = <T>(program: SqlProgram<T>): T => db.transaction(() => runSync(program, execute)).immediate();
  writeNow(recoverInterruptedSessions());
  const engine: LogbookEngine = {
    location,
    read: async (program) => runSync(program, execute),
    write: async (program) => writeNow(program),
    openWriter: (sessionId, options) => createBatchingWriter(sessionId, { ...options, write: async (program) => writeNow(program) }),
    async close() {
      if (db.open) db.close();
    },
  };
  return createLogbookOverEngine(engine);
}
