/**
 * The screens end to end in Debian's Chromium against browser mode with the virtual board (issue 5, section 5):
 * commission a unit from a fresh logbook through every step (a trim fitted and the ramp checked again), recall the
 * session in the Logbook, compare two sessions. Assertions are on what is shown; no console errors are allowed.
 * Screenshots of every screen go to test-output/screens/ (not committed). Needs `npm run build` first.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { roleIdentifiersIn } from '../roleIdentifiers';
import { canvasColourShare, canvasInk, collectPageErrors, launchChromium, repoRoot, screenshot, startDemoServer, type DemoServer } from './browserMode';

const unitSerial = 'RW-E2E-0417'; // our own invented serial number
const operator = 'Bench Two';
const exceptionsReason = 'Returned unit: ramp capacitor to be replaced at the customer site, order RW-4471';

let server: DemoServer;
let browser: Browser;
let page: Page;
let pageErrors: string[];

async function goScreen(name: 'Board' | 'Bench' | 'Transfer' | 'Trim' | 'Logbook'): Promise<void> {
  await page.getByRole('tab', { name }).click();
  await page.locator(`#screen-${name.toLowerCase()}`).waitFor({ state: 'visible' });
}

async function stepVerdict(step: string): Promise<string | null> {
  return page.locator(`[data-step="${step}"] header .verdict`).getAttribute('data-verdict');
}

/** The text a person reads on the screen shown now names parts in words, never by the design file's keys (issue 11). */
async function expectPartsInWords(screen: 'Board' | 'Bench' | 'Transfer' | 'Trim' | 'Logbook'): Promise<void> {
  const text = await page.locator(`#screen-${screen.toLowerCase()}`).innerText();
  expect(text.length).toBeGreaterThan(50);
  expect(roleIdentifiersIn(text), `${screen} screen`).toEqual([]);
}

/** Record the selected step with its button and wait until the step list shows it recorded. */
async function recordStep(step: string): Promise<void> {
  // A step is recorded only once it is measured (the bench refuses it before): wait for its verdict.
  await expect.poll(() => stepVerdict(step), { timeout: 30_000, interval: 250 }).not.toBe('not-measured');
  await page.locator(`[data-testid="check-${step}"]`).click();
  try {
    await page.locator(`[data-step="${step}"][data-status="done"]`).waitFor({ timeout: 20_000 });
  } catch (error) {
    // Say what the bench answered: a refusal is a notice on screen.
    throw new Error(`${step} was not recorded; notices on screen: ${(await page.locator('.notice').allTextContents()).join(' | ')}`, { cause: error });
  }
}

