/**
 * The session archive: export then import gives an identical session (every table's rows compared), importing
 * twice changes nothing, and damaged or conflicting archives are refused with an InputError that leaves the
 * logbook untouched (one transaction).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { gunzipSync, gzipSync } from 'node:zlib';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../app/errors';
import { exportSessionFile } from '../../../main/exchange/exportFiles';
import { archiveContentHash, decodeSessionArchive, importSessionArchive } from '../../../main/exchange/sessionArchive';
import { openRecordSources, type OpenedRecordSources } from '../../../main/record/openRecordSources';
import { openLogbookDatabase, type SqliteDatabase } from '../../../main/store/openDatabase';
import { recordSweepSession } from '../record/recordFixture';
import { chargerDesign, tempFolder, type TempFolder } from '../store/storeFixtures';
import { legacySignOffReason } from '../../../app/exchange/legacySignOff';

let folder: TempFolder;
let source: OpenedRecordSources;
/** A second connection to the source logbook file, for looking at its rows directly. */
let sourceDb: SqliteDatabase;
let sessionId = 0;
let archivePath = '';

/**
 * Every row of every table the session touches, without local ids (units by serial, designs by content hash).
 * A design version the other logbook already had keeps its own save time there, so that column is left out.
 */
function sessionTables(db: SqliteDatabase, id: number): Record<string, unknown[]> {
  const rows = (sql: string) => db.prepare(sql).all(id);
  return {
    sessions: rows(`SELECT u.serial, d.content_hash, d.name AS design_name, d.design_json, u.design_name AS unit_design, u.created_at_ms AS unit_created,
      s.operator, s.started_at_ms, s.ended_at_ms, s.status, s.notes, s.readings_json, s.steps_json, s.cycle_count, s.alpha_mean_deg, s.ramp_peak_median_v,
      s.sign_off, s.sign_off_reason, s.sign_off_exceptions_json
      FROM sessions s JOIN units u ON u.id = s.unit_id JOIN board_designs d ON d.id = s.design_id WHERE s.id = ?`),
    cycles: rows('SELECT * FROM cycles WHERE session_id = ? ORDER BY seq').map((row) => ({ ...(row as object), session_id: undefined })),
    transferPoints: rows('SELECT * FROM transfer_points WHERE session_id = ? ORDER BY seq').map((row) => ({ ...(row as object), session_id: undefined })),
    captures: rows('SELECT label, start_s, sample_rate_hz, samples_per_channel, roles, after_gap, started_at_ms, encoding, sha256, hex(data) AS data FROM captures WHERE session_id = ? ORDER BY id'),
    trims: rows('SELECT part, from_ohm, to_ohm, method, reason, at_ms FROM trims WHERE session_id = ? ORDER BY id'),
    linkEvents: rows('SELECT kind, detail, count, at_ms FROM link_events WHERE session_id = ? ORDER BY id'),
    partMeasurements: rows('SELECT part, value, design_value, at_ms FROM part_measurements WHERE session_id = ? ORDER BY id'),
  };
}

function tableCounts(db: SqliteDatabase): Record<string, number> {
  const counts: Record<string, number> = {};
  for (const table of ['board_designs', 'units', 'sessions', 'cycles', 'transfer_points', 'captures', 'trims', 'link_events', 'part_measurements']) {
    counts[table] = (db.prepare(`SELECT count(*) AS n FROM ${table}`).get() as { n: number }).n;
  }
  return counts;
}

function rewriteArchive(mutate: (archive: Record<string, any>) => void, options: { rehash?: boolean } = {}): Buffer {
  const archive = JSON.parse(gunzipSync(readFileSync(archivePath)).toString('utf8'));
  mutate(archive);
  if (options.rehash) archive.contentSha256 = archiveContentHash(archive.session);
  return gzipSync(Buffer.from(JSON.stringify(archive)));
}

beforeAll(async () => {
  folder = tempFolder('rampwright-archive-');
  source = await openRecordSources(folder.file('bench-a.sqlite'), { create: true });
  sourceDb = openLogbookDatabase(folder.file('bench-a.sqlite'));
  // Signed off with exceptions, so the outcome, the reason and the exceptions travel in every round trip below.
  const signOff = { kind: 'signed-off-with-exceptions' as const, reason: 'limits to be checked on the customer controller', exceptions: [{ step: 'limits' as const, problem: 'not-measured' as const, readings: ['Largest alpha', 'Smallest alpha'] }] };
  sessionId = (await recordSweepSession(source.logbook, { signOff })).sessionId;
  archivePath = folder.file('session.rwsession');
  await exportSessionFile(source, sessionId, archivePath, 'archive');
}, 60_000);

afterAll(async () => {
  sourceDb.close();
  await source.close();
  folder.remove();
});

