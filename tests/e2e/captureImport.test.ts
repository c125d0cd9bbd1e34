/**
 * A capture file opened on the Bench screen in Debian's Chromium (browser mode): chosen with the file picker, its
 * columns shown with a first look at each, the roles given, read through the steps with the progress on the screen,
 * the roles remembered for the design; then a second file dropped on the screen opens with the remembered roles.
 * The capture is the virtual board's demo design (ramp capacitor 30 % low) written as an instrument would.
 * Screenshots go to test-output/screens/. Needs `npm run build` first.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseBoardDesign } from '../../app/board/parseBoardDesign';
import { synthesiseCapture } from '../../app/sim/virtualBoard';
import { openScreens, repoRoot, screenshot, type DemoServer } from './browserMode';

let server: DemoServer;
let browser: Browser;
let page: Page;
let pageErrors: string[];
let folder = '';
let capturePath = '';

function instrumentCsv(durationS: number, seed: number): string {
  const design = parseBoardDesign(JSON.parse(readFileSync(join(repoRoot, 'fixtures', 'boards', 'charger-ch50h.board.json'), 'utf8')));
  const lines = ['Recorder;bench unit 3 (our scenario)', 'Sample interval;0,00004;s', 'Time [ms];CH1 (V);CH2 (V);CH3 (V);CH4 (V)'];
  for (const block of synthesiseCapture(design, { faults: ['capacitor-low'], seed, durationS })) {
    for (let index = 0; index < block.sync.length; index++) {
      const timeMs = ((block.startS + index / block.sampleRateHz) * 1000).toFixed(3);
      lines.push([timeMs, block.sync[index], block.ramp[index], block.gate[index], block.control?.[index] ?? 0].join(';').replace(/\./g, ','));
    }
  }
  return `${lines.join('\r\n')}\r\n`;
}

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-e2e-capture-'));
  capturePath = join(folder, 'bench3-unit42.csv');
  writeFileSync(capturePath, instrumentCsv(4, 21));
  ({ server, browser, page, pageErrors } = await openScreens({ viewport: { width: 1440, height: 1000 } }));
}, 90_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  rmSync(folder, { recursive: true, force: true });
});

describe('a capture file on the Bench screen', () => {
  it('shows the columns with a first look, takes the roles, and reads the capture through the steps', async () => {
    await page.getByTestId('setup-unit').fill('CH50H-0207');
    await page.getByTestId('setup-operator').fill('Bench Three');
    await page.getByTestId('setup-source').selectOption('capture');
    await page.getByTestId('capture-file').setInputFiles(capturePath);
    await page.locator('table.capture-channels tbody tr').nth(4).waitFor({ timeout: 30_000 });
    const labels = await page.locator('table.capture-channels tbody tr td:first-child').allTextContents();
    expect(labels).toEqual(['Time [ms]', 'CH1 (V)', 'CH2 (V)', 'CH3 (V)', 'CH4 (V)']);
    // Before the roles are given the reading is refused, in the screen's words, the roles marked.
    await expect(page.getByTestId('capture-problem').textContent()).resolves.toMatch(/no channel for sync, ramp, gate/);
    expect(await page.getByTestId('capture-problem').textContent()).not.toContain('--map');
    expect(await page.getByTestId('capture-role-sync').getAttribute('aria-invalid')).toBe('true');
    // The readings under the setup are the link's (the virtual board here), and the screen says so: not the file's.
    await expect(page.getByTestId('no-session-line').textContent()).resolves.toMatch(/readings below come from the virtual board .*read only once the session starts/);
    await screenshot(page, 'capture-1-columns');

    await page.getByTestId('capture-role-sync').selectOption({ label: 'CH1 (V)' });
    await page.getByTestId('capture-role-ramp').selectOption({ label: 'CH2 (V)' });
    await page.getByTestId('capture-role-gate').selectOption({ label: 'CH3 (V)' });
    await page.getByTestId('capture-role-control').selectOption({ label: 'CH4 (V)' });
    await page.getByTestId('capture-check').click();
    await expect.poll(() => page.getByTestId('capture-read-as').textContent(), { timeout: 15_000 }).toMatch(/separator semicolon, decimal comma, time in ms from the header/);
    await expect(page.getByTestId('capture-problem').textContent()).resolves.toBe('');
    await page.getByTestId('capture-remember').check();
    await screenshot(page, 'capture-2-roles');

    await page.getByTestId('start-session').click();
    await expect.poll(() => page.getByTestId('unit-serial').textContent(), { timeout: 20_000 }).toBe('CH50H-0207');
    // Played as recorded: the progress shows while it reads.
    await expect.poll(() => page.getByTestId('capture-progress-text').textContent(), { timeout: 15_000 }).toMatch(/% of bench3-unit42\.csv|read to the end/);
    await expect.poll(async () => Number(await page.getByTestId('fold-canvas').getAttribute('data-cycles')), { timeout: 30_000 }).toBeGreaterThanOrEqual(5);
    await screenshot(page, 'capture-3-reading');
    await expect.poll(() => page.getByTestId('capture-progress-text').textContent(), { timeout: 30_000 }).toMatch(/bench3-unit42\.csv read to the end/);
    await expect.poll(() => page.getByTestId('link-state').textContent(), { timeout: 10_000 }).toMatch(/Capture read to the end/);
    await expect(page.getByTestId('link-source').textContent()).resolves.toMatch(/Capture file bench3-unit42\.csv/);
    await expect(page.getByTestId('big-frequencyHz').textContent()).resolves.toMatch(/(49|50)\.\d+ Hz|50 Hz/);
    // The demo board's capacitor is low: the ramp is too tall, as on the live link.
    await expect.poll(() => page.locator('[data-testid="big-rampPeakV"] .verdict').getAttribute('data-verdict'), { timeout: 15_000 }).toBe('out-of-tolerance');
    await page.locator('[data-testid="check-sync"]').click();
    await page.locator('[data-step="sync"][data-status="done"]').waitFor({ timeout: 20_000 });
    await screenshot(page, 'capture-4-read');
    // Closing without sign-off asks first (the session's record then says it was not signed off).
    await page.getByTestId('stop-session').click();
    await page.getByTestId('confirm-close-confirm').click();
    await page.getByTestId('setup-source').waitFor({ state: 'visible', timeout: 20_000 });
  });

  it('opens a dropped file with the roles remembered for the design', async () => {
    const text = instrumentCsv(2, 22);
    await page.getByTestId('setup-source').selectOption('capture');
    const transfer = await page.evaluateHandle((content) => {
      const data = new DataTransfer();
      data.items.add(new File([content], 'bench3-unit43.csv', { type: 'text/csv' }));
      return data;
    }, text);
    await page.getByTestId('capture-drop').dispatchEvent('drop', { dataTransfer: transfer });
    await expect.poll(() => page.getByTestId('capture-status').textContent(), { timeout: 30_000 }).toMatch(/bench3-unit43\.csv: ready to open \(roles remembered for this design\)/);
    await expect(page.getByTestId('capture-role-ramp').inputValue()).resolves.toBe('3');
    // The readings still shown are the first file's, named as such, until the new file is opened.
    await expect(page.getByTestId('no-session-line').textContent()).resolves.toMatch(/readings below come from the capture file bench3-unit42\.csv/);
    await screenshot(page, 'capture-5-remembered');
    expect(pageErrors).toEqual([]);
  });

  it('stops reading a file part-way with Stop reading, and keeps what was read', async () => {
    const text = instrumentCsv(12, 23);
    const transfer = await page.evaluateHandle((content) => {
      const data = new DataTransfer();
      data.items.add(new File([content], 'bench3-unit44.csv', { type: 'text/csv' }));
      return data;
    }, text);
    await page.getByTestId('capture-drop').dispatchEvent('drop', { dataTransfer: transfer });
    await expect.poll(() => page.getByTestId('capture-status').textContent(), { timeout: 30_000 }).toMatch(/bench3-unit44\.csv: ready to open/);
    await page.getByTestId('setup-unit').fill('CH50H-0209');
    await page.getByTestId('start-session').click();
    // Played as recorded (12 s): stopped while it reads, the bar says where it stopped.
    const share = async (): Promise<number> => Number(/^(\d+) % of bench3-unit44\.csv/.exec((await page.getByTestId('capture-progress-text').textContent()) ?? '')?.[1] ?? -1);
    await expect.poll(share, { timeout: 30_000 }).toBeGreaterThanOrEqual(20);
    await page.getByTestId('capture-cancel').click();
    await expect.poll(() => page.getByTestId('capture-progress-text').textContent(), { timeout: 20_000 }).toMatch(/bench3-unit44\.csv: stopped at \d+ %/);
    await expect(page.getByTestId('capture-progress-text').isVisible()).resolves.toBe(true);
    const stoppedAt = Number(/stopped at (\d+) %/.exec((await page.getByTestId('capture-progress-text').textContent()) ?? '')?.[1]);
    expect(stoppedAt).toBeLessThan(100);
    // What was read before the stop stays measured on the screen.
    await expect(page.getByTestId('big-frequencyHz').textContent()).resolves.toMatch(/(49|50)\.\d+ Hz|50 Hz/);
    await screenshot(page, 'capture-6-stopped');
    await page.getByTestId('stop-session').click();
    await page.getByTestId('confirm-close-confirm').click();
    await page.getByTestId('setup-source').waitFor({ state: 'visible', timeout: 20_000 });
    expect(pageErrors).toEqual([]);
  });
});
