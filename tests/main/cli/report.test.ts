/** `rampwright report`, `export` and `import` end to end through the command line (exit codes, messages, files). */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openRecordSources } from '../../../main/record/openRecordSources';
import { recordSweepSession } from '../record/recordFixture';
import { tempFolder, type TempFolder } from '../store/storeFixtures';
import { runCli as run } from './cliRun';

let folder: TempFolder;
let dbPath = '';
let sessionId = 0;

beforeAll(async () => {
  folder = tempFolder('rampwright-report-cli-');
  dbPath = folder.file('logbook.sqlite');
  const sources = await openRecordSources(dbPath, { create: true });
  sessionId = (await recordSweepSession(sources.logbook, { seconds: 0.6 })).sessionId;
  await sources.close();
}, 60_000);

afterAll(() => folder.remove());

describe('rampwright report', () => {
  it('writes an HTML record and verifies it against the logbook', async () => {
    const out = folder.file('record.html');
    const written = await run(['report', '--db', dbPath, '--session', String(sessionId), '--out', out]);
    expect(written.code).toBe(0);
    expect(written.stdout).toMatch(/^Wrote .*record\.html \(\d+ bytes\)/);
    expect(readFileSync(out, 'utf8')).toContain('RW-7731');
    const verified = await run(['report', '--db', dbPath, '--verify', out]);
    expect(verified.code).toBe(0);
    expect(verified.stdout).toMatch(/^Record matches the logbook: session \d+, capture digest [0-9a-f]{64}/);
  });

  it('says when a record does not match (exit 2)', async () => {
    const out = folder.file('other.pdf');
    expect((await run(['report', '--db', dbPath, '--session', String(sessionId), '--out', out])).code).toBe(0);
    const html = folder.file('wrong.html');
    writeFileSync(html, `<meta name="rampwright-captures-sha256" content="${'ab'.repeat(32)}">`);
    const result = await run(['report', '--db', dbPath, '--session', String(sessionId), '--verify', html]);
    expect(result.code).toBe(2);
    expect(result.stdout).toMatch(/does NOT match/);
  });

  it('refuses bad options with a clear message and exit 2', async () => {
    const cases: Array<[string[], RegExp]> = [
      [['report', '--db', dbPath, '--session', '1', '--out', folder.file('r.docx')], /cannot tell the record format from "\.docx"/],
      [['report', '--db', dbPath, '--session', 'x1', '--out', folder.file('r.pdf')], /"x1" is not a session number/],
      [['report', '--db', dbPath, '--session', '42', '--out', folder.file('r.pdf')], /there is no session 42/],
      [['report', '--db', folder.file('none.sqlite'), '--session', '1', '--out', folder.file('r.pdf')], /there is no logbook here/],
      [['report', '--db', dbPath, '--session', '1'], /give --out/],
    ];
    for (const [args, message] of cases) {
      const result = await run(args);
      expect(result.code, args.join(' ')).toBe(2);
      expect(result.stderr, args.join(' ')).toMatch(message);
    }
    expect(existsSync(folder.file('r.pdf'))).toBe(false);
  });
});

describe('rampwright export and import', () => {
  it('moves a session to another logbook, and a second import changes nothing', async () => {
    const archive = folder.file('moved.rwsession');
    expect((await run(['export', '--db', dbPath, '--session', String(sessionId), '--out', archive])).code).toBe(0);
    const other = folder.file('other-bench.sqlite');
    const first = await run(['import', '--db', other, archive]);
    expect(first.code).toBe(0);
    expect(first.stdout).toMatch(/^Imported as session 1 \(content sha-256 [0-9a-f]{64}\)/);
    const second = await run(['import', '--db', other, archive]);
    expect(second.stdout).toMatch(/^Already in this logbook as session 1 .*nothing changed/);
    const listed = await run(['log', '--db', other, '--json']);
    expect(JSON.parse(listed.stdout).sessions.map((row: { unit: string }) => row.unit)).toEqual(['RW-7731']);
  });

  it('exports captures as COMTRADE and refuses an unknown kind', async () => {
    const result = await run(['export', '--db', dbPath, '--session', String(sessionId), '--format', 'captures-comtrade', '--out', folder.file('cap.cfg')]);
    expect(result.code).toBe(0);
    expect(existsSync(folder.file('cap.dat'))).toBe(true);
    const wrong = await run(['export', '--db', dbPath, '--session', String(sessionId), '--format', 'spreadsheet', '--out', folder.file('x')]);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toMatch(/"spreadsheet" is not an export kind/);
  });

  it('a damaged archive is refused with exit 2 and the logbook is untouched', async () => {
    const archive = folder.file('moved.rwsession');
    const damaged = folder.file('damaged.rwsession');
    writeFileSync(damaged, readFileSync(archive).subarray(0, 100));
    const target = folder.file('third-bench.sqlite');
    const result = await run(['import', '--db', target, damaged]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/damaged\.rwsession: is not a Rampwright session archive/);
    expect(JSON.parse((await run(['log', '--db', target, '--json'])).stdout).sessions).toEqual([]);
  });

  it('writes recall pages: drift of a unit, fleet of a design, two sessions side by side', async () => {
    const drift = await run(['report', '--db', dbPath, '--unit', 'RW-7731', '--out', folder.file('drift.html')]);
    expect(drift.code).toBe(0);
    expect(readFileSync(folder.file('drift.html'), 'utf8')).toContain('Drift of unit RW-7731');
    const fleet = await run(['report', '--db', dbPath, '--design', 'Charger firing board CH-50H (demo)', '--out', folder.file('fleet.html')]);
    expect(fleet.code).toBe(0);
    expect(readFileSync(folder.file('fleet.html'), 'utf8')).toContain('1 units');
    const compare = await run(['report', '--db', dbPath, '--compare', `${sessionId},${sessionId}`, '--out', folder.file('compare.html')]);
    expect(compare.code).toBe(0);
    const wrong = await run(['report', '--db', dbPath, '--unit', 'RW-7731', '--out', folder.file('drift.pdf')]);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toMatch(/recall pages are HTML/);
  });
});
