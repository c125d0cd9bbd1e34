/**
 * The commissioning record end to end: a recorded session rendered to HTML and PDF, the PDF rasterised with
 * pdftoppm and read back with pdftotext (Debian poppler-utils), the capture digest checked against the logbook.
 */
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildRecord, recomputeCaptureDigest } from '../../../main/record/buildRecord';
import { openRecordSources, type OpenedRecordSources } from '../../../main/record/openRecordSources';
import { verifyRecordFile, writeRecordFile } from '../../../main/record/writeReport';
import { chargerDesign, cycleReading, tempFolder, type TempFolder } from '../store/storeFixtures';
import { recordSweepSession, type RecordedSession } from './recordFixture';

let folder: TempFolder;
let sources: OpenedRecordSources;
let session: RecordedSession;
const now = new Date('2026-11-20T10:00:00Z');

beforeAll(async () => {
  folder = tempFolder('rampwright-report-');
  sources = await openRecordSources(folder.file('logbook.sqlite'), { create: true });
  session = await recordSweepSession(sources.logbook);
}, 60_000);

afterAll(async () => {
  await sources.close();
  folder.remove();
});

describe('commissioning record', () => {
  it('holds the identity, judged readings, fold, transfer fit, trims and link health', async () => {
    const record = await buildRecord(sources, session.sessionId, { now });
    expect(record.unit.serial).toBe('RW-7731');
    expect(record.design.name).toBe(session.design.name);
    expect(record.design.contentHash).toMatch(/^[0-9a-f]{64}$/);
    expect(record.checks.map((check) => check.key)).toContain('rampPeakV');
    expect(record.checks.every((check) => ['in-tolerance', 'marginal', 'out-of-tolerance', 'not-measured'].includes(check.verdict))).toBe(true);
    // Closed without a sign-off: the record says so first, and that it certifies nothing.
    expect(record.session.outcome).toBe('closed');
    expect(record.fold.length).toBeGreaterThanOrEqual(3);
    // Each folded cycle starts on its rising crossing, so 0 deg is a zero crossing (within a bucket: 1 deg of 360).
    expect(Math.min(...record.fold[0].zeroCrossingsDeg)).toBeLessThan(1);
    expect(record.fold[0].firingDeg.length).toBe(1);
    // The sweep (2 to 6 V) moves alpha with the control: a positive gain.
    expect(record.transfer.fit?.gainDegPerV).toBeGreaterThan(0);
    expect(record.trims[0].reason).toContain('E24');
    expect(record.link.errors).toBe(3);
  });

  it('digest is the sha-256 of the stated text over each capture\'s raw-sample hash, and recomputes from the samples', async () => {
    const record = await buildRecord(sources, session.sessionId, { now });
    // Recompute by hand from the block itself: float64 little-endian, channel after channel (sync, ramp, gate, control).
    const block = session.capture;
    const raw = Buffer.alloc(4 * block.sync.length * 8);
    [block.sync, block.ramp, block.gate, block.control as Float64Array].forEach((values, channel) => values.forEach((value, index) => raw.writeDoubleLE(value, (channel * block.sync.length + index) * 8)));
    const captureHash = createHash('sha256').update(raw).digest('hex');
    const digest = createHash('sha256').update(`rampwright-captures-v1\n${captureHash}\n`).digest('hex');
    expect(record.captures[0].sha256).toBe(captureHash);
    expect(record.capturesSha256).toBe(digest);
    expect(await recomputeCaptureDigest(sources.logbook, session.sessionId)).toBe(digest);
  });

  it('HTML is self-contained: no scripts, no external references, inline SVG, verdicts in words with a symbol', async () => {
    const path = folder.file('record.html');
    await writeRecordFile(sources, session.sessionId, path, { now });
    const html = readFileSync(path, 'utf8');
    expect(html).not.toMatch(/<script|<link |src=|@import|url\(/i);
    expect(html.match(/<svg /g)?.length).toBe(2);
    expect(html).toContain('Ramp peak');
    expect(html).toMatch(/class="verdict (in-tolerance|marginal|out-of-tolerance)"><span aria-hidden="true">[\u2713\u26a0\u2717]<\/span> (in tolerance|marginal|out of tolerance)/);
    expect(html).toContain('does not certify');
    // The measured parts beside their design values, in the units printed on parts: (6650 - 6800)/6800 = -2.2 %,
    // (442 - 470)/470 = -6.0 % (hand values).
    // Parts in words with their designators, values as marked on parts (IEC 60062 code).
    expect(html).toMatch(/<td>Emitter resistor R14<\/td><td class="number">6k65<\/td><td class="number">6k8<\/td><td class="number">-2\.2 %<\/td>/);
    expect(html).toMatch(/<td>Ramp capacitor C6<\/td><td class="number">442n<\/td><td class="number">470n<\/td><td class="number">-6\.0 %<\/td>/);
    // A trim recorded under a designator (older sessions) keeps it, with its values in the same code.
    expect(html).toMatch(/<td>R14<\/td><td class="number">6k8<\/td><td class="number">7k5<\/td>/);
    expect((await verifyRecordFile(sources, path)).matches).toBe(true);
  });

  it('PDF renders to PNG pages with pdftoppm, and pdftotext finds the readings, the digest and the unit', async () => {
    const path = folder.file('record.pdf');
    await writeRecordFile(sources, session.sessionId, path, { now });
    const info = execFileSync('pdfinfo', [path], { encoding: 'utf8' });
    const pages = Number(/Pages:\s+(\d+)/.exec(info)?.[1]);
    // Identity, readings, two plots, trims, link health and captures on A4: two or three pages.
    expect(pages).toBeGreaterThanOrEqual(2);
    expect(pages).toBeLessThanOrEqual(3);
    execFileSync('pdftoppm', ['-png', '-r', '60', path, folder.file('page')]);
    const pngs = readdirSync(folder.path).filter((name) => name.startsWith('page') && name.endsWith('.png'));
    expect(pngs.length).toBe(pages);
    for (const png of pngs) expect(readFileSync(folder.file(png)).subarray(1, 4).toString('latin1')).toBe('PNG');
    if (process.env.RAMPWRIGHT_KEEP_RECORD_PNG) for (const png of pngs) writeFileSync(`${process.env.RAMPWRIGHT_KEEP_RECORD_PNG}/${png}`, readFileSync(folder.file(png)));
    const text = execFileSync('pdftotext', ['-layout', path, '-'], { encoding: 'utf8' });
    const record = await buildRecord(sources, session.sessionId, { now });
    expect(text).toContain('RW-7731');
    // The readings as recorded at each step (the fixture records every step), every row's label in the text.
    expect(record.readings.source).toBe('recorded');
    expect(text).toContain('Readings as recorded at each step');
    for (const row of record.readings.rows) expect(text.replace(/\s+/g, ' ')).toContain(row.label.split(' ')[0]);
    for (const label of ['Mains frequency', 'Ramp peak', 'Largest alpha', 'Gate pulse width']) expect(text).toContain(label);
    // A value the design sets no tolerance for is shown for information, not as unmeasured.
    expect(text).toMatch(/Ramp slope\s+[\d.]+ V\/ms.*for information/);
    expect(text).toMatch(/in tolerance|marginal|out of tolerance/);
    expect(text).toContain(record.capturesSha256 as string);
    expect(text).toContain('Parts measured on the board');
    expect(text).toMatch(/Emitter resistor R14\s+6k65\s+6k8\s+-2\.2 %/);
    expect((await verifyRecordFile(sources, path)).matches).toBe(true);
  });

  it('a session from before steps were kept shows its readings judged against the design instead', async () => {
    const older = await recordSweepSession(sources.logbook, { unitSerial: 'RW-7732', steps: false, seconds: 0.6 });
    const record = await buildRecord(sources, older.sessionId, { now });
    expect(record.readings.source).toBe('judged');
    expect(record.readings.rows.map((row) => row.label)).toEqual(record.checks.map((check) => check.label));
    const path = folder.file('older.html');
    await writeRecordFile(sources, older.sessionId, path, { now });
    const html = readFileSync(path, 'utf8');
    expect(html).toContain('<h2>Readings against the design</h2>');
    expect(html).not.toContain('Readings as recorded at each step');
  });

  it('a record whose digest was altered does not verify', async () => {
    const path = folder.file('tampered.html');
    await writeRecordFile(sources, session.sessionId, path, { now });
    const html = readFileSync(path, 'utf8').replace(/content="([0-9a-f])/, (_, first: string) => `content="${first === '0' ? '1' : '0'}`);
    writeFileSync(path, html);
    const result = await verifyRecordFile(sources, path);
    expect(result.matches).toBe(false);
    expect(result.recomputed).not.toBe(result.stated);
  });

  it('a bare session (no readings, capture, transfer or trims) still gives a truthful record that verifies', async () => {
    const writer = await sources.logbook.startSession({ unitSerial: 'RW-7732', design: chargerDesign(), operator: 'A. Tester', startedAt: new Date('2026-11-21T08:00:00Z') });
    writer.addCycle(cycleReading(0));
    const bare = (await writer.close()).id;
    const record = await buildRecord(sources, bare, { now });
    expect(record.capturesSha256).toBeNull();
    expect(record.checks).toEqual([]);
    for (const name of ['bare.pdf', 'bare.html']) {
      const path = folder.file(name);
      await writeRecordFile(sources, bare, path, { now });
      expect(await verifyRecordFile(sources, path)).toMatchObject({ matches: true, stated: null, recomputed: null, sessionId: bare });
    }
    const text = execFileSync('pdftotext', [folder.file('bare.pdf'), '-'], { encoding: 'utf8' });
    expect(text).toContain('No readings were stored with this session.');
    expect(text).toContain('No capture was kept in this session');
    expect(text).toContain('No part was changed.');
    expect(text).toContain('No part values were measured in this session.');
    expect(text).toContain('Closed without sign-off');
    expect(text).toContain('does not certify the unit');
  });

  it('a unit signed off with exceptions says so first, in capitals, with the reason and every step excepted (HTML and PDF)', async () => {
    const reason = 'Transfer curve taken on the drive cabinet; limits confirmed by the customer, order 7731-B';
    const excepted = await recordSweepSession(sources.logbook, {
      unitSerial: 'RW-7733', seconds: 0.6,
      signOff: { kind: 'signed-off-with-exceptions', reason, exceptions: [{ step: 'transfer', problem: 'not-recorded', readings: [] }, { step: 'limits', problem: 'out-of-tolerance', readings: ['Smallest alpha'] }] },
    });
    const htmlPath = folder.file('excepted.html');
    await writeRecordFile(sources, excepted.sessionId, htmlPath, { now });
    const html = readFileSync(htmlPath, 'utf8');
    // The outcome box comes before the readings, so a reviewer reads it first.
    expect(html.indexOf('SIGNED OFF WITH EXCEPTIONS')).toBeGreaterThan(0);
    expect(html.indexOf('SIGNED OFF WITH EXCEPTIONS')).toBeLessThan(html.indexOf('Unit and design'));
    expect(html).toContain(`<blockquote>${reason}</blockquote>`);
    expect(html).toContain('<li>Record transfer curve: not recorded</li>');
    expect(html).toContain('<li>Check limits and pulses: out of tolerance (Smallest alpha)</li>');
    expect(html).toContain('data-outcome="signed-off-with-exceptions"');
    const pdfPath = folder.file('excepted.pdf');
    await writeRecordFile(sources, excepted.sessionId, pdfPath, { now });
    const text = execFileSync('pdftotext', [pdfPath, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('SIGNED OFF WITH EXCEPTIONS');
    expect(text).toContain(`"${reason}"`);
    expect(text).toContain('Check limits and pulses: out of tolerance (Smallest alpha)');
    expect(text.indexOf('SIGNED OFF WITH EXCEPTIONS')).toBeLessThan(text.indexOf('Readings as recorded'));
    expect((await verifyRecordFile(sources, pdfPath)).matches).toBe(true);
  });

  it('a plain sign-off says every step was recorded and within tolerance', async () => {
    const signed = await recordSweepSession(sources.logbook, { unitSerial: 'RW-7734', seconds: 0.6, signOff: { kind: 'signed-off' } });
    const path = folder.file('signed.pdf');
    await writeRecordFile(sources, signed.sessionId, path, { now });
    const text = execFileSync('pdftotext', [path, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('Signed off Every commissioning step was recorded, and each was within its tolerance');
    expect(text).not.toContain('EXCEPTIONS');
  });
});
