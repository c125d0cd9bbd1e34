import Database from 'better-sqlite3';
import { spawnSync } from 'node:child_process';
import { hostname } from 'node:os';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createBatchingWriter } from '../../../main/store/logbookWriter';
import { openLogbookDatabase } from '../../../main/store/openDatabase';
import { readSessionRow } from '../../../main/store/sessionQueries';
import { runSync, type SqlProgram } from '../../../main/store/sqlProgram';
import { openSqliteLogbook, sqliteExecutor } from '../../../main/store/sqliteLogbook';
import { insertSession, saveDesign } from '../../../main/store/writeQueries';
import { chargerDesign, cycleReading, tempFolder, type TempFolder } from './storeFixtures';

let folder: TempFolder;
beforeEach(() => {
  folder = tempFolder();
});
afterEach(() => folder.remove());

const countCycles = (path: string): number => {
  const db = new Database(path, { readonly: true });
  try {
    return (db.prepare('SELECT count(*) AS n FROM cycles').get() as { n: number }).n;
  } finally {
    db.close();
  }
};

async function until(check: () => boolean, limitMs = 10_000): Promise<void> {
  const start = Date.now();
  while (!check()) {
    if (Date.now() - start > limitMs) throw new Error('condition not met');
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

describe('logbook writer', () => {
  it('only queues on add, then writes the queue in batches without being asked', async () => {
    const path = folder.file('batched.sqlite');
    const logbook = await openSqliteLogbook(path);
    const writer = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1' }, { flushIntervalMs: 100 });
    for (let i = 0; i < 3000; i += 1) writer.addCycle(cycleReading(i * 0.02, { alphaDeg: i % 180 }));
    // Nothing has touched the disk yet: adding is a push onto the in-memory queue.
    expect(writer.stats().queued).toBe(3000);
    expect(countCycles(path)).toBe(0);
    await until(() => countCycles(path) === 3000);
    const stats = writer.stats();
    expect(stats.queued).toBe(0);
    expect(stats.cyclesWritten).toBe(3000);
    // All 3000 went in one or two transactions, not one each.
    expect(stats.batches).toBeGreaterThanOrEqual(1);
    expect(stats.batches).toBeLessThanOrEqual(3);
    expect(stats.lastError).toBeNull();
    // Stored in order with consecutive sequence numbers.
    const db = new Database(path, { readonly: true });
    const rows = db.prepare('SELECT seq, t_s AS t, alpha_deg AS alpha, clipped FROM cycles ORDER BY seq').all() as Array<{ seq: number; t: number; alpha: number; clipped: number }>;
    db.close();
    expect(rows[2999]).toEqual({ seq: 2999, t: 2999 * 0.02, alpha: 2999 % 180, clipped: 0 });
    await writer.close();
    expect(() => writer.addCycle(cycleReading(0))).toThrow(/closed/);
    await logbook.close();
  });

  it('writes trims, link events, notes and readings with the session', async () => {
    const logbook = await openSqliteLogbook(folder.file('extras.sqlite'));
    const writer = await logbook.startSession({ unitSerial: 'RW-0207', design: chargerDesign(), operator: 'bench 3', notes: 'first look' });
    writer.addTrim({ part: 'rEmitter', fromOhm: 6800, toOhm: 6200, method: 'trim plan', reason: 'ramp peak 6.6 V, 9.6 % low', at: new Date('2026-03-04T10:00:00Z') });
    writer.addLinkEvent('sequence-gap', '2 blocks lost', 2);
    writer.setNotes('R14 replaced');
    await writer.close();
    const detail = await logbook.session(writer.sessionId);
    expect(detail?.trims).toEqual([
      { id: 1, part: 'rEmitter', fromOhm: 6800, toOhm: 6200, method: 'trim plan', reason: 'ramp peak 6.6 V, 9.6 % low', at: '2026-03-04T10:00:00.000Z' },
    ]);
    expect(detail?.linkEvents.map((event) => [event.kind, event.count])).toEqual([['sequence-gap', 2]]);
    expect(detail?.notes).toBe('R14 replaced');
    expect(detail?.row.linkErrors).toBe(2);
    await logbook.close();
  });
});

describe('interrupted sessions', () => {
  it("marks a session interrupted on the next open when its writer's process is gone, ending it at its last write", async () => {
    const path = folder.file('recover.sqlite');
    const logbook = await openSqliteLogbook(path);
    const writer = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1' });
    for (let i = 0; i < 10; i += 1) writer.addCycle(cycleReading(i * 0.02));
    await writer.flush();
    // Hand the session to a process that has exited (its pid is free): as if that writer had been killed.
    const gone = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
    const db = new Database(path);
    db.prepare('UPDATE sessions SET writer_pid = ?').run(Number(gone.stdout));
    const lastWriteMs = (db.prepare('SELECT max(recorded_at_ms) AS at FROM cycles').get() as { at: number }).at;
    db.close();
    // A second open session whose writer is this very process, still running: it must stay open.
    const live = await logbook.startSession({ unitSerial: 'RW-0207', design: chargerDesign(), operator: 'bench 2' });
    await logbook.close();

    const again = await openSqliteLogbook(path);
    const rows = await again.listSessions();
    expect(rows.map((row) => [row.unit, row.status])).toEqual([
      ['RW-0142', 'interrupted'],
      ['RW-0207', 'open'],
    ]);
    expect(rows[0].cycles).toBe(10);
    expect(Date.parse(rows[0].endedAt ?? '')).toBeGreaterThanOrEqual(lastWriteMs);
    expect(await again.recoverInterruptedSessions()).toEqual([]);
    await again.close();
    void live;
  });

  it('judges a writer on another host by its heartbeat', async () => {
    const path = folder.file('remote.sqlite');
    const logbook = await openSqliteLogbook(path);
    const stale = await logbook.startSession({ unitSerial: 'RW-0001', design: chargerDesign(), operator: 'bench 1' });
    const fresh = await logbook.startSession({ unitSerial: 'RW-0002', design: chargerDesign(), operator: 'bench 1' });
    await logbook.close();
    const db = new Database(path);
    const otherHost = `${hostname()}-other-bench`;
    // The other bench's writer: 60 s since its last heartbeat (gone) versus 1 s (alive); limit 15 s.
    db.prepare('UPDATE sessions SET writer_host = ?, heartbeat_at_ms = ? WHERE id = ?').run(otherHost, Date.now() - 60_000, stale.sessionId);
    db.prepare('UPDATE sessions SET writer_host = ?, heartbeat_at_ms = ? WHERE id = ?').run(otherHost, Date.now() - 1_000, fresh.sessionId);
    db.close();
    const again = await openSqliteLogbook(path);
    expect((await again.listSessions()).map((row) => [row.unit, row.status])).toEqual([
      ['RW-0001', 'interrupted'],
      ['RW-0002', 'open'],
    ]);
    await again.close();
  });
});

describe('a logbook locked by another program', () => {
  it('keeps the queue while the lock is held and writes it all once the lock is gone', async () => {
    const path = folder.file('locked.sqlite');
    const logbook = await openSqliteLogbook(path);
    const writer = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1' }, { flushIntervalMs: 50 });
    const other = new Database(path);
    other.exec('BEGIN IMMEDIATE'); // another process holds the write lock
    for (let i = 0; i < 500; i += 1) writer.addCycle(cycleReading(i * 0.02));
    await expect(writer.flush()).rejects.toThrow(/logbook write failed: database is locked/);
    expect(writer.stats()).toMatchObject({ queued: 500, cyclesWritten: 0, cyclesDropped: 0 });
    other.exec('COMMIT');
    other.close();
    await until(() => writer.stats().cyclesWritten === 500);
    expect(writer.stats().lastError).toBeNull();
    expect(countCycles(path)).toBe(500);
    const row = await writer.close();
    expect(row.cycles).toBe(500);
    await logbook.close();
  });
});

describe('a writer whose disk refuses writes for long', () => {
  it('stops growing at maxQueuedItems, counting the cycles it had to drop, and never drops trims or link events', async () => {
    const path = folder.file('capped.sqlite');
    const logbook = await openSqliteLogbook(path);
    const writer = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1' }, { flushIntervalMs: 3_600_000, maxQueuedItems: 100 });
    for (let i = 0; i < 500; i += 1) writer.addCycle(cycleReading(i * 0.02));
    writer.addLinkEvent('unplugged', '/dev/ttyACM0');
    expect(writer.stats()).toMatchObject({ queued: 101, cyclesDropped: 400 });
    const row = await writer.close();
    // The first 100 cycles (the oldest, contiguous) and the event are stored.
    expect(row.cycles).toBe(100);
    expect(row.linkErrors).toBe(1);
    await logbook.close();
  });
});

describe('a batch whose answer was lost', () => {
  it('is tried again as the same batch and, having committed, writes nothing twice', async () => {
    // A shared logbook's connection can drop after COMMIT reached the server but before its answer came back: the
    // writer cannot tell, tries the batch again, and the batch's stamp on the session says it is already there.
    const path = folder.file('lost-answer.sqlite');
    const db = openLogbookDatabase(path);
    const execute = sqliteExecutor(db);
    const writeNow = <T>(program: SqlProgram<T>): T => db.transaction(() => runSync(program, execute)).immediate();
    const design = writeNow(saveDesign(chargerDesign(), Date.now()));
    const sessionId = writeNow(insertSession({ serial: 'RW-0150', designId: design.id, designName: design.name, operator: 'bench 1', startedAtMs: Date.now(), notes: null, bench: 'bench 1', writer: { host: 'here', pid: 1 }, nowMs: Date.now() }));
    let answersLost = 1;
    const writer = createBatchingWriter(sessionId, {
      flushIntervalMs: 3_600_000,
      readRow: async (id) => runSync(readSessionRow(id, path), execute),
      write: async (program) => {
        const result = writeNow(program);
        if (answersLost > 0) {
          answersLost -= 1;
          throw new Error('Connection terminated unexpectedly');
        }
        return result;
      },
    });
    const count = (table: string) => (db.prepare(`SELECT count(*) AS n FROM ${table} WHERE session_id = ?`).get(sessionId) as { n: number }).n;
    for (let i = 0; i < 50; i += 1) writer.addCycle(cycleReading(i * 0.02));
    writer.addLinkEvent('crc-failures', 'one line', 1);
    await expect(writer.flush()).rejects.toThrow(/Connection terminated/);
    // It did commit; the writer does not know.
    expect([count('cycles'), count('link_events'), writer.stats().queued]).toEqual([50, 1, 51]);
    for (let i = 50; i < 60; i += 1) writer.addCycle(cycleReading(i * 0.02));
    await writer.flush();
    expect([count('cycles'), count('link_events'), writer.stats().queued]).toEqual([60, 1, 0]);
    const seqs = (db.prepare('SELECT seq FROM cycles WHERE session_id = ? ORDER BY seq').all(sessionId) as Array<{ seq: number }>).map((row) => row.seq);
    expect(seqs).toEqual(Array.from({ length: 60 }, (_, index) => index));
    expect((await writer.close()).cycles).toBe(60);
    db.close();
  });
});
