/**
 * The logbook on the bench PC: one SQLite file (better-sqlite3), the embedded default behind the `Logbook`
 * interface. The engine runs the shared query programs synchronously (logbookOverEngine.ts), write programs in one
 * IMMEDIATE transaction; the session writer's batches are write programs too (logbookWriter.ts). Opening it to write
 * marks sessions whose writer is gone as interrupted (sessionRecovery.ts); opened read-only it writes nothing.
 * Storage faults (disk full, read-only, damaged pages) come out as InputErrors naming the file (storageFaults.ts).
 */
import type Database from 'better-sqlite3';
import type { Logbook, SessionRow } from './logbookTypes';
import { createLogbookOverEngine, type LogbookEngine } from './logbookOverEngine';
import { createBatchingWriter } from './logbookWriter';
import { openLogbookDatabase, type OpenLogbookDatabaseOptions, type SqliteDatabase } from './openDatabase';
import { recoverInterruptedSessions, writerIsAlive } from './sessionRecovery';
import { removeStaleReserves, takeSpaceReserve, type SpaceReserve } from './spaceReserve';
import { guardStorage, storageFaultOf } from './storageFaults';
import { runSync, type SqlProgram, type SqlStep, type SqlValue } from './sqlProgram';

const bindable = (value: SqlValue) => (value instanceof Uint8Array && !Buffer.isBuffer(value) ? Buffer.from(value.buffer, value.byteOffset, value.byteLength) : value);

/** Bound values per INSERT statement (SQLite allows 32 766 since 3.32; a few thousand is where the gain levels off). */
const parametersPerStatement = 2000;

/** How long a write waits for another process's lock: one the caller awaits, and a session writer's batch (ms). */
const awaitedWriteBusyTimeoutMs = 10_000;
const batchBusyTimeoutMs = 250;

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
  return createSqliteLogbook(openLogbookDatabase(path, options), path, { readOnly: options.readOnly });
}

/** Open sessions whose writer is gone: what recovery would mark interrupted (sessionRecovery.ts). */
function orphanedSessions(db: SqliteDatabase): Set<number> {
  const open = db
    .prepare("SELECT id, writer_host AS host, writer_pid AS pid, heartbeat_at_ms AS heartbeatAtMs FROM sessions WHERE status = 'open'")
    .all() as Array<{ id: number; host: string | null; pid: number | null; heartbeatAtMs: number | null }>;
  const nowMs = Date.now();
  return new Set(open.filter((session) => !writerIsAlive(session, nowMs)).map((session) => session.id));
}

/**
 * `readOnly`: nothing is written, not even the recovery of sessions whose writer is gone; those are shown as
 * interrupted (what the next writing opener will store), so a read-only file or a full disk can still be read.
 */
export function createSqliteLogbook(db: SqliteDatabase, location: string, options: { readOnly?: boolean } = {}): Logbook {
  const execute = sqliteExecutor(db);
  const runWrite = <T>(program: SqlProgram<T>): T => db.transaction(() => runSync(program, execute)).immediate();
  // A write the caller waits for (start a session, close it, a trim, the recovery at opening) waits for another
  // process's lock as long as a bench would (several recorders starting at once on a busy computer were seen to
  // need more than the writer's 250 ms); the session writer's batches keep the short wait and retry on their next
  // tick (logbookWriter.ts), so the serial reader beside them never stalls.
  const writeNow = <T>(program: SqlProgram<T>): T => {
    db.pragma(`busy_timeout = ${awaitedWriteBusyTimeoutMs}`);
    try {
      return runWrite(program);
    } finally {
      db.pragma(`busy_timeout = ${batchBusyTimeoutMs}`);
    }
  };
  if (!options.readOnly) {
    writeNow(recoverInterruptedSessions());
    removeStaleReserves(location);
  }
  // The reserve taken by startSession below, handed to the writer the engine opens for that session.
  let reserveForNextWriter: SpaceReserve | null = null;
  const engine: LogbookEngine = {
    location,
    read: async (program) => runSync(program, execute),
    write: async (program) => writeNow(program),
    openWriter: (sessionId, writerOptions) => {
      const reserve = reserveForNextWriter;
      reserveForNextWriter = null;
      return createBatchingWriter(sessionId, { ...writerOptions, write: async (program) => runWrite(program), writeAwaited: async (program) => writeNow(program), faultOf: (error) => storageFaultOf(error, location), reserve });
    },
    async close() {
      if (db.open) db.close();
    },
  };
  const logbook = createLogbookOverEngine(engine);
  const startSession = logbook.startSession.bind(logbook);
  // A disk too full to hold the reserve is too full for a session that could be ended: refused before it starts.
  logbook.startSession = async (request, writerOptions) => {
    const reserve = takeSpaceReserve(location);
    reserveForNextWriter = reserve;
    try {
      return await startSession(request, writerOptions);
    } catch (error) {
      reserve.release();
      throw error;
    } finally {
      reserveForNextWriter = null;
    }
  };
  if (options.readOnly) {
    const orphans = orphanedSessions(db);
    const shown = (row: SessionRow): SessionRow => (orphans.has(row.id) ? { ...row, status: 'interrupted' } : row);
    const listSessions = logbook.listSessions.bind(logbook);
    const session = logbook.session.bind(logbook);
    logbook.listSessions = async (filter) => (await listSessions(filter)).map(shown);
    logbook.session = async (id) => {
      const detail = await session(id);
      return detail && { ...detail, row: shown(detail.row) };
    };
  }
  return guardStorage(logbook, location);
}
