import { readFileSync, writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { chargerDesign, cycleReading, tempFolder, type TempFolder } from '../store/storeFixtures';
import { formatLogbookTable } from '../../../main/cli/commands/log';
import type { SessionRow } from '../../../main/store/logbookTypes';
import { runCli as run } from './cliRun';

let folder: TempFolder;
let dbPath = '';

beforeAll(async () => {
  folder = tempFolder('rampwright-log-');
  dbPath = folder.file('logbook.sqlite');
  const logbook = await openSqliteLogbook(dbPath);
  // Unit RW-0142: alpha 89, 91 (mean 90); peaks 7.28, 7.32, 7.36 (median 7.32); one CRC burst of 4.
  const first = await logbook.startSession({ unitSerial: 'RW-0142', design: chargerDesign(), operator: 'bench 1', startedAt: new Date('2026-03-01T09:00:00Z'), bench: 'bench A' });
  first.addCycle(cycleReading(0, { alphaDeg: 89, rampPeakV: 7.28 }));
  first.addCycle(cycleReading(0.02, { alphaDeg: 91, rampPeakV: 7.36 }));
  first.addCycle(cycleReading(0.04, { alphaDeg: null, rampPeakV: 7.32 }));
  first.addLinkEvent('crc-failures', '4 lines failed their CRC', 4);
  await first.close();
  const second = await logbook.startSession({ unitSerial: 'RW-0207', design: chargerDesign(), operator: 'bench 1', startedAt: new Date('2026-03-02T09:00:00Z'), bench: 'bench A' });
  await second.close('interrupted');
  await logbook.close();
});
afterAll(() => folder.remove());

describe('rampwright log', () => {
  it('prints every session as JSON with the fields the issue asks for', async () => {
    const { code, stdout } = await run(['log', '--db', dbPath, '--json']);
    expect(code).toBe(0);
    const listing = JSON.parse(stdout) as { sessions: Array<Record<string, unknown>> };
    expect(listing.sessions).toHaveLength(2);
    const [first, second] = listing.sessions;
    expect(Object.keys(first)).toEqual(expect.arrayContaining(['id', 'unit', 'status', 'startedAt', 'endedAt', 'cycles', 'alphaDeg', 'rampPeakV', 'linkErrors']));
    expect(first).toMatchObject({ unit: 'RW-0142', status: 'closed', startedAt: '2026-03-01T09:00:00.000Z', cycles: 3, linkErrors: 4 });
    expect(first.alphaDeg).toBeCloseTo(90, 12);
    expect(first.rampPeakV).toBeCloseTo(7.32, 12);
    expect(second).toMatchObject({ unit: 'RW-0207', status: 'interrupted', cycles: 0, alphaDeg: null, rampPeakV: null, linkErrors: 0 });
  });

  it('filters by unit', async () => {
    const { stdout } = await run(['log', '--db', dbPath, '--unit', 'RW-0207', '--json']);
    expect((JSON.parse(stdout) as { sessions: Array<{ unit: string }> }).sessions.map((row) => row.unit)).toEqual(['RW-0207']);
  });

  it('prints a table for people', async () => {
    const { code, stdout } = await run(['log', '--db', dbPath]);
    expect(code).toBe(0);
    const lines = stdout.trimEnd().split('\n');
    expect(lines[0]).toMatch(/^session\s+unit\s+bench\s+status\s+started\s+ended\s+cycles/);
    // In the machine's local time with its offset (stored in UTC).
    expect(lines[1]).toMatch(/RW-0142\s+bench A\s+closed\s+2026-03-0[12] \d\d:\d\d:00 [+-]\d\d:\d\d .*\s3\s+90\.0\s+7\.320\s+4\s+-$/);
    expect(lines[2]).toMatch(/RW-0207\s+bench A\s+interrupted/);
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
