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
import { runSync, type SqlProgram, type SqlStep, type SqlValue } from './sqlProgram';

const bindable = (value: SqlValue) => (value instanceof Uint8Array && !Buffer.isBuffer(value) ? Buffer.from(value.buffer, value.byteOffset, value.byteLength) : value);

/** Bound values per INSERT statement (SQLite allows 32 766 since 3.32; a few thousand is where the gain levels off). */
const parametersPerStatement = 2000;

/** Prepared statements by SQL text; cleared when it grows past this (a bound: chunks of a few sizes per table). */
const statementCacheLimit = 400;

export function sqliteExecutor(db: SqliteDatabase): (step: SqlStep) => unknown {
  const statements = new Map<string, Database.Statement>();
  const prepared = (sql: string): Database.Statement => {
    let statement = statements.get(sql);
    if (!statement) {
      if (statements.size >= statementCacheLimit) statements.clear();
      statement = db.prepare(sql);
      statements.set(sql, statement);
    }
    return statement;
  };
  return (step) => {
    if (step.mode === 'lock') return undefined; // SQLite's write transactions are serial already
    if (step.mode === 'insert') {
      // Multi-row VALUES a chunk at a time: a native call per chunk, not per row (scripts/bench/store.ts).
      const perChunk = Math.max(1, Math.floor(parametersPerStatement / step.columns.length));
      const rowPlaceholders = `(${step.columns.map(() => '?').join(', ')})`;
      for (let start = 0; start < step.rows.length; start += perChunk) {
        const chunk = step.rows.slice(start, start + perChunk);
        const values: unknown[] = [];
        for (const row of chunk) for (const value of row) values.push(bindable(value));
        prepared(`INSERT INTO ${step.table} (${step.columns.join(', ')}) VALUES ${chunk.map(() => rowPlaceholders).join(', ')}`).run(values);
      }
      return undefined;
    }
    const statement = prepared(step.sql);
    const parameters = step.parameters.map(bindable);
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
