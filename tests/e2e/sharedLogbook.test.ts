/**
 * The Logbook screen with a shared logbook, end to end in Debian's Chromium: a bench serving its own logbook and
 * pushing to a real PostgreSQL logbook (throwaway cluster) shows the bench of each session and which sessions are
 * shared; when the server goes away, a new session shows "Not yet shared" and the screen says why, and once the
 * server is back the screen shows it shared without being reopened; the shared logbook served to a reviewer shows every bench's sessions of a unit and
 * its drift by bench. Screenshots go to test-output/screens/. Needs `npm run build` first.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pushSessions } from '../../main/share/pushSessions';
import { openLogbook } from '../../main/store/openLogbook';
import { startThrowawayCluster, type ThrowawayCluster } from '../../scripts/postgres/throwawayCluster';
import { recordSweepSession } from '../main/record/recordFixture';
import { tempFolder, type TempFolder } from '../main/store/storeFixtures';
import { collectPageErrors, launchChromium, screenshot, startDemoServer, type DemoServer } from './browserMode';

let cluster: ThrowawayCluster;
let folder: TempFolder;
let browser: Browser;
let page: Page;
let pageErrors: string[];
const servers: DemoServer[] = [];
const shared = () => cluster.url('line_logbook');

async function openLogbookScreen(url: string): Promise<void> {
  await page.goto(url);
  await page.getByRole('tab', { name: 'Logbook' }).click();
  await page.locator('#screen-logbook').waitFor({ state: 'visible' });
}

async function reloadSessions(): Promise<void> {
  await page.getByRole('tab', { name: 'Bench' }).click();
  await page.getByRole('tab', { name: 'Logbook' }).click();
  await page.locator('[data-testid="sessions"] table').waitFor();
}

beforeAll(async () => {
  folder = tempFolder('rampwright-e2e-line-');
  cluster = await startThrowawayCluster();
  cluster.createDatabase('line_logbook');
  // Bench 3 commissioned units LN-5001 and LN-4998 in October; bench 2 (this bench) checks LN-5001 again in November
  // and does LN-5002.
  const other = await openLogbook(folder.file('bench-3.sqlite'));
  await recordSweepSession(other, { unitSerial: 'LN-5001', startedAt: new Date('2026-10-12T06:45:00Z'), seconds: 0.6, seed: 4, bench: 'bench 3' });
  await recordSweepSession(other, { unitSerial: 'LN-4998', startedAt: new Date('2026-10-12T07:30:00Z'), seconds: 0.6, seed: 8, bench: 'bench 3' });
  await pushSessions(other, shared(), () => openLogbook(shared()));
  await other.close();
  const mine = await openLogbook(folder.file('bench-2.sqlite'));
  await recordSweepSession(mine, { unitSerial: 'LN-5001', startedAt: new Date('2026-11-16T08:10:00Z'), seconds: 0.6, seed: 5, bench: 'bench 2' });
  await recordSweepSession(mine, { unitSerial: 'LN-5002', startedAt: new Date('2026-11-16T09:40:00Z'), seconds: 0.6, seed: 6, bench: 'bench 2' });
  await mine.close();
  browser = await launchChromium();
  page = await browser.newPage({ viewport: { width: 1440, height: 900 }, deviceScaleFactor: 1 });
  pageErrors = collectPageErrors(page);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  for (const server of servers) await server.stop();
  await cluster?.stop();
  folder?.remove();
});

describe('a bench pushing to the shared logbook', () => {
  it('shows each session\'s bench, and which are shared', async () => {
    const bench = await startDemoServer({ demo: false, db: folder.file('bench-2.sqlite'), args: ['--push-to', shared(), '--push-every', '0.5', '--bench', 'bench 2'] });
    servers.push(bench);
    expect(bench.output()).toMatch(/Pushing finished sessions to the shared logbook postgres:\/\/rampwright_admin@127\.0\.0\.1:\d+\/line_logbook/);
    expect(bench.output()).not.toContain(cluster.superuserPassword);
    await openLogbookScreen(bench.url);
    await page.locator('[data-testid="sharing"]', { hasText: 'every finished session is shared' }).waitFor({ timeout: 20_000 });
    await reloadSessions();
    const rows = page.locator('[data-testid="sessions"] tbody tr');
    expect(await rows.count()).toBe(2);
    expect(await page.locator('[data-testid^="bench-"]').allTextContents()).toEqual(['bench 2', 'bench 2']);
    expect(await page.locator('[data-testid^="shared-"]').allTextContents()).toEqual(['✓ Shared', '✓ Shared']);
    await expect.poll(() => page.locator('[data-testid="time-note"]').textContent()).toMatch(/Times are local \(UTC[+−]\d\d:\d\d\); the logbook keeps them in UTC/);
    await screenshot(page, 'shared-1-bench-pushed');
  }, 90_000);

  it('keeps a session recorded while the server is away, marked not yet shared, and shares it when it is back', async () => {
    await cluster.pause();
    const mine = await openLogbook(folder.file('bench-2.sqlite'));
    await recordSweepSession(mine, { unitSerial: 'LN-5003', startedAt: new Date('2026-11-16T11:05:00Z'), seconds: 0.6, seed: 7, bench: 'bench 2' });
    await mine.close();
    await expect.poll(async () => {
      await reloadSessions();
      return page.locator('[data-testid="sharing"]').textContent();
    }, { timeout: 20_000 }).toMatch(/1 finished session not yet shared.*Not reached: the shared logbook does not answer \(connect ECONNREFUSED/);
    expect(await page.locator('[data-testid^="shared-"]').allTextContents()).toEqual(['✓ Shared', '✓ Shared', '○ Not yet shared']);
    await page.locator('[data-testid^="open-session-"]').last().click();
    await page.locator('[data-testid="detail-shared"]', { hasText: 'Not yet shared' }).waitFor();
    await screenshot(page, 'shared-2-server-away');
    await cluster.resume();
    // The screen follows the bench's pushes by itself: no reopening.
    await expect.poll(() => page.locator('[data-testid^="shared-"]').allTextContents(), { timeout: 30_000 }).toEqual(['✓ Shared', '✓ Shared', '✓ Shared']);
    expect(await page.locator('[data-testid="sharing"]').textContent()).toContain('every finished session is shared');
  }, 90_000);
});

describe('the shared logbook served to a reviewer', () => {
  it('shows every bench\'s sessions of a unit, and its drift by bench', async () => {
    const line = await startDemoServer({ demo: false, db: shared() });
    servers.push(line);
    expect(line.output()).not.toContain(cluster.superuserPassword);
    await openLogbookScreen(line.url);
    await page.locator('[data-testid="units-list"] [data-unit="LN-5001"]').click();
    await page.locator('[data-testid="drift"]').waitFor({ state: 'visible' });
    expect(await page.locator('[data-testid^="bench-"]').allTextContents()).toEqual(['bench 3', 'bench 2']);
    // The shared logbook pushes nowhere: no Shared column, no sharing line.
    expect(await page.locator('[data-testid^="shared-"]').count()).toBe(0);
    expect(await page.locator('[data-testid="sharing"]').isHidden()).toBe(true);
    const driftBenches = await page.locator('[data-testid="drift"] tbody tr td:nth-child(2)').allTextContents();
    expect(driftBenches).toEqual(['bench 3', 'bench 2']);
    // The fleet counts each unit once under the bench of its latest session: LN-5001, LN-5002, LN-5003 on bench 2.
    await page.locator('[data-testid="fleet-benches"]').waitFor({ state: 'visible' });
    const byBench = await page.locator('[data-testid="fleet-benches"] tbody tr').evaluateAll((rows) => rows.map((row) => Array.from(row.querySelectorAll('td'), (cell) => cell.textContent).slice(0, 2)));
    expect(byBench).toEqual([['bench 2', '3'], ['bench 3', '1']]);
    await screenshot(page, 'shared-3-line-unit');
    expect(pageErrors).toEqual([]);
  }, 90_000);
});
