/**
 * Pushing a bench's sessions to the shared logbook: every session arrives whole (its archive's content hash the same
 * in both stores, every row and capture byte equal), pushing again stores nothing twice, a push whose answer was lost
 * finds its session there, a conflicting session is refused without writing, and a session read back from the
 * shared logbook imports into another bench unchanged. SQLite bench logbooks, a real PostgreSQL shared one.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pushSessions } from '../../../main/share/pushSessions';
import { archiveContentHash } from '../../../main/store/canonicalJson';
import type { Logbook } from '../../../main/store/logbookTypes';
import { openLogbook } from '../../../main/store/openLogbook';
import { recordSweepSession } from '../record/recordFixture';
import { chargerDesign, cycleReading, tempFolder, type TempFolder } from '../store/storeFixtures';
import { startStoreKit, type StoreKit } from '../../helpers/logbookStores';

let kit: StoreKit;
let folder: TempFolder;
let sharedLocation = '';
let bench: Logbook;
const ids: number[] = [];
const openShared = () => openLogbook(sharedLocation);

beforeAll(async () => {
  kit = await startStoreKit('PostgreSQL');
  folder = tempFolder('rampwright-push-');
  sharedLocation = await kit.freshLocation();
  bench = await openLogbook(folder.file('bench-d.sqlite'));
  ids.push((await recordSweepSession(bench, { unitSerial: 'LN-3101' })).sessionId);
  ids.push((await recordSweepSession(bench, { unitSerial: 'LN-3102', startedAt: new Date('2026-11-20T09:10:00Z'), seconds: 0.6 })).sessionId);
  // Values JSON cannot carry as numbers travel as text and come back as they were.
  const odd = await bench.startSession({ unitSerial: 'LN-3103', design: chargerDesign(), operator: 'bench D', bench: 'bench D', startedAt: new Date('2026-11-20T09:20:00Z') });
  odd.addCycle(cycleReading(0, { nonlinearityPct: Number.POSITIVE_INFINITY, slopeVPerMs: Number.NEGATIVE_INFINITY, rampFloorV: Number.NaN }));
  ids.push((await odd.close()).id);
}, 90_000);

afterAll(async () => {
  await bench?.close();
  await kit?.stop();
  folder?.remove();
});

describe('push', () => {
  it('copies every finished session whole: same content hash, same rows, same capture bytes', async () => {
    const report = await pushSessions(bench, sharedLocation, openShared);
    expect(report.sessions.map((session) => [session.sessionId, session.outcome])).toEqual(ids.map((id) => [id, 'pushed']));
    expect(report.retried).toEqual([]);
    expect(report.waiting).toBe(0);
    const shared = await openShared();
    try {
      for (const session of report.sessions) {
        const local = await bench.archiveSession(session.sessionId);
        const remote = await shared.archiveSession(session.remoteSessionId as number);
        expect(remote.session).toEqual(local.session);
        expect(remote.captureData.map((bytes) => bytes.toString('base64'))).toEqual(local.captureData.map((bytes) => bytes.toString('base64')));
        expect(await shared.sessionContentHash(session.remoteSessionId as number)).toBe(archiveContentHash(local.session));
        expect(session.cycles).toBe(local.session.cycles.rows.length);
      }
      const odd = await shared.archiveSession(report.sessions[2].remoteSessionId as number);
      // nonlinearity_pct, slope_v_per_ms, ramp_floor_v of the one cycle (ARCHIVE.md: infinities as text, NaN as null).
      const columns = odd.session.cycles.columns;
      const row = odd.session.cycles.rows[0];
      expect([row[columns.indexOf('nonlinearity_pct')], row[columns.indexOf('slope_v_per_ms')], row[columns.indexOf('ramp_floor_v')]]).toEqual(['Infinity', '-Infinity', null]);
      // The shared logbook shows which bench did it, and the readings agree with the bench's own.
      const rows = await shared.listSessions();
      const localRows = await bench.listSessions();
      expect(rows.map((r) => [r.unit, r.bench, r.cycles, r.status])).toEqual(localRows.map((r) => [r.unit, r.bench, r.cycles, r.status]));
      expect(rows.map((r) => r.rampPeakV)).toEqual(localRows.map((r) => r.rampPeakV));
      // Figures summed in SQL agree to rounding: the two databases add the same doubles in their own order.
      const figures = (await bench.compareSessions(localRows[0].id, localRows[1].id)).rows.map((r) => r.a as number);
      const sharedFigures = (await shared.compareSessions(rows[0].id, rows[1].id)).rows.map((r) => r.a as number);
      sharedFigures.forEach((value, index) => expect(value).toBeCloseTo(figures[index], 9));
    } finally {
      await shared.close();
    }
    // The bench notes what it shared; its rows say when.
    expect((await bench.listSessions()).every((row) => row.sharedAt !== null)).toBe(true);
  });

  it('pushing again stores nothing twice', async () => {
    const again = await pushSessions(bench, sharedLocation, openShared);
    expect(again.sessions).toEqual([]);
    const shared = await openShared();
    try {
      expect(await shared.listSessions()).toHaveLength(ids.length);
      // Even a bench that forgot it pushed (its record lost) gets "already there", not a copy.
      const content = await bench.archiveSession(ids[0]);
      const result = await shared.importArchiveSession({ ...content, contentSha256: archiveContentHash(content.session), where: 'again' });
      expect(result.imported).toBe(false);
      expect(await shared.listSessions()).toHaveLength(ids.length);
    } finally {
      await shared.close();
    }
  });

  it('a session the shared logbook already has with other content is refused and reported; nothing is written', async () => {
    const other = await openLogbook(folder.file('bench-e.sqlite'));
    try {
      // Another bench claims the same unit at the same start with different readings.
      await recordSweepSession(other, { unitSerial: 'LN-3101', seed: 99 });
      const report = await pushSessions(other, sharedLocation, openShared);
      expect(report.sessions.map((session) => session.outcome)).toEqual(['refused']);
      expect(report.sessions[0].reason).toMatch(/already has a different session of unit LN-3101/);
      expect(report.waiting).toBe(1);
    } finally {
      await other.close();
    }
    const shared = await openShared();
    expect(await shared.listSessions()).toHaveLength(ids.length);
    await shared.close();
  });

  it('a session read back from the shared logbook imports into another bench with its hash unchanged', async () => {
    const shared = await openShared();
    const third = await openLogbook(folder.file('bench-f.sqlite'));
    try {
      const [first] = await shared.listSessions({ unitSerial: 'LN-3101' });
      const content = await shared.archiveSession(first.id);
      const hash = archiveContentHash(content.session);
      const result = await third.importArchiveSession({ ...content, contentSha256: hash, where: 'from the shared logbook' });
      expect(result.imported).toBe(true);
      expect(await third.sessionContentHash(result.sessionId)).toBe(hash);
      expect(hash).toBe(await bench.sessionContentHash(ids[0]));
    } finally {
      await third.close();
      await shared.close();
    }
  });
});