beforeAll(async () => {
  server = await startDemoServer({ speed: 1 });
  browser = await launchChromium();
  page = await browser.newPage({ viewport: { width: 1440, height: 900 }, deviceScaleFactor: 1 });
  pageErrors = collectPageErrors(page);
  await page.goto(server.url);
  await page.locator('[data-testid="setup-design"] option').first().waitFor({ state: 'attached' });
}, 90_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

describe('browser mode with the virtual board', () => {
  it('starts on a fresh logbook with the safety note in view', async () => {
    await expect(page.getByTestId('safety-note').textContent()).resolves.toMatch(/isolated source/);
    expect(await page.getByTestId('safety-note').isVisible()).toBe(true);
    await goScreen('Logbook');
    await page.getByTestId('units-list').getByText('No units yet').waitFor();
    await page.getByTestId('sessions').getByText('No sessions match').waitFor();
    await screenshot(page, '1-logbook-empty');
  });

  it('edits a board design with validation as you type, the predicted ramp and the sizing calculator', async () => {
    await goScreen('Board');
    const name = page.locator('#design-name');
    await expect.poll(() => name.inputValue(), { timeout: 15_000 }).toMatch(/CH-50H/);
    const target = page.locator('#design-rampTargetV');
    const original = await target.inputValue();
    await target.fill('99');
    await expect.poll(() => page.locator('#design-rampTargetV-problem').textContent()).toMatch(/supply/);
    expect(await page.getByTestId('save-design').isDisabled()).toBe(true);
    await target.fill(original);
    await expect.poll(() => page.locator('#design-rampTargetV-problem').textContent()).toBe('');
    expect(await page.getByTestId('save-design').isDisabled()).toBe(false);
    expect(await canvasInk(page, '[data-testid="predicted-canvas"]')).toBeGreaterThan(0.02);
    expect(await canvasColourShare(page, '[data-testid="predicted-canvas"]', '#d9622b')).toBeGreaterThan(0.001);
    await expect(page.getByTestId('prediction').textContent()).resolves.toMatch(/Peak at half-cycle end\s*[\d.]+ V/);
    await page.getByTestId('size-emitter').click();
    // Part values as marked on parts (IEC 60062 code), in the form and in the sizing result.
    await expect(page.locator('#design-parts-rEmitter-ohm').inputValue()).resolves.toBe('6k8');
    await expect(page.locator('#design-parts-cRamp-farad').inputValue()).resolves.toBe('390n');
    await expect(page.getByTestId('sizing-result').textContent()).resolves.toMatch(/Nearest E24\s*\d+k\d*/);
    await expectPartsInWords('Board');
    await screenshot(page, '2-board');
    // Saved unchanged: nothing is saved, and the screen says so.
    await page.getByTestId('save-design').click();
    await expect.poll(() => page.getByTestId('design-status').textContent(), { timeout: 10_000 }).toMatch(/Nothing changed: .* stays version 1/);
    // The sizing result belongs to the design it was worked out for: another design clears it.
    await page.locator('[data-design*="HT-60F"]').click();
    await expect.poll(() => name.inputValue(), { timeout: 10_000 }).toMatch(/HT-60F/);
    await expect.poll(() => page.getByTestId('sizing-result').textContent()).toBe('');
    await page.locator('[data-design*="CH-50H"]').click();
    await expect.poll(() => name.inputValue(), { timeout: 10_000 }).toMatch(/CH-50H/);
  });

  it('commissions a unit through every step, fitting a trim and checking the ramp again', async () => {
    await goScreen('Bench');
    await page.getByTestId('setup-unit').fill(unitSerial);
    await page.getByTestId('setup-operator').fill(operator);
    await page.getByTestId('start-session').click();
    await expect.poll(() => page.getByTestId('unit-serial').textContent(), { timeout: 20_000 }).toBe(unitSerial);

    // The fold fills with cycles; the demo board's capacitor is low, so the ramp is too tall.
    await expect.poll(async () => Number(await page.getByTestId('fold-canvas').getAttribute('data-cycles')), { timeout: 30_000 }).toBeGreaterThanOrEqual(10);
    expect(await canvasInk(page, '[data-testid="fold-canvas"]')).toBeGreaterThan(0.03);
    expect(await canvasColourShare(page, '[data-testid="fold-canvas"]', '#d9622b')).toBeGreaterThan(0.001);
    await expect(page.getByTestId('fold-caption').textContent()).resolves.toMatch(/cycles overlaid, firing at [\d.]+°, ramp peak [\d.]+ V/);
    await expect(page.getByTestId('big-frequencyHz').textContent()).resolves.toMatch(/(49|50)\.\d+ Hz|50 Hz/);
    await expect.poll(() => page.locator('[data-testid="big-rampPeakV"] .verdict').getAttribute('data-verdict'), { timeout: 15_000 }).toBe('out-of-tolerance');
    await expect(page.getByTestId('link-state').textContent()).resolves.toMatch(/Streaming/);
    await expect(page.getByTestId('link-crc').textContent()).resolves.toMatch(/CRC errors\s*\d+/);
    await expectPartsInWords('Bench');
    await screenshot(page, '3-bench-fault');

    // Hold freezes the fold (H on the keyboard), Keep capture stores the last seconds in the session.
    await page.locator('body').press('h');
    await expect.poll(() => page.getByTestId('hold').getAttribute('aria-pressed'), { timeout: 10_000 }).toBe('true');
    await page.getByTestId('hold').click();
    await expect.poll(() => page.getByTestId('hold').getAttribute('aria-pressed'), { timeout: 10_000 }).toBe('false');
    await page.getByTestId('keep-capture').click();
    const kept = page.locator('.notice', { hasText: /Kept [\d.]+ s of samples as capture \d+/ });
    await kept.waitFor({ timeout: 15_000 });
    // While a message shows, the page keeps room for it at its foot; its close button takes it (and the room) away.
    expect(await page.evaluate(() => parseFloat(getComputedStyle(document.body).paddingBottom))).toBeGreaterThan(24);
    await kept.getByRole('button', { name: 'Dismiss this message' }).click();
    await kept.waitFor({ state: 'detached', timeout: 5000 });

    // 1 Sync: recorded, in tolerance.
    await recordStep('sync');
    expect(await stepVerdict('sync')).toBe('in-tolerance');
    // The bench moves on to the next step by itself once one is recorded.
    await page.locator('[data-step="ramp"][aria-current="step"]').waitFor();
    // Step headers are buttons: Tab reaches them and Enter selects the step.
    await page.getByTestId('select-trim').focus();
    await page.keyboard.press('Enter');
    await page.locator('[data-step="trim"][aria-current="step"]').waitFor();
    // 2 Ramp, back with the keyboard (P: previous step): out of tolerance.
    await page.locator('body').press('p');
    await page.locator('[data-step="ramp"][aria-current="step"]').waitFor();
    await recordStep('ramp');
    expect(await stepVerdict('ramp')).toBe('out-of-tolerance');

    // 3 Trim (Alt+4 opens the Trim screen): the first suggestion is fitted.
    await page.locator('body').press('Alt+4');
    await page.locator('#screen-trim').waitFor({ state: 'visible' });
    await page.getByTestId('fitted-0').waitFor({ timeout: 20_000 });
    await expect(page.getByTestId('trim-message').textContent()).resolves.not.toBe('');
    expect(await canvasInk(page, '[data-testid="trim-canvas"]')).toBeGreaterThan(0.02);
    // The technician measured the ramp capacitor: a slipped prefix is named beside the field and nothing is sent;
    // the value as measured (390 nF design, 30 % low on the demo board) reaches the plan.
    const capacitor = page.getByTestId('measured-cRamp');
    await capacitor.fill('330');
    await page.getByTestId('trim-parts-plan').click();
    await expect.poll(() => capacitor.getAttribute('aria-invalid')).toBe('true');
    await expect(page.locator('label.field', { has: capacitor }).locator('.field-problem').textContent()).resolves.toMatch(/more than 10 times off its design value 390n/);
    await capacitor.fill('273n');
    await page.getByTestId('trim-parts-plan').click();
    await expect.poll(() => page.getByTestId('trim-known').textContent(), { timeout: 15_000 }).toMatch(/Planned for the board as built: Ramp capacitor C6 273n measured \(design 390n\)/);
    // Measured 30 % low, far outside its tolerance: the first advice is to replace it with its design value.
    await expect(page.getByTestId('trim-message').textContent()).resolves.toMatch(/replace the ramp capacitor C6 with 390n\./);
    await expect(page.locator('[data-testid="trim-plan"] tbody tr').first().getAttribute('data-kind')).resolves.toBe('repair');
    await expectPartsInWords('Trim');
    expect(await capacitor.getAttribute('aria-invalid')).toBe('false');
    await expect(capacitor.inputValue()).resolves.toBe('273n');
    await screenshot(page, '4-trim-plan');
    await page.getByTestId('fitted-0').click();
    await page.getByTestId('trim-recheck').waitFor({ state: 'visible' });
    await screenshot(page, '5-trim-fitted');
    await page.getByTestId('go-recheck').click();
    await page.locator('[data-step="ramp"][aria-current="step"]').waitFor();
    // The virtual board now carries the fitted part: the ramp comes back into tolerance.
    await expect.poll(() => page.locator('[data-testid="big-rampPeakV"] .verdict').getAttribute('data-verdict'), { timeout: 30_000, interval: 500 }).toBe('in-tolerance');
    await recordStep('ramp');
    expect(await stepVerdict('ramp')).toBe('in-tolerance');
    await page.locator('body').press('3');
    await recordStep('trim');

    // 4 Transfer: sweep the control voltage, watch the points and the fit, record.
    await page.locator('body').press('Alt+3');
    await page.locator('#screen-transfer').waitFor({ state: 'visible' });
    await page.locator('#screen-transfer input').nth(2).fill('6');
    await page.getByTestId('start-sweep').click();
    await expect.poll(async () => Number(await page.getByTestId('transfer-canvas').getAttribute('data-points')), { timeout: 40_000, interval: 1000 }).toBeGreaterThanOrEqual(40);
    await expect.poll(() => page.getByTestId('transfer-stats').textContent(), { timeout: 20_000 }).toMatch(/Gain\s*-?[\d.]+° per volt/);
    expect(await canvasInk(page, '[data-testid="transfer-canvas"]')).toBeGreaterThan(0.02);
    // The step has its verdict once the sweep reached both ends of the design's control range (then so has limits).
    await expect.poll(() => page.getByTestId('transfer-step-status').getAttribute('data-verdict'), { timeout: 40_000, interval: 500 }).not.toBe('not-measured');
    await page.getByTestId('record-transfer').click();
    await page.locator('body').press('Alt+2');
    await page.locator('[data-step="transfer"][data-status="done"]').waitFor({ timeout: 20_000 });
    await goScreen('Transfer');
    await screenshot(page, '6-transfer');

    // 5 Limits and pulses; 6 sign-off closes the session.
    await page.locator('body').press('5');
    await page.locator('#screen-bench').waitFor({ state: 'visible' });
    await recordStep('limits');
    expect(['in-tolerance', 'marginal', 'out-of-tolerance']).toContain(await stepVerdict('limits'));
    await screenshot(page, '7-bench-steps-done');
    await page.locator('body').press('6');
    await expect.poll(() => page.locator('[data-step="sign-off"] .note').last().textContent(), { timeout: 10_000 }).toMatch(/ready to sign off/);
    await page.getByTestId('check-sign-off').click();
    await expect.poll(() => page.getByTestId('session-status').textContent(), { timeout: 20_000 }).toMatch(/No session open/);
    // After sign-off the bench shows the signed record, not live verdicts under the last unit's name.
    await expect.poll(() => page.getByTestId('last-session-outcome').textContent(), { timeout: 10_000 }).toMatch(/Signed off/);
    expect(await page.locator('[data-step="sync"]').isVisible()).toBe(false);
    await expect(page.getByTestId('last-session').textContent()).resolves.toMatch(/Check limits and pulses\s*✓\s*In tolerance/);
    // The next session is the next unit: the serial number is not carried over from the one just signed off.
    expect(await page.getByTestId('setup-unit').inputValue()).toBe('');
    await screenshot(page, '7b-bench-after-sign-off');
  }, 240_000);

  it('recalls the session in the Logbook', async () => {
    await goScreen('Logbook');
    const row = page.locator('[data-session="1"]');
    await row.waitFor({ timeout: 15_000 });
    await expect(row.textContent()).resolves.toContain(unitSerial);
    await expect(row.textContent()).resolves.toMatch(/Signed off/);
    await page.getByTestId('open-session-1').click();
    const readings = page.getByTestId('detail-readings');
    await readings.waitFor();
    const text = await readings.textContent();
    expect(text).toMatch(/Ramp peak/);
    expect(text).toMatch(/In tolerance/);
    expect(Number(await page.getByTestId('detail-transfer-canvas').getAttribute('data-points'))).toBeGreaterThan(20);
    expect(await canvasInk(page, '[data-testid="detail-transfer-canvas"]')).toBeGreaterThan(0.02);
    await expect(page.getByTestId('session-detail').textContent()).resolves.toMatch(/Changes made to the board.*→/s);
    // The ramp capacitor measured on the Trim screen is in the logbook beside its design value.
    await expect.poll(() => page.getByTestId('detail-measured').textContent(), { timeout: 10_000 }).toMatch(/Ramp capacitor C6: 273n measured, design 390n/);
    await expect.poll(() => page.getByTestId('detail-trims').textContent(), { timeout: 10_000 }).toMatch(/Ramp capacitor C6: 273n → 390n/);
    await expectPartsInWords('Logbook');
    await screenshot(page, '8-logbook-session');
  });

  it('refuses to sign off the unit when it comes back faulty, then signs it off with exceptions and a written reason', async () => {
    // The unit returns with its ramp capacitor low (our scenario): a fresh virtual board with that fault.
    await goScreen('Bench');
    await page.getByTestId('setup-unit').fill(unitSerial);
    await page.getByTestId('setup-operator').fill(operator);
    await page.getByTestId('setup-source').selectOption('virtual');
    await page.getByTestId('setup-fault').selectOption('capacitor-low');
    await page.getByTestId('start-session').click();
    await expect.poll(() => page.getByTestId('unit-serial').textContent(), { timeout: 20_000 }).toBe(unitSerial);
    await page.locator('[data-step="sync"][data-status="measuring"]').waitFor({ timeout: 30_000 });
    await recordStep('sync');
    await page.locator('body').press('2');
    await expect.poll(() => page.locator('[data-testid="big-rampPeakV"] .verdict').getAttribute('data-verdict'), { timeout: 15_000 }).toBe('out-of-tolerance');
    await recordStep('ramp');
    expect(await stepVerdict('ramp')).toBe('out-of-tolerance');

    // Closing without sign-off asks first; kept open here.
    await page.getByTestId('stop-session').click();
    await page.getByTestId('confirm-close').waitFor();
    await screenshot(page, '8b-confirm-close');
    await page.getByTestId('confirm-close-cancel').click();
    expect(await page.getByTestId('session-status').textContent()).toMatch(/session 2 open/);

    // Sign off anyway: the bench refuses, listing the failing step and those not recorded, and signs nothing.
    await page.locator('body').press('6');
    await page.getByTestId('check-sign-off').click();
    const refusal = page.getByTestId('sign-off-refused');
    await refusal.waitFor({ timeout: 15_000 });
    const listed = await page.getByTestId('sign-off-exceptions').textContent();
    expect(listed).toContain('Check ramp: out of tolerance (Ramp peak)');
    expect(listed).toContain('Check limits and pulses: not recorded');
    await screenshot(page, '8c-sign-off-refused');
    // Too short a reason is named beside the field and nothing is sent.
    await page.getByTestId('exceptions-reason').fill('ok');
    await page.getByTestId('sign-off-with-exceptions').click();
    await expect.poll(() => refusal.locator('.field-problem').textContent()).toMatch(/at least 3 words and 20 characters/);
    expect(await page.getByTestId('session-status').textContent()).toMatch(/session 2 open/);
    await page.getByTestId('exceptions-reason').fill(exceptionsReason);
    await page.getByTestId('sign-off-with-exceptions').click();
    await expect.poll(() => page.getByTestId('session-status').textContent(), { timeout: 20_000 }).toMatch(/No session open/);
    await expect.poll(() => page.getByTestId('last-session-outcome').textContent(), { timeout: 10_000 }).toMatch(/Signed off with exceptions/);
    await expect(page.getByTestId('last-session').textContent()).resolves.toContain(exceptionsReason);
    await screenshot(page, '8d-bench-after-exceptions');

    // The logbook screen: the outcome in the table, the reason and the excepted steps in the session.
    await goScreen('Logbook');
    const row = page.locator('[data-session="2"]');
    await row.waitFor({ timeout: 15_000 });
    await expect(row.textContent()).resolves.toMatch(/Signed off with exceptions/);
    await page.getByTestId('open-session-2').click();
    await expect.poll(() => page.getByTestId('detail-sign-off-reason').textContent(), { timeout: 15_000 }).toBe(exceptionsReason);
    await expect(page.getByTestId('detail-sign-off-exceptions').textContent()).resolves.toContain('Check ramp: out of tolerance (Ramp peak)');
    await screenshot(page, '8e-logbook-exceptions');

    // The record as the screen exports it: the PDF's own text says so, with the reason.
    const download = page.waitForEvent('download');
    await page.getByRole('button', { name: 'Export Commissioning record (PDF)' }).click();
    const pdfPath = join(server.folder, 'record-session-2.pdf');
    await (await download).saveAs(pdfPath);
    const pdfText = execFileSync('pdftotext', [pdfPath, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(pdfText).toContain('SIGNED OFF WITH EXCEPTIONS');
    expect(pdfText).toContain(exceptionsReason);
    expect(pdfText).toContain('Check ramp: out of tolerance (Ramp peak)');

    // And `rampwright log --json`: an outcome per session.
    const listing = JSON.parse(execFileSync(process.execPath, [join(repoRoot, 'dist', 'rampwright.js'), 'log', '--db', server.logbookPath, '--json'], { encoding: 'utf8' })) as { sessions: Array<{ id: number; outcome: string; signOffReason: string | null }> };
    expect(listing.sessions.map((session) => [session.id, session.outcome])).toEqual([[1, 'signed-off'], [2, 'signed-off-with-exceptions']]);
    expect(listing.sessions[1].signOffReason).toBe(exceptionsReason);
  }, 120_000);

  it('compares two sessions of the unit side by side, with its drift', async () => {
    await goScreen('Logbook');
    await page.locator('[data-session="2"]').waitFor({ timeout: 15_000 });
    await page.getByTestId('tick-1').check();
    await page.getByTestId('tick-2').check();
    await page.getByTestId('compare').click();
    const table = page.getByTestId('comparison-table');
    await table.waitFor();
    expect(await table.locator('tbody tr').count()).toBeGreaterThan(0);
    await expect(page.getByTestId('comparison').textContent()).resolves.toMatch(/Session 1 and session 2 side by side/);
    await page.locator(`[data-unit="${unitSerial}"]`).click();
    await page.getByTestId('drift').waitFor({ state: 'visible' });
    expect(Number(await page.getByTestId('drift-canvas').getAttribute('data-points'))).toBe(2);
    // Two sessions of a freshly trimmed unit: no trend can be judged yet, and the screen says so in words.
    await expect(page.getByTestId('drift-forecast').textContent()).resolves.toMatch(/at least three sessions|No trend heads|Trend warning/);
    await screenshot(page, '9-logbook-compare');
    // The unit's board design as a fleet: one unit so far (its latest session), placed against the board model.
    await page.getByTestId('fleet').waitFor({ state: 'visible', timeout: 20_000 });
    expect(Number(await page.getByTestId('fleet-canvas-rampPeakV').getAttribute('data-units'))).toBe(1);
    await expect(page.getByTestId('fleet-text-rampPeakV').textContent()).resolves.toMatch(new RegExp(`^Unit ${unitSerial}: [\\d.]+ V, above 0 % of the fleet`));
    expect(await canvasInk(page, '[data-testid="fleet-canvas-rampPeakV"]')).toBeGreaterThan(0.01);
    await page.getByTestId('fleet').scrollIntoViewIfNeeded();
    await screenshot(page, '9b-logbook-fleet');
  }, 120_000);

  it('switches to the dark theme and stayed free of console errors', async () => {
    await goScreen('Bench');
    await page.locator('body').press('t');
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    await page.waitForTimeout(800);
    await screenshot(page, '10-bench-dark');
    await goScreen('Board');
    await screenshot(page, '11-board-dark');
    expect(pageErrors).toEqual([]);
  });

  it('refuses a page opened without the token, and a page with no origin that knows it', async () => {
    // What a technician sees at the bare address (no token): the refusal, in words, and no screens.
    const bare = await browser.newPage();
    const reply = await bare.goto(`${server.origin}/`);
    expect(reply?.status()).toBe(401);
    await expect(bare.locator('body').textContent()).resolves.toMatch(/access token/);
    // A local file page or sandboxed frame sends Origin: null; even with the token the event socket is refused.
    // The same frame without the sandbox (the server's own origin) opens it: the refusal is the Origin's.
    const socketFromFrame = (sandboxed: boolean) =>
      bare.evaluate(
        async ({ address, sandboxed: inSandbox }) => {
          return new Promise<string>((resolve) => {
            const frame = document.createElement('iframe');
            if (inSandbox) frame.setAttribute('sandbox', 'allow-scripts');
            frame.srcdoc = `<script>const s = new WebSocket(${JSON.stringify(address)}); s.onopen = () => { parent.postMessage('open', '*'); s.close(); }; s.onerror = () => parent.postMessage('refused', '*');</script>`;
            window.addEventListener('message', (event) => resolve(String(event.data)), { once: true });
            document.body.append(frame);
            setTimeout(() => resolve('timeout'), 10_000);
          });
        },
        { address: `${server.origin.replace('http', 'ws')}/api/events?token=${server.token}`, sandboxed },
      );
    expect(await socketFromFrame(true)).toBe('refused');
    expect(await socketFromFrame(false)).toBe('open');
    await bare.close();
  });
});
