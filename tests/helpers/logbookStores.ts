/**
 * The stores the logbook contract suite runs on: a SQLite file in a temporary folder, and a real PostgreSQL server
 * (a throwaway cluster started for the test file, scripts/postgres/throwawayCluster.ts), a fresh database per test.
 * No mock stands in for either. `raw` runs SQL on the logbook directly, as its owner would, for checks and for
 * damage a test inflicts on purpose (on PostgreSQL with the finished-session triggers bypassed, as only an owner can).
 */
import Database from 'better-sqlite3';
import pg from 'pg';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Logbook } from '../../main/store/logbookTypes';
import { openLogbook } from '../../main/store/openLogbook';
import { numberedPlaceholders } from '../../main/store/sqlProgram';
import { startThrowawayCluster, type ThrowawayCluster } from '../../scripts/postgres/throwawayCluster';

export type StoreKind = 'SQLite' | 'PostgreSQL';
export const storeKinds: readonly StoreKind[] = ['SQLite', 'PostgreSQL'];

export interface StoreKit {
  kind: StoreKind;
  /** The location of a fresh, empty logbook (a new file, or a new database). */
  freshLocation(): Promise<string>;
  /** Opens a fresh logbook. */
  fresh(): Promise<Logbook>;
  /** SQL (with `?` placeholders) on the logbook at `location`, as its owner, finished-session triggers bypassed. */
  raw<T = Record<string, unknown>>(location: string, sql: string, parameters?: unknown[]): Promise<T[]>;
  /** The cluster behind a PostgreSQL kit. */
  cluster: ThrowawayCluster | null;
  stop(): Promise<void>;
}

export async function startStoreKit(kind: StoreKind): Promise<StoreKit> {
  if (kind === 'SQLite') {
    const folder = mkdtempSync(join(tmpdir(), 'rampwright-store-'));
    let count = 0;
    const kit: StoreKit = {
      kind,
      cluster: null,
      async freshLocation() {
        count += 1;
        return join(folder, `logbook-${count}.sqlite`);
      },
      async fresh() {
        return openLogbook(await kit.freshLocation());
      },
      async raw<T>(location: string, sql: string, parameters: unknown[] = []) {
        const db = new Database(location);
        try {
          const statement = db.prepare(sql);
          return (statement.reader ? statement.all(...parameters) : (statement.run(...parameters), [])) as T[];
        } finally {
          db.close();
        }
      },
      async stop() {
        rmSync(folder, { recursive: true, force: true });
      },
    };
    return kit;
  }
  const cluster = await startThrowawayCluster();
  let count = 0;
  const admin = new pg.Client({ connectionString: cluster.url() });
  await admin.connect();
  const kit: StoreKit = {
    kind,
    cluster,
    async freshLocation() {
      count += 1;
      const name = `logbook_${count}`;
      await admin.query(`CREATE DATABASE ${name}`);
      return cluster.url(name);
    },
    async fresh() {
      return openLogbook(await kit.freshLocation());
    },
    async raw<T>(location: string, sql: string, parameters: unknown[] = []) {
      const client = new pg.Client({ connectionString: location });
      await client.connect();
      try {
        await client.query("SET session_replication_role = 'replica'");
        return (await client.query(numberedPlaceholders(sql), parameters)).rows as T[];
      } finally {
        await client.end();
      }
    },
    async stop() {
      await admin.end().catch(() => undefined);
      await cluster.stop();
    },
  };
  return kit;
}
