/**
 * The shared logbook: PostgreSQL behind the same `Logbook` interface as a bench's SQLite file, running the same query
 * programs (../logbookOverEngine.ts) on a small connection pool, each write program in one transaction. Opening it
 * checks the database is ours (or empty), brings its schema up to date under an advisory lock (pgSchema.ts), and
 * marks sessions whose writer is gone as interrupted.
 */
import pg from 'pg';
import { InputError } from '../../../app/errors';
import { createLogbookOverEngine, type LogbookEngine } from '../logbookOverEngine';
import { createBatchingWriter } from '../logbookWriter';
import type { Logbook } from '../logbookTypes';
import { recoverInterruptedSessions } from '../sessionRecovery';
import { numberedPlaceholders, runAsync, type SqlProgram, type SqlStep, type SqlValue } from '../sqlProgram';
import { postgresTarget, type PostgresTarget } from './connection';
import { describePostgresError, sqlStateOf } from './pgErrors';
import { latestPgSchemaVersion, pgMigrations, schemaTable } from './pgSchema';

export interface OpenPostgresOptions {
  /** Connections in the pool (default 4: the screens' reads beside a session writer). */
  connections?: number;
  env?: Record<string, string | undefined>;
}

/** The advisory lock key every opener takes while it migrates ("RAMP" in ASCII, as the SQLite application id). */
const migrationLockKey = 0x52414d50;

// SQLite keeps no NaN (it stores NULL); the shared logbook does the same so both hold equal rows.
const boundValue = (value: SqlValue) => (typeof value === 'number' && Number.isNaN(value) ? null : value instanceof Uint8Array && !Buffer.isBuffer(value) ? Buffer.from(value.buffer, value.byteOffset, value.byteLength) : value);

/** A value as JSON the server reads back exactly: doubles in shortest round-trip form, infinities and bytes as text. */
function jsonCell(value: SqlValue): string | number | null {
  if (value === null || typeof value === 'string') return value;
  if (typeof value === 'number') return Number.isFinite(value) ? value : Number.isNaN(value) ? null : value > 0 ? 'Infinity' : '-Infinity';
  return `\\x${Buffer.from(value.buffer, value.byteOffset, value.byteLength).toString('hex')}`;
}

function pgExecutor(client: pg.PoolClient): (step: SqlStep) => Promise<unknown> {
  return async (step) => {
    if (step.mode === 'lock') {
      await client.query('SELECT pg_advisory_xact_lock(hashtext($1))', [step.key]);
      return undefined;
    }
    if (step.mode === 'insert') {
      // One statement per table: the rows as one JSON parameter, read into the table's row type by the server.
      const records = step.rows.map((row) => Object.fromEntries(step.columns.map((column, index) => [column, jsonCell(row[index])])));
      const columns = step.columns.join(', ');
      await client.query(`INSERT INTO ${step.table} (${columns}) SELECT ${columns} FROM json_populate_recordset(NULL::${step.table}, $1::json)`, [JSON.stringify(records)]);
      return undefined;
    }
    const values = step.parameters.map(boundValue);
    const result = await client.query(numberedPlaceholders(step.sql), values);
    if (step.mode === 'all') return result.rows;
    if (step.mode === 'get') return result.rows[0];
    return undefined;
  };
}

async function schemaVersion(client: pg.PoolClient, target: PostgresTarget): Promise<number> {
  // A scan of the catalog, not to_regclass: its cache may not yet see a table another opener created meanwhile. One
  // statement, so one snapshot: two would let another opener's first migration commit between them, and its tables
  // would look like a database of someone else's.
  const tables = await client.query<{ ours: number; n: number }>('SELECT count(*) FILTER (WHERE tablename = $1) AS ours, count(*) AS n FROM pg_tables WHERE schemaname = current_schema()', [schemaTable]);
  if (Number(tables.rows[0].ours) === 0) {
    if (Number(tables.rows[0].n) > 0) throw new InputError('is a database with tables of its own, not a Rampwright logbook; it was left untouched (give the shared logbook a database of its own)', target.display);
    return 0;
  }
  const version = await client.query<{ v: number | null }>(`SELECT max(version) AS v FROM ${schemaTable}`);
  return version.rows[0].v ?? 0;
}

