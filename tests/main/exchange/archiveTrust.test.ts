/**
 * What an archive may carry into a logbook, from the probe: archives with a recomputed hash whose design is not
 * JSON, whose design fails validation or whose readings are broken imported with exit 0 and then broke the views;
 * a 35 KB archive took import to 3.2 GB. Here each is refused in words with the logbook untouched; a signed
 * archive says which bench key signed it and a changed one fails its signature; decompression stops at the size
 * the archive declares; and one bad session already in a logbook breaks only its own views.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { deflateSync, gunzipSync, gzipSync } from 'node:zlib';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { archiveContentHash } from '../../../main/exchange/sessionArchive';
import { openBenchContext } from '../../../main/session/benchContext';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { runCli } from '../cli/cliRun';
import { recordSweepSession } from '../record/recordFixture';
import { tempFolder, type TempFolder } from '../store/storeFixtures';

let folder: TempFolder;
let signedPath = '';
let unsignedPath = '';
let printedFingerprint = '';

type ArchiveJson = Record<string, any>;

const sha256 = (text: string): string => createHash('sha256').update(text).digest('hex');
const read = (path: string): ArchiveJson => JSON.parse(gunzipSync(readFileSync(path)).toString('utf8')) as ArchiveJson;

/** A changed copy of the unsigned archive with every hash recomputed, as a forger would. */
function forge(name: string, change: (archive: ArchiveJson) => void): string {
  const archive = read(unsignedPath);
  change(archive);
  archive.session.design.contentHash = sha256(archive.session.design.designJson);
  archive.contentSha256 = archiveContentHash(archive.session);
  const path = folder.file(`${name}.rwsession`);
  writeFileSync(path, gzipSync(Buffer.from(JSON.stringify(archive))));
  return path;
}

async function sessionsIn(db: string): Promise<number> {
  const logbook = await openSqliteLogbook(db);
  const count = (await logbook.listSessions()).length;
  await logbook.close();
  return count;
}

beforeAll(async () => {
  folder = tempFolder('rampwright-trust-');
  const source = folder.file('bench-a.sqlite');
  const logbook = await openSqliteLogbook(source);
  await recordSweepSession(logbook);
  await logbook.close();
  signedPath = folder.file('signed.rwsession');
  unsignedPath = folder.file('unsigned.rwsession');
  const signed = await runCli(['export', '--db', source, '--session', '1', '--out', signedPath, '--key', folder.file('bench-a-key.pem')]);
  expect(signed.code, signed.stderr).toBe(0);
  printedFingerprint = /Signed with this bench's key ([0-9a-f]{4}( [0-9a-f]{4}){3})/.exec(signed.stdout)?.[1] ?? '';
  expect(printedFingerprint).not.toBe('');
  expect((await runCli(['export', '--db', source, '--session', '1', '--out', unsignedPath, '--unsigned'])).code).toBe(0);
}, 60_000);
afterAll(() => folder.remove());

describe('archives checked for their meaning', () => {
  const forgeries: Array<[string, (archive: ArchiveJson) => void, RegExp]> = [
    ['design-not-json', (archive) => (archive.session.design.designJson = '{"name": "half a design'), /design\.designJson is not JSON/],
    [
      'design-invalid',
      (archive) => {
        const design = JSON.parse(archive.session.design.designJson);
        design.parts.rEmitter.ohm = 1e-300;
        archive.session.design.designJson = JSON.stringify(design);
      },
      /the board design fails validation: design\.designJson: field parts\.rEmitter\.ohm \(emitter resistor [^)]*\): must be from 1R0 to 10M/,
    ],
    ['readings-broken', (archive) => (archive.session.record.readingsJson = '{"ramp": 5}'), /record\.readingsJson\.frequencyHz|record\.readingsJson\.ramp/],
    ['readings-not-json', (archive) => (archive.session.record.readingsJson = 'NaN'), /record\.readingsJson is not JSON/],
    ['cycle-cell', (archive) => (archive.session.cycles.rows[0][4] = 'ninety'), /cycles row 1, alpha_deg: must be a number/],
    ['steps-broken', (archive) => (archive.session.record.stepsJson = '[{"step": "dance"}]'), /record\.stepsJson/],
  ];

  for (const [name, change, words] of forgeries) {
    it(`refuses ${name} with a recomputed hash, in words, leaving the logbook as it was`, async () => {
      const db = folder.file(`target-${name}.sqlite`);
      const result = await runCli(['import', '--db', db, forge(name, change)]);
      expect(result.code).toBe(2);
      expect(result.stderr).toMatch(/the archive's session is not sound, so nothing was imported/);
      expect(result.stderr).toMatch(words);
      expect(result.stderr).not.toMatch(/\n\s+at |internal error/);
      expect(await sessionsIn(db)).toBe(0);
    });
  }
});

