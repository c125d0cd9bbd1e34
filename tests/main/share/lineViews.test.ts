/**
 * Views across the line: two benches push into one shared logbook, and `log`, `report --unit` and `report --design`
 * against it show which bench did each session; drift and fleet take every bench's sessions. Times are shown local
 * with their UTC offset. Real PostgreSQL (throwaway cluster), SQLite bench logbooks, the command line in-process.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { benchSummary } from '../../../app/record/benchSummary';
import { openBenchContext } from '../../../main/session/benchContext';
import { pushSessions } from '../../../main/share/pushSessions';
import { openLogbook } from '../../../main/store/openLogbook';
import { startStoreKit, type StoreKit } from '../../helpers/logbookStores';
import { runCli } from '../cli/cliRun';
import { recordSweepSession } from '../record/recordFixture';
import { tempFolder, type TempFolder } from '../store/storeFixtures';

let kit: StoreKit;
let folder: TempFolder;
let shared = '';

beforeAll(async () => {
  kit = await startStoreKit('PostgreSQL');
  folder = tempFolder('rampwright-line-views-');
  shared = await kit.freshLocation();
  // Unit LN-4001 commissioned on bench 1, re-checked on bench 2 a month later; LN-4002 on bench 2 only.
  const plan: Array<[string, string, string, number]> = [
    ['bench 1', 'LN-4001', '2026-10-05T07:30:00Z', 3],
    ['bench 2', 'LN-4001', '2026-11-05T07:30:00Z', 5],
    ['bench 2', 'LN-4002', '2026-11-06T13:15:00Z', 8],
  ];
  for (const bench of ['bench 1', 'bench 2']) {
    const local = await openLogbook(folder.file(`${bench.replace(' ', '-')}.sqlite`));
    for (const [who, unitSerial, at, seed] of plan) if (who === bench) await recordSweepSession(local, { unitSerial, startedAt: new Date(at), seconds: 0.6, seed, bench });
    const report = await pushSessions(local, shared, () => openLogbook(shared));
    expect(report.waiting).toBe(0);
    await local.close();
  }
}, 90_000);

afterAll(async () => {
  await kit?.stop();
  folder?.remove();
});

describe('the shared logbook across benches', () => {
  it('log lists every bench\'s sessions with the bench that did each', async () => {
    const { code, stdout } = await runCli(['log', '--db', shared, '--json']);
    expect(code).toBe(0);
    const { sessions } = JSON.parse(stdout) as { sessions: Array<{ unit: string; bench: string; startedAt: string }> };
    expect(sessions.map((row) => [row.unit, row.bench, row.startedAt])).toEqual([
      ['LN-4001', 'bench 1', '2026-10-05T07:30:00.000Z'],
      ['LN-4001', 'bench 2', '2026-11-05T07:30:00.000Z'],
      ['LN-4002', 'bench 2', '2026-11-06T13:15:00.000Z'],
    ]);
    const table = await runCli(['log', '--db', shared, '--unit', 'LN-4001']);
    // Each session's outcome (these were closed without a sign-off).
    expect(table.stdout.split('\n')[0]).toMatch(/^session\s+unit\s+bench\s+outcome/);
    expect(table.stdout).toMatch(/LN-4001\s+bench 1\s+closed without sign-off/);
    expect(table.stdout).toMatch(/LN-4001\s+bench 2\s+closed without sign-off/);
  });

  it('report --unit draws the drift over both benches\' sessions and names the bench of each', async () => {
    const out = folder.file('drift.html');
    expect((await runCli(['report', '--db', shared, '--unit', 'LN-4001', '--out', out])).code).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(html).toMatch(/2 sessions from 2 benches/);
    expect(html).toMatch(/<td>LN-4001<\/td><td>bench 1<\/td><td>2026-10-0[45] \d\d:\d\d:00 [+-]\d\d:\d\d<\/td>/);
    expect(html).toMatch(/<td>LN-4001<\/td><td>bench 2<\/td>/);
  });

  it('report --design puts every bench\'s units in the fleet, and splits it by bench', async () => {
    const out = folder.file('fleet.html');
    expect((await runCli(['report', '--db', shared, '--design', 'Charger firing board CH-50H (demo)', '--out', out])).code).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(html).toMatch(/Fleet of Charger firing board CH-50H \(demo\): 2 units/);
    // LN-4001 counts by its latest session (bench 2), so bench 2 has both units.
    expect(html).toMatch(/<tr><td>bench 2<\/td><td>2<\/td>/);
    expect(html).not.toMatch(/<tr><td>bench 1<\/td><td>1<\/td>/);
  });
});

describe('the screens on the shared logbook', () => {
  it('show it, and refuse to record into it: a live session goes to a bench\'s own logbook first', async () => {
    const context = await openBenchContext({ logbookPath: shared, virtualPaced: false });
    try {
      const listed = await context.dispatch('listSessions', {});
      expect(listed.ok && (listed.result as { sessions: Array<{ bench: string }> }).sessions.map((row) => row.bench)).toEqual(['bench 1', 'bench 2', 'bench 2']);
      const started = await context.dispatch('startSession', { unitSerial: 'LN-4003', designName: 'Charger firing board CH-50H (demo)', operator: 'reviewer' });
      expect(started.ok).toBe(false);
      expect(!started.ok && started.error.code).toBe('not-available');
      expect(!started.ok && started.error.message).toMatch(/records sessions into its own logbook file and pushes them/);
    } finally {
      await context.close();
    }
  });
});

describe('benchSummary', () => {
  it('counts units and averages figures per bench (by hand)', () => {
    const summary = benchSummary([
      { bench: 'bench 2', rampPeakV: 7.2, alphaGainDegPerV: -20 },
      { bench: 'bench 1', rampPeakV: 7.4, alphaGainDegPerV: null },
      { bench: 'bench 2', rampPeakV: 7.3, alphaGainDegPerV: -21 },
      { bench: null, rampPeakV: null, alphaGainDegPerV: null },
    ]);
    // bench 2: mean peak (7.2 + 7.3) / 2 = 7.25 V, gain (-20 - 21) / 2 = -20.5 deg/V; bench 1: one unit, no gain.
    expect(summary.map((row) => [row.bench, row.units])).toEqual([[null, 1], ['bench 1', 1], ['bench 2', 2]]);
    expect(summary[2].rampPeakMeanV).toBeCloseTo(7.25, 12);
    expect(summary[2].alphaGainMeanDegPerV).toBeCloseTo(-20.5, 12);
    expect(summary[1].alphaGainMeanDegPerV).toBeNull();
    expect(summary[0].rampPeakMeanV).toBeNull();
  });
});