async function migrate(client: pg.PoolClient, target: PostgresTarget): Promise<void> {
  let version = await schemaVersion(client, target);
  if (version > latestPgSchemaVersion) {
    throw new InputError(`was written by a newer Rampwright (logbook schema ${version}; this version knows up to ${latestPgSchemaVersion}); update Rampwright to open it`, target.display);
  }
  while (version < latestPgSchemaVersion) {
    await client.query('BEGIN');
    try {
      await client.query('SELECT pg_advisory_xact_lock($1)', [migrationLockKey]);
      // Another opener may have migrated while this one waited for the lock.
      version = await schemaVersion(client, target);
      if (version < latestPgSchemaVersion) {
        if (version === 0) await client.query(`CREATE TABLE ${schemaTable} (version integer PRIMARY KEY, applied_at_ms bigint NOT NULL)`);
        await client.query(pgMigrations[version]);
        await client.query(`INSERT INTO ${schemaTable} (version, applied_at_ms) VALUES ($1, $2)`, [version + 1, Date.now()]);
        version += 1;
      }
      await client.query('COMMIT');
    } catch (error) {
      await client.query('ROLLBACK').catch(() => undefined);
      if ((error as { code?: unknown }).code === '42501') {
        throw new InputError(
          `has logbook schema ${version} and this Rampwright needs ${latestPgSchemaVersion}, but this user may not change the schema: whoever owns the database opens it once with this version (rampwright log --db <address>) to bring it up to date`,
          target.display,
        );
      }
      throw error;
    }
  }
}

export async function openPostgresLogbook(location: string, options: OpenPostgresOptions = {}): Promise<Logbook> {
  const target = postgresTarget(location, options.env);
  const pool = new pg.Pool({ ...target.config, max: options.connections ?? 4, idleTimeoutMillis: 10_000 });
  // A connection dropped while idle (the server restarted) is taken out of the pool; the next query opens another.
  pool.on('error', () => undefined);
  const withClient = async <T>(work: (client: pg.PoolClient) => Promise<T>): Promise<T> => {
    let client: pg.PoolClient;
    try {
      client = await pool.connect();
    } catch (error) {
      throw describePostgresError(error, target);
    }
    // The server may end a connection between two of our queries (a restart): the error arrives as an event,
    // which must not end the process; the next query on it fails and says so.
    let lost: unknown = null;
    const onLost = (error: unknown) => (lost = error);
    client.on('error', onLost);
    try {
      return await work(client);
    } catch (error) {
      lost ??= (error as { code?: unknown }).code === undefined && !(error instanceof InputError) ? error : null;
      throw describePostgresError(error, target);
    } finally {
      client.off('error', onLost);
      // A client whose connection failed is thrown away, not handed to the next caller.
      client.release(lost !== null);
    }
  };

  const engine: LogbookEngine = {
    location: target.display,
    read: <T>(program: SqlProgram<T>) => withClient((client) => runAsync(program, pgExecutor(client))),
    write: <T>(program: SqlProgram<T>) =>
      withClient(async (client) => {
        await client.query('BEGIN');
        try {
          const result = await runAsync(program, pgExecutor(client));
          await client.query('COMMIT');
          return result;
        } catch (error) {
          await client.query('ROLLBACK').catch(() => undefined);
          throw error;
        }
      }),
    openWriter: (sessionId, writerOptions) => createBatchingWriter(sessionId, { ...writerOptions, write: engine.write }),
    async close() {
      await pool.end();
    },
  };

  try {
    await withClient((client) => migrate(client, target));
    await engine.write(recoverInterruptedSessions()).catch((error: unknown) => {
      // A reviewer's role reads only: recovery is left to the benches.
      if (sqlStateOf(error) !== '42501') throw error;
    });
  } catch (error) {
    await pool.end().catch(() => undefined);
    throw error;
  }
  return createLogbookOverEngine(engine);
}
