/**
 * The shared logbook's schema: versioned like the SQLite one (migration N is the same change in both), migrated
 * once when several benches open a new shared logbook at the same moment (advisory lock), and refused when the
 * database belongs to something else or to a newer Rampwright. Real server (throwaway cluster).
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../../app/errors';
import { openLogbook } from '../../../../main/store/openLogbook';
import { legacySignOffOf, legacySignOffReason } from '../../../../app/exchange/legacySignOff';
import { latestPgSchemaVersion, pgMigrations, schemaTable } from '../../../../main/store/postgres/pgSchema';
import { latestSchemaVersion, logbookApplicationId, migrations } from '../../../../main/store/schema';
import Database from 'better-sqlite3';
import { chargerDesign, tempFolder } from '../storeFixtures';
import { startThrowawayCluster, type ThrowawayCluster } from '../../../../scripts/postgres/throwawayCluster';

let cluster: ThrowawayCluster;

async function query<T extends pg.QueryResultRow>(database: string, sql: string): Promise<T[]> {
  const client = new pg.Client({ connectionString: cluster.url(database) });
  await client.connect();
  try {
    return (await client.query<T>(sql)).rows;
  } finally {
    await client.end();
  }
}

beforeAll(async () => {
  cluster = await startThrowawayCluster();
}, 60_000);
afterAll(async () => {
  await cluster?.stop();
});

describe('shared logbook schema', () => {
  it('has as many migrations as the SQLite logbook (each mirrored)', () => {
    expect(latestPgSchemaVersion).toBe(latestSchemaVersion);
  });

  it('is migrated once when four benches open a new shared logbook at the same moment', async () => {
    cluster.createDatabase('fresh_line');
    const logbooks = await Promise.all([1, 2, 3, 4].map(() => openLogbook(cluster.url('fresh_line'))));
    await Promise.all(logbooks.map((logbook) => logbook.close()));
    const versions = await query<{ version: number }>('fresh_line', 'SELECT version FROM rampwright_schema ORDER BY version');
    expect(versions.map((row) => row.version)).toEqual(Array.from({ length: latestPgSchemaVersion }, (_, index) => index + 1));
    const tables = await query<{ n: string }>('fresh_line', "SELECT count(*) AS n FROM pg_tables WHERE schemaname = 'public' AND tablename = 'sessions'");
    expect(tables[0].n).toBe('1');
  });

  it('refuses a database with tables of its own, and leaves it untouched', async () => {
    cluster.createDatabase('stock_control');
    cluster.psql('CREATE TABLE parts (id int PRIMARY KEY, name text)', 'stock_control');
    await expect(openLogbook(cluster.url('stock_control'))).rejects.toThrow(InputError);
    await expect(openLogbook(cluster.url('stock_control'))).rejects.toThrow(/tables of its own, not a Rampwright logbook/);
    const tables = await query<{ tablename: string }>('stock_control', "SELECT tablename FROM pg_tables WHERE schemaname = 'public'");
    expect(tables.map((row) => row.tablename)).toEqual(['parts']);
  });

  it('refuses a shared logbook written by a newer Rampwright, naming both schema versions', async () => {
    cluster.createDatabase('newer_line');
    await (await openLogbook(cluster.url('newer_line'))).close();
    cluster.psql(`INSERT INTO rampwright_schema (version, applied_at_ms) VALUES (${latestPgSchemaVersion + 2}, 0)`, 'newer_line');
    await expect(openLogbook(cluster.url('newer_line'))).rejects.toThrow(new RegExp(`schema ${latestPgSchemaVersion + 2}.*up to ${latestPgSchemaVersion}`));
  });

  it('says who must bring an older shared logbook up to date when a bench may not change the schema', async () => {
    cluster.psql("CREATE ROLE line_owner LOGIN PASSWORD 'line_owner-pw'; CREATE ROLE bench_c LOGIN PASSWORD 'bench_c-pw'; CREATE DATABASE empty_line OWNER line_owner;");
    await expect(openLogbook(cluster.url('empty_line', 'bench_c', 'bench_c-pw'))).rejects.toThrow(/may not change the schema: whoever owns the database opens it once/);
  });

  it('brings a shared logbook of schema 3 up to date, classifying old sign-offs exactly as the bench logbook upgrade does', async () => {
    // The same three sessions in a schema-3 shared logbook and a schema-3 bench logbook: signed off with every step
    // in tolerance, signed off with limits out of tolerance (before the gate), and closed without sign-off.
    const step = (name: string, verdict: string, readings: Array<[string, string]> = []) => ({
      step: name, status: 'done', verdict, cycles: 50, note: null,
      readings: readings.map(([label, readingVerdict]) => ({ key: label, label, unit: 'deg', value: 7, expected: 10, low: 8, high: null, verdict: readingVerdict, note: null })),
    });
    const allIn = ['sync', 'ramp', 'trim', 'transfer', 'limits'].map((name) => step(name, 'in-tolerance'));
    const stepsJson = [
      JSON.stringify([...allIn, step('sign-off', 'in-tolerance')]),
      JSON.stringify([step('sync', 'in-tolerance'), step('ramp', 'in-tolerance'), step('trim', 'in-tolerance'), step('limits', 'out-of-tolerance', [['Smallest alpha', 'out-of-tolerance']]), step('sign-off', 'out-of-tolerance')]),
      JSON.stringify(allIn),
    ];
    const design = JSON.stringify(chargerDesign()).replace(/'/g, "''");
    const sessionsSql = stepsJson.map((json, index) => `INSERT INTO sessions (unit_id, design_id, operator, started_at_ms, ended_at_ms, status, steps_json, content_sha256) VALUES (1, 1, 'bench 1', ${1000 * (index + 1)}, ${1000 * (index + 1) + 500}, 'closed', '${json.replace(/'/g, "''")}', ${index === 1 ? "'arrived-hash'" : 'NULL'});`).join('\n');
    const seed = `INSERT INTO board_designs (name, version, content_hash, design_json, saved_at_ms) VALUES ('CH-50H', 1, 'h1', '${design}', 0);
      INSERT INTO units (serial, design_name, created_at_ms) VALUES ('RW-0950', 'CH-50H', 0);
      ${sessionsSql}`;

    cluster.createDatabase('older_shared');
    cluster.psql(`CREATE TABLE ${schemaTable} (version integer PRIMARY KEY, applied_at_ms bigint NOT NULL); ${pgMigrations.slice(0, 3).join('\n')} INSERT INTO ${schemaTable} VALUES (1, 0), (2, 0), (3, 0); ${seed}`, 'older_shared');
    const folder = tempFolder('rampwright-pg-upgrade-');
    try {
      const path = folder.file('bench.sqlite');
      const bench = new Database(path);
      bench.pragma(`application_id = ${logbookApplicationId}`);
      for (const migration of migrations.slice(0, 3)) bench.exec(migration);
      bench.pragma('user_version = 3');
      bench.exec(seed);
      bench.close();

      const shared = await openLogbook(cluster.url('older_shared'));
      const local = await openLogbook(path);
      try {
        const sharedRows = await shared.listSessions();
        const localRows = await local.listSessions();
        expect(sharedRows.map((row) => row.outcome)).toEqual(['signed-off', 'signed-off-with-exceptions', 'closed']);
        expect(sharedRows[1]).toMatchObject({ signOffReason: legacySignOffReason, signOffExceptions: [{ step: 'transfer', problem: 'not-recorded', readings: [] }, { step: 'limits', problem: 'out-of-tolerance', readings: ['Smallest alpha'] }] });
        expect(legacySignOffOf(stepsJson[1])).toMatchObject({ exceptions: sharedRows[1].signOffExceptions });
        // Both stores hold the same session, so its archive (and its content hash) is the same from either.
        for (const [index, row] of sharedRows.entries()) {
          expect({ outcome: row.outcome, reason: row.signOffReason, exceptions: row.signOffExceptions }).toEqual({ outcome: localRows[index].outcome, reason: localRows[index].signOffReason, exceptions: localRows[index].signOffExceptions });
          expect(await shared.sessionContentHash(row.id)).toBe(await local.sessionContentHash(localRows[index].id));
        }
        // The arrived session's old archive hash is forgotten: its content now holds the sign-off.
        expect(await query<{ h: string | null }>('older_shared', 'SELECT content_sha256 AS h FROM sessions WHERE started_at_ms = 2000')).toEqual([{ h: null }]);
        // And the guard is back: a finished session is never changed.
        await expect(query('older_shared', "UPDATE sessions SET notes = 'edited' WHERE started_at_ms = 1000")).rejects.toThrow(/finished/);
      } finally {
        await shared.close();
        await local.close();
      }
    } finally {
      folder.remove();
    }
  });
});
