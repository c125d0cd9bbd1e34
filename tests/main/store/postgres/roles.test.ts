/**
 * Signed records stay signed, enforced by the shared logbook's database, not by Rampwright: with the roles of
 * main/store/postgres/roles.sql, a bench's role records and pushes sessions, but its UPDATE or DELETE of a finished
 * (signed-off) session is refused by PostgreSQL, and so is any change to that session's rows; even the owner's
 * change is refused by the triggers; a reviewer's role only reads. A real server (throwaway cluster), no mock.
 */
import pg from 'pg';
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Logbook } from '../../../../main/store/logbookTypes';
import { openLogbook } from '../../../../main/store/openLogbook';
import { startThrowawayCluster, type ThrowawayCluster } from '../../../../scripts/postgres/throwawayCluster';
import { chargerDesign, cycleReading } from '../storeFixtures';

let cluster: ThrowawayCluster;
let signedId = 0;
let openId = 0;
const database = 'line_logbook';
const url = (user: string) => cluster.url(database, user, `${user}-secret`);

async function asRole<T>(user: string, work: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: url(user) });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

/** The SQLSTATE and message PostgreSQL answers a statement with (null when it is accepted). */
async function refusal(user: string, sql: string, parameters: unknown[] = []): Promise<{ code: string; message: string } | null> {
  return asRole(user, async (client) => {
    try {
      await client.query(sql, parameters);
      return null;
    } catch (error) {
      return { code: String((error as { code?: unknown }).code), message: (error as Error).message };
    }
  });
}

beforeAll(async () => {
  cluster = await startThrowawayCluster();
  cluster.psql(`CREATE ROLE logbook_owner LOGIN PASSWORD 'logbook_owner-secret'; CREATE DATABASE ${database} OWNER logbook_owner;`);
  // The owner opens it first: Rampwright creates the tables (schema migrations).
  await (await openLogbook(url('logbook_owner'))).close();
  cluster.psql(readFileSync(new URL('../../../../main/store/postgres/roles.sql', import.meta.url), 'utf8'), database, { owner: 'logbook_owner' });
  cluster.psql(`CREATE ROLE bench_a LOGIN PASSWORD 'bench_a-secret' IN ROLE rampwright_bench;
    CREATE ROLE qa_reviewer LOGIN PASSWORD 'qa_reviewer-secret' IN ROLE rampwright_reviewer;`, database);
  // Bench A records two sessions through the Logbook interface: one signed off (closed), one still open.
  const bench: Logbook = await openLogbook(url('bench_a'));
  try {
    const signed = await bench.startSession({ unitSerial: 'LN-2207', design: chargerDesign(), operator: 'bench A technician', bench: 'bench A' });
    for (let i = 0; i < 20; i += 1) signed.addCycle(cycleReading(i * 0.02, { alphaDeg: 85 + i / 10 }));
    signed.setNotes('signed off');
    signedId = (await signed.close()).id;
    const open = await bench.startSession({ unitSerial: 'LN-2208', design: chargerDesign(), operator: 'bench A technician', bench: 'bench A' });
    open.addCycle(cycleReading(0));
    await open.flush();
    openId = open.sessionId;
  } finally {
    await bench.close();
  }
}, 90_000);

afterAll(async () => {
  await cluster?.stop();
});

describe('a bench role on the shared logbook', () => {
  it('recorded a session and may still change its open session', async () => {
    expect(await refusal('bench_a', 'UPDATE sessions SET notes = $1 WHERE id = $2', ['still at the bench', openId])).toBeNull();
    const rows = await asRole('bench_a', (client) => client.query('SELECT status, bench FROM sessions WHERE id = $1', [signedId]));
    expect(rows.rows).toEqual([{ status: 'closed', bench: 'bench A' }]);
  });

  it('cannot change a signed session: the database refuses the UPDATE', async () => {
    const refused = await refusal('bench_a', 'UPDATE sessions SET notes = $1 WHERE id = $2', ['edited afterwards', signedId]);
    expect(refused?.code).toBe('42501'); // insufficient_privilege
    expect(refused?.message).toMatch(new RegExp(`session ${signedId} is finished`));
    // Reopening it to edit it is the same UPDATE, refused the same way.
    expect((await refusal('bench_a', "UPDATE sessions SET status = 'open' WHERE id = $1", [signedId]))?.code).toBe('42501');
  });

  it('cannot delete a signed session, nor its cycles', async () => {
    const refused = await refusal('bench_a', 'DELETE FROM sessions WHERE id = $1', [signedId]);
    expect(refused?.code).toBe('42501');
    expect(refused?.message).toMatch(/permission denied for table sessions/);
    expect((await refusal('bench_a', 'DELETE FROM cycles WHERE session_id = $1', [signedId]))?.message).toMatch(/permission denied for table cycles/);
    expect((await refusal('bench_a', 'UPDATE cycles SET alpha_deg = 90 WHERE session_id = $1', [signedId]))?.message).toMatch(/permission denied for table cycles/);
  });

  it('cannot add rows to a signed session', async () => {
    const refused = await refusal('bench_a', 'INSERT INTO cycles (session_id, seq, t_s, recorded_at_ms) VALUES ($1, 999, 0, 0)', [signedId]);
    expect(refused?.code).toBe('42501');
    expect(refused?.message).toMatch(/is finished: its cycles are never changed/);
  });

  it('cannot switch the guard off', async () => {
    expect((await refusal('bench_a', 'ALTER TABLE sessions DISABLE TRIGGER sessions_final'))?.message).toMatch(/must be owner/);
    expect((await refusal('bench_a', "SET session_replication_role = 'replica'"))?.code).toBe('42501');
  });

  it('and the session is exactly as it was signed', async () => {
    const rows = await asRole('qa_reviewer', (client) => client.query('SELECT notes, status, cycle_count FROM sessions WHERE id = $1', [signedId]));
    expect(rows.rows).toEqual([{ notes: 'signed off', status: 'closed', cycle_count: '20' }]);
  });
});

describe('the owner and the reviewer', () => {
  it("the owner's own UPDATE and DELETE of a signed session are refused by the triggers too", async () => {
    expect((await refusal('logbook_owner', 'UPDATE sessions SET notes = $1 WHERE id = $2', ['x', signedId]))?.message).toMatch(/is finished/);
    expect((await refusal('logbook_owner', 'DELETE FROM sessions WHERE id = $1', [signedId]))?.message).toMatch(/is finished/);
    expect((await refusal('logbook_owner', 'DELETE FROM cycles WHERE session_id = $1', [signedId]))?.message).toMatch(/its cycles are never changed/);
  });

  it('a reviewer reads the shared logbook through Rampwright and may not write', async () => {
    const logbook = await openLogbook(url('qa_reviewer'));
    try {
      const sessions = await logbook.listSessions({ unitSerial: 'LN-2207' });
      expect(sessions.map((row) => [row.id, row.bench, row.status, row.cycles])).toEqual([[signedId, 'bench A', 'closed', 20]]);
    } finally {
      await logbook.close();
    }
    expect((await refusal('qa_reviewer', "INSERT INTO units (serial, created_at_ms) VALUES ('LN-9', 0)"))?.message).toMatch(/permission denied for table units/);
    expect((await refusal('qa_reviewer', 'UPDATE sessions SET notes = $1 WHERE id = $2', ['x', openId]))?.message).toMatch(/permission denied for table sessions/);
  });
});
