/**
 * The shared logbook's schema: versioned like the SQLite one (migration N is the same change in both), migrated
 * once when several benches open a new shared logbook at the same moment (advisory lock), and refused when the
 * database belongs to something else or to a newer Rampwright. Real server (throwaway cluster).
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../../app/errors';
import { openLogbook } from '../../../../main/store/openLogbook';
import { latestPgSchemaVersion } from '../../../../main/store/postgres/pgSchema';
import { latestSchemaVersion } from '../../../../main/store/schema';
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
});