describe('signed archives', () => {
  it('an archive signed by the exporting bench names its key; --signed-by accepts that key and no other', async () => {
    const db = folder.file('signed-target.sqlite');
    const result = await runCli(['import', '--db', db, signedPath]);
    expect(result.code, result.stderr).toBe(0);
    expect(result.stdout).toContain(`Signed by bench key ${printedFingerprint}: the holder of that key exported exactly this content`);
    const again = await runCli(['import', '--db', folder.file('signed-target-2.sqlite'), '--signed-by', printedFingerprint, signedPath]);
    expect(again.code, again.stderr).toBe(0);
    const other = await runCli(['import', '--db', folder.file('signed-target-3.sqlite'), '--signed-by', '0000 1111 2222 3333', signedPath]);
    expect(other.code).toBe(2);
    expect(other.stderr).toContain(`is signed by bench key ${printedFingerprint}, not 0000 1111 2222 3333`);
    const unsigned = await runCli(['import', '--db', folder.file('signed-target-4.sqlite'), '--signed-by', printedFingerprint, unsignedPath]);
    expect(unsigned.code).toBe(2);
    expect(unsigned.stderr).toMatch(/is not signed, and --signed-by asks for bench key/);
    const plain = await runCli(['import', '--db', folder.file('signed-target-5.sqlite'), unsignedPath]);
    expect(plain.stdout).toMatch(/Not signed: the content is intact \(its sha-256 holds\), but nothing says which bench exported it/);
  });

  it('a signed archive changed after signing, its hash recomputed, fails its signature', async () => {
    const archive = read(signedPath);
    archive.session.record.operator = 'someone else';
    archive.contentSha256 = archiveContentHash(archive.session);
    const path = folder.file('resigned.rwsession');
    writeFileSync(path, gzipSync(Buffer.from(JSON.stringify(archive))));
    const db = folder.file('resigned-target.sqlite');
    const result = await runCli(['import', '--db', db, path]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/the archive is signed, but the signature does not hold: it was changed after it was signed/);
    expect(await sessionsIn(db)).toBe(0);
  });
});

describe('decompression bounded by the declared size', () => {
  it('an archive whose gzip expands beyond the size its trailer declares is refused without inflating it all', async () => {
    // 64 MiB of zeros gzip to about 64 KiB; the trailer is made to declare 1000 bytes.
    const bomb = gzipSync(Buffer.alloc(64 * 1024 * 1024));
    bomb.writeUInt32LE(1000, bomb.length - 4);
    const path = folder.file('gzip-bomb.rwsession');
    writeFileSync(path, bomb);
    const result = await runCli(['import', '--db', folder.file('bomb-target.sqlite'), path]);
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('expands beyond its declared size (1000 bytes)');
  });

  it('a capture whose data expands beyond the samples it declares is refused', async () => {
    const path = forge('capture-bomb', (archive) => {
      // 20 MiB of zeros in the data of a capture that declares its few thousand samples.
      archive.captureData[0] = deflateSync(Buffer.alloc(20 * 1024 * 1024)).toString('base64');
    });
    const result = await runCli(['import', '--db', folder.file('capture-bomb-target.sqlite'), path]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/capture 1: stored capture expands beyond its declared size \(\d+ bytes of samples\)/);
  });

  it('a capture that declares more samples than the program reads is refused before inflating', async () => {
    const path = forge('capture-huge', (archive) => (archive.session.captures[0].samplesPerChannel = 2 ** 31));
    const result = await runCli(['import', '--db', folder.file('capture-huge-target.sqlite'), path]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/more than this program reads/);
  });
});

describe('one bad session in a logbook', () => {
  it('breaks only its own views: fleet, drift and the other sessions still answer', async () => {
    const db = folder.file('mixed.sqlite');
    const logbook = await openSqliteLogbook(db);
    await recordSweepSession(logbook, { unitSerial: 'RW-7732', startedAt: new Date('2026-11-21T08:30:00Z'), seconds: 0.6 });
    await recordSweepSession(logbook, { unitSerial: 'RW-7733', startedAt: new Date('2026-11-22T08:30:00Z'), seconds: 0.6 });
    await logbook.close();
    // Session 2's readings broken in the file itself (a logbook from before these checks, or damage).
    const raw = new Database(db);
    raw.prepare("UPDATE sessions SET readings_json = '{\"ramp\": 5}' WHERE id = 2").run();
    raw.close();
    const context = await openBenchContext({ logbookPath: db, virtualPaced: false });
    try {
      const designName = 'Charger firing board CH-50H (demo)';
      const fleet = await context.dispatch('fleet', { designName });
      expect(fleet.ok, JSON.stringify(fleet)).toBe(true);
      const drift = await context.dispatch('drift', { unitSerial: 'RW-7732' });
      expect(drift.ok, JSON.stringify(drift)).toBe(true);
      expect((await context.dispatch('sessionDetail', { sessionId: 1 })).ok).toBe(true);
      const bad = await context.dispatch('sessionDetail', { sessionId: 2 });
      expect(bad).toMatchObject({ ok: false, error: { kind: 'expected', message: expect.stringMatching(/session 2: is not sound: its stored readings fail validation .*the other sessions are not affected/) } });
    } finally {
      await context.close();
    }
    const report = await runCli(['report', '--db', db, '--session', '2', '--out', folder.file('bad.html')]);
    expect(report.code).toBe(2);
    expect(report.stderr).not.toMatch(/internal error/);
    expect((await runCli(['report', '--db', db, '--design', 'Charger firing board CH-50H (demo)', '--out', folder.file('fleet.html')])).code).toBe(0);
    expect((await runCli(['report', '--db', db, '--session', '1', '--out', folder.file('good.html')])).code).toBe(0);
  });
});
