import { readFileSync, writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { chargerDesign, cycleReading, recordedStepsJson, tempFolder, type TempFolder } from '../store/storeFixtures';
import { formatLogbookTable } from '../../../main/cli/commands/log';
import type { SessionRow } from '../../../main/store/logbookTypes';
import { runCli as run } from './cliRun';

let folder: TempFolder;
let dbPath = '';

beforeAll(async () => {
  folder = tempFolder('rampwright-log-');
  dbPath = folder.file('logbook.sqlite');
  const logbook = await openSqliteLogbook(dbPath);
  // Unit RW-0142, trimmed from a high ramp (our scenario): three cycles at 10.4 V before the trim (alpha 89, 90,
  // 91), three after it at 7.28, 7.32, 7.36 V; the ramp step recorded 7.32 V after the re-check, the limits 10.2 and
  // 156.4 deg. Whole session: median peak (7.36 + 10.4) / 2 = 8.88 V, mean alpha 90 deg (by hand). One CRC burst of 4.
  const first = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1', startedAt: new Date('2026-03-01T09:00:00Z'), bench: 'bench A' });
  [89, 90, 91].forEach((alphaDeg, index) => first.addCycle(cycleReading(index * 0.02, { alphaDeg, rampPeakV: 10.4 })));
  [7.28, 7.32, 7.36].forEach((rampPeakV, index) => first.addCycle(cycleReading(0.06 + index * 0.02, { alphaDeg: null, rampPeakV })));
  first.setStepsJson(recordedStepsJson({ rampPeakV: 7.32, alphaMinDeg: 10.2, alphaMaxDeg: 156.4 }));
  first.addLinkEvent('crc-failures', '4 lines failed their CRC', 4);
  await first.close();
  const second = await logbook.startSession({ unitSerial: 'RW-0207', design: chargerDesign(), operator: 'bench 1', startedAt: new Date('2026-03-02T09:00:00Z'), bench: 'bench A' });
  await second.close('interrupted');
  // Two sign-offs: plain, and with exceptions (the reason and the step excepted travel with the row).
  const third = await logbook.startSession({ unitSerial: 'RW-0311', design: chargerDesign(), operator: 'bench 2', startedAt: new Date('2026-03-03T09:00:00Z') });
  await third.close('closed', { kind: 'signed-off' });
  const fourth = await logbook.startSession({ unitSerial: 'RW-0312', design: chargerDesign(), operator: 'bench 2', startedAt: new Date('2026-03-04T09:00:00Z') });
  await fourth.close('closed', { kind: 'signed-off-with-exceptions', reason: 'limits checked on the customer controller instead', exceptions: [{ step: 'limits', problem: 'not-recorded', readings: [] }] });
  const fifth = await logbook.startSession({ unitSerial: 'RW-0313', design: chargerDesign(), operator: 'bench 2', startedAt: new Date('2026-03-05T09:00:00Z') });
  fifth.addCycle(cycleReading(0, { alphaDeg: 45, rampPeakV: 7.3 }));
  await fifth.flush();
  await logbook.close();
});
afterAll(() => folder.remove());

describe('rampwright log', () => {
  it('prints every session as JSON with the fields the issue asks for', async () => {
    const { code, stdout } = await run(['log', '--db', dbPath, '--json']);
    expect(code).toBe(0);
    const listing = JSON.parse(stdout) as { sessions: Array<Record<string, unknown>> };
    expect(listing.sessions).toHaveLength(5);
    const [first, second, third, fourth, fifth] = listing.sessions;
    expect(Object.keys(first)).toEqual(expect.arrayContaining(['id', 'unit', 'status', 'outcome', 'startedAt', 'endedAt', 'cycles', 'rampPeakV', 'alphaMinDeg', 'alphaMaxDeg', 'wholeSession', 'linkErrors']));
    expect(first).toMatchObject({ unit: 'RW-0142', status: 'closed', outcome: 'closed', signOffReason: null, signOffExceptions: [], startedAt: '2026-03-01T09:00:00.000Z', cycles: 6, linkErrors: 4 });
    // The ramp peak as recorded after the trim, not the whole session's median of the high cycles before it.
    expect(first).toMatchObject({ rampPeakV: 7.32, alphaMinDeg: 10.2, alphaMaxDeg: 156.4 });
    expect((first.wholeSession as { rampPeakMedianV: number }).rampPeakMedianV).toBeCloseTo(8.88, 12);
    expect((first.wholeSession as { alphaMeanDeg: number }).alphaMeanDeg).toBeCloseTo(90, 12);
    expect(second).toMatchObject({ unit: 'RW-0207', status: 'interrupted', outcome: 'interrupted', cycles: 0, rampPeakV: null, wholeSession: { alphaMeanDeg: null, rampPeakMedianV: null }, linkErrors: 0 });
    // Every outcome the issue names: signed-off, signed-off-with-exceptions, closed, interrupted, open.
    expect(third).toMatchObject({ unit: 'RW-0311', status: 'closed', outcome: 'signed-off', signOffReason: null, signOffExceptions: [] });
    expect(fourth).toMatchObject({
      unit: 'RW-0312', status: 'closed', outcome: 'signed-off-with-exceptions', signOffReason: 'limits checked on the customer controller instead',
      signOffExceptions: [{ step: 'limits', problem: 'not-recorded', readings: [] }],
    });
    expect(fifth).toMatchObject({ unit: 'RW-0313', status: 'open', outcome: 'open', cycles: 1 });
  });

  it('filters by unit', async () => {
    const { stdout } = await run(['log', '--db', dbPath, '--unit', 'RW-0207', '--json']);
    expect((JSON.parse(stdout) as { sessions: Array<{ unit: string }> }).sessions.map((row) => row.unit)).toEqual(['RW-0207']);
  });

  it('prints a table for people', async () => {
    const { code, stdout } = await run(['log', '--db', dbPath]);
    expect(code).toBe(0);
    const lines = stdout.trimEnd().split('\n');
    expect(lines[0]).toMatch(/^session\s+unit\s+bench\s+outcome\s+started\s+ended\s+cycles/);
    expect(lines[0]).toMatch(/ramp peak V \(recorded\)\s+alpha deg \(recorded range\)/);
    // In the machine's local time with its offset (stored in UTC).
    expect(lines[1]).toMatch(/RW-0142\s+bench A\s+closed without sign-off\s+2026-03-0[12] \d\d:\d\d:00 [+-]\d\d:\d\d .*\s6\s+7\.320\s+10\.2 to 156\.4\s+4\s+-$/);
    expect(lines[2]).toMatch(/RW-0207\s+bench A\s+interrupted/);
    expect(lines[3]).toMatch(/RW-0311\s+\S+\s+signed off\s/);
    expect(lines[4]).toMatch(/RW-0312\s+\S+\s+signed off with exceptions\s/);
  });

  it('shows times stored in UTC in the reader\'s local time, offset written out', async () => {
    const { stdout } = await run(['log', '--db', dbPath, '--json']);
    const { sessions } = JSON.parse(stdout) as { sessions: SessionRow[] };
    // 09:00 UTC on 1 March: 10:00 in Berlin (CET, UTC+1), 04:00 in New York (EST, UTC-5); IANA zone rules, from memory.
    expect(formatLogbookTable(sessions, { timeZone: 'Europe/Berlin' })).toContain('2026-03-01 10:00:00 +01:00');
    expect(formatLogbookTable(sessions, { timeZone: 'America/New_York' })).toContain('2026-03-01 04:00:00 -05:00');
  });

  it('exits 2 naming the file when there is no logbook or it is not one, and leaves the file alone', async () => {
    const missing = await run(['log', '--db', folder.file('nowhere.sqlite')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain(folder.file('nowhere.sqlite'));
    const notes = folder.file('notes.txt');
    writeFileSync(notes, 'not a logbook\n'.repeat(10));
    const wrong = await run(['log', '--db', notes, '--json']);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toMatch(/notes\.txt: is not a Rampwright logbook/);
    expect(readFileSync(notes, 'utf8')).toBe('not a logbook\n'.repeat(10));
  });
});