describe('session archive', () => {
  it('export then import into another logbook gives an identical session, table by table', async () => {
    const target = await openRecordSources(folder.file('bench-b.sqlite'), { create: true });
    const targetDb = openLogbookDatabase(folder.file('bench-b.sqlite'));
    try {
      // The other bench already knows another unit, so its local ids differ from the source's.
      await recordSweepSession(target.logbook, { unitSerial: 'RW-0001', startedAt: new Date('2026-10-01T07:00:00Z'), seconds: 0.3 });
      const result = await importSessionArchive(target.logbook, readFileSync(archivePath), archivePath);
      expect(result.imported).toBe(true);
      expect(result.sessionId).not.toBe(sessionId);
      const before = sessionTables(sourceDb, sessionId);
      const after = sessionTables(targetDb, result.sessionId);
      for (const table of Object.keys(before)) expect(after[table], table).toEqual(before[table]);
      expect(before.cycles.length).toBeGreaterThan(10);
      expect(before.captures.length).toBe(1);
      expect(before.partMeasurements.length).toBe(2);
      // The logbook's own views agree too: the capture reads back with its hash checked.
      const capture = (await target.logbook.session(result.sessionId))!.captures[0];
      expect((await target.logbook.readCapture(capture.id))!.block.sync.length).toBeGreaterThan(1000);
    } finally {
      targetDb.close();
      await target.close();
    }
  });

  it('importing the same archive twice changes nothing', async () => {
    const target = await openRecordSources(folder.file('bench-c.sqlite'), { create: true });
    const targetDb = openLogbookDatabase(folder.file('bench-c.sqlite'));
    try {
      const first = await importSessionArchive(target.logbook, readFileSync(archivePath), archivePath);
      const counts = tableCounts(targetDb);
      const second = await importSessionArchive(target.logbook, readFileSync(archivePath), archivePath);
      expect(second).toEqual({ ...first, imported: false });
      expect(tableCounts(targetDb)).toEqual(counts);
      // Importing a session back into the logbook it came from is also a no-op.
      const home = await importSessionArchive(source.logbook, readFileSync(archivePath), archivePath);
      expect(home).toMatchObject({ sessionId, imported: false });
    } finally {
      targetDb.close();
      await target.close();
    }
  });

  const damaged: Array<[string, () => Buffer, RegExp]> = [
    ['cut short', () => readFileSync(archivePath).subarray(0, 200), /not gzip-compressed, or cut short/],
    ['not JSON', () => gzipSync(Buffer.from('{"format": "rampwright-session-archive", ')), /JSON is damaged/],
    ['another format', () => gzipSync(Buffer.from('{"format": "something else"}')), /not a Rampwright session archive/],
    ['a changed reading, old hash', () => rewriteArchive((archive) => { archive.session.cycles.rows[3][4] += 0.5; }), /does not match its sha-256/],
    ['a missing column', () => rewriteArchive((archive) => { archive.session.trims.columns.pop(); }, { rehash: true }), /columns must be exactly/],
    ['altered capture bytes', () => rewriteArchive((archive) => { archive.captureData[0] = Buffer.from('not the samples').toString('base64'); }), /capture 1: stored capture is damaged/],
    ['a design that does not match its hash', () => rewriteArchive((archive) => { archive.session.design.designJson = archive.session.design.designJson.replace('"mainsHz":50', '"mainsHz":60'); }, { rehash: true }), /board design in the archive does not match/],
  ];
  for (const [what, make, message] of damaged) {
    it(`refuses an archive with ${what}, and the logbook stays exactly as it was`, async () => {
      const counts = tableCounts(sourceDb);
      const version = sourceDb.pragma('data_version', { simple: true });
      let error: unknown;
      try {
        await importSessionArchive(source.logbook, make(), 'damaged.rwsession');
      } catch (caught) {
        error = caught;
      }
      expect(error).toBeInstanceOf(InputError);
      expect((error as Error).message).toMatch(message);
      expect(tableCounts(sourceDb)).toEqual(counts);
      // data_version changes when another connection commits to the file (sqlite.org, "PRAGMA data_version").
      expect(sourceDb.pragma('data_version', { simple: true })).toBe(version);
    });
  }

  it('refuses a different session of the same unit at the same start (a conflict, not a copy)', async () => {
    const conflicting = rewriteArchive((archive) => { archive.session.record.notes = 'edited elsewhere'; }, { rehash: true });
    const counts = tableCounts(sourceDb);
    await expect(importSessionArchive(source.logbook, conflicting, 'conflict.rwsession')).rejects.toThrow(/already has a different session of unit RW-7731/);
    expect(tableCounts(sourceDb)).toEqual(counts);
  });

  it('any bytes at all give an archive or an InputError, never a crash (fast-check)', () => {
    const good = readFileSync(archivePath);
    fc.assert(
      fc.property(fc.oneof(fc.uint8Array({ maxLength: 300 }), fc.tuple(fc.nat(good.length - 1), fc.integer({ min: 1, max: 255 })).map(([at, flip]) => {
        const copy = Buffer.from(good);
        copy[at] ^= flip;
        return copy;
      })), (bytes) => {
        try {
          decodeSessionArchive(bytes, 'fuzz');
        } catch (error) {
          expect(error).toBeInstanceOf(InputError);
        }
      }),
      { numRuns: 60 },
    );
  });

  it('writes gzip-compressed JSON of our documented format', () => {
    writeFileSync(folder.file('copy.rwsession'), readFileSync(archivePath));
    const json = JSON.parse(gunzipSync(readFileSync(archivePath)).toString('utf8'));
    expect(json.format).toBe('rampwright-session-archive');
    expect(json.version).toBe(1);
    expect(archiveContentHash(json.session)).toBe(json.contentSha256);
    expect(json.session.partMeasurements.columns).toEqual(['part', 'value', 'design_value', 'at_ms']);
    expect(json.session.partMeasurements.rows.map((row: unknown[]) => row.slice(0, 3))).toEqual([['rEmitter', 6650, 6800], ['cRamp', 4.42e-7, 4.7e-7]]);
  });

  it('leaves the measured parts out of a session that has none, so its content hash is what it always was', async () => {
    const writer = await source.logbook.startSession({ unitSerial: 'RW-0002', design: chargerDesign(), operator: 'A. Tester', startedAt: new Date('2026-11-21T08:00:00Z') });
    const row = await writer.close();
    const path = folder.file('plain.rwsession');
    await exportSessionFile(source, row.id, path, 'archive');
    const json = JSON.parse(gunzipSync(readFileSync(path)).toString('utf8'));
    expect(Object.keys(json.session)).not.toContain('partMeasurements');
    expect(Object.keys(json.session.record)).not.toContain('stepsJson');
    // Closed without sign-off: none of the sign-off keys, as archives written before sign-offs were kept.
    for (const key of ['signOff', 'signOffReason', 'signOffExceptionsJson']) expect(Object.keys(json.session.record)).not.toContain(key);
    expect(Object.keys(json.session).sort()).toEqual(['captures', 'cycles', 'design', 'linkEvents', 'record', 'transferPoints', 'trims', 'unit']);
  });

  it('carries a sign-off with exceptions: the outcome, the reason and the steps excepted arrive word for word', async () => {
    const json = JSON.parse(gunzipSync(readFileSync(archivePath)).toString('utf8'));
    expect(json.session.record).toMatchObject({ status: 'closed', signOff: 'signed-off-with-exceptions', signOffReason: 'limits to be checked on the customer controller' });
    const target = await openRecordSources(folder.file('bench-sign-off.sqlite'), { create: true });
    try {
      const result = await importSessionArchive(target.logbook, readFileSync(archivePath), archivePath);
      const [row] = await target.logbook.listSessions();
      expect(row).toMatchObject({ id: result.sessionId, outcome: 'signed-off-with-exceptions', signOffReason: 'limits to be checked on the customer controller' });
      expect(row.signOffExceptions).toEqual([{ step: 'limits', problem: 'not-measured', readings: ['Largest alpha', 'Smallest alpha'] }]);
    } finally {
      await target.close();
    }
  });

  it('refuses a sign-off on an interrupted session, or exceptions without their reason', () => {
    const interrupted = rewriteArchive((archive) => { archive.session.record.status = 'interrupted'; }, { rehash: true });
    expect(() => decodeSessionArchive(interrupted, 'x.rwsession')).toThrow(/only a closed session can carry a sign-off/);
    const noReason = rewriteArchive((archive) => { delete archive.session.record.signOffReason; }, { rehash: true });
    expect(() => decodeSessionArchive(noReason, 'x.rwsession')).toThrow(/carries its reason and its exceptions/);
  });

  it('an archive from before sign-offs were kept lands as the upgraded logbook holds it, and importing it again changes nothing', async () => {
    // The same session as an older bench wrote it: closed, the sign-off step among its steps, no sign-off keys.
    const older = rewriteArchive((archive) => {
      for (const key of ['signOff', 'signOffReason', 'signOffExceptionsJson']) delete archive.session.record[key];
    }, { rehash: true });
    const target = await openRecordSources(folder.file('bench-older.sqlite'), { create: true });
    try {
      const first = await importSessionArchive(target.logbook, older, 'older.rwsession');
      const [row] = await target.logbook.listSessions();
      // Classified from its recorded steps by the gate's rule (transfer and limits of this sweep never reached the
      // design's low end, so they were not measured): signed off with exceptions, and the reason says no reason
      // was asked for then.
      expect(row.outcome).toBe('signed-off-with-exceptions');
      expect(row.signOffReason).toBe(legacySignOffReason);
      expect(row.signOffExceptions.map((exception) => exception.step)).toEqual(expect.arrayContaining(['limits']));
      const again = await importSessionArchive(target.logbook, older, 'older.rwsession');
      expect(again).toMatchObject({ sessionId: first.sessionId, imported: false });
      expect(await target.logbook.listSessions()).toHaveLength(1);
    } finally {
      await target.close();
    }
  });
});
