/**
 * Technician's words in every text a person reads (issue 11): "emitter resistor R14", never the design file's
 * position keys (rEmitter, rBiasTop, cRamp, ...), which stay in files and JSON. Checked on the command line's text
 * output of every command that names parts (demo, trim for a wrong part and for a stack-up, size, analyze, log, sim,
 * refusals) and on the commissioning record as HTML and as PDF text (pdftotext, Debian poppler-utils). The screens
 * are checked in the browser by tests/e2e/commissioning.test.ts with the same pattern.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { roleIdentifiersIn } from '../../roleIdentifiers';
import { runCli } from './cliRun';

const charger = join(__dirname, '../../../fixtures/boards/charger-ch50h.board.json');
let folder = '';
beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-words-'));
});
afterAll(() => rmSync(folder, { recursive: true, force: true }));

function expectWordsOnly(label: string, text: string): void {
  expect(text.length, `${label} printed something`).toBeGreaterThan(0);
  expect(roleIdentifiersIn(text), `${label} names parts in words`).toEqual([]);
}

describe('no role identifier in any text a person reads', () => {
  it('command line text: demo, trim (a wrong part, a stack-up, a measured part), size, analyze, log, sim and refusals', async () => {
    const db = join(folder, 'demo.sqlite');
    const demo = await runCli(['demo', '--db', db]);
    expect(demo.code).toBe(0);
    expectWordsOnly('demo', demo.stdout);

    for (const fault of ['capacitor-low', 'stacked-tolerances', 'wrong-emitter-resistor', 'clipped-ramp']) {
      const capture = join(folder, `${fault}.csv`);
      const sim = await runCli(['sim', '--design', charger, '--out', capture, '--seconds', '1.5', '--fault', fault]);
      expect(sim.code).toBe(0);
      expectWordsOnly(`sim --fault ${fault}`, sim.stdout + sim.stderr);
      const trim = await runCli(['trim', '--design', charger, '--capture', capture]);
      expect(trim.code).toBe(0);
      expectWordsOnly(`trim (${fault})`, trim.stdout);
      const analyze = await runCli(['analyze', capture, '--design', charger]);
      expectWordsOnly(`analyze (${fault})`, analyze.stdout + analyze.stderr);
    }
    const measured = await runCli(['trim', '--design', charger, '--capture', join(folder, 'capacitor-low.csv'), '--part', 'C6=273n', '--part', 'R14=6k8']);
    expectWordsOnly('trim --part', measured.stdout);
    // Refusals name the part in words too.
    for (const args of [['--part', 'R14=6.8'], ['--part', 'R14=6k8', '--part', 'rEmitter=6k8'], ['--part', 'R99=1k']]) {
      const refused = await runCli(['trim', '--design', charger, '--capture', join(folder, 'capacitor-low.csv'), ...args]);
      expect(refused.code).toBe(2);
      expectWordsOnly(`trim ${args.join(' ')}`, refused.stderr);
    }
    const size = await runCli(['size', '--supply', '15', '--mains', '50', '--rectifier', 'half-wave', '--ramp-height', '7', '--capacitor', '390n']);
    expectWordsOnly('size', size.stdout);
    const log = await runCli(['log', '--db', db]);
    expectWordsOnly('log', log.stdout);
  }, 240_000);

  it('the commissioning record, HTML and PDF, of both demo units', async () => {
    const db = join(folder, 'record.sqlite');
    expect((await runCli(['demo', '--db', db])).code).toBe(0);
    for (const session of [1, 2]) {
      const html = join(folder, `record-${session}.html`);
      const pdf = join(folder, `record-${session}.pdf`);
      expect((await runCli(['report', '--db', db, '--session', String(session), '--out', html])).code).toBe(0);
      expect((await runCli(['report', '--db', db, '--session', String(session), '--out', pdf])).code).toBe(0);
      const htmlText = readFileSync(html, 'utf8');
      // The trims and measured parts are in the record, in words with designators and values as marked.
      expect(htmlText).toMatch(session === 1 ? /Ramp capacitor C6<\/td><td class="number">273n/ : /Emitter resistor R14<\/td><td class="number">6k8/);
      expectWordsOnly(`record ${session} (HTML)`, htmlText.replace(/<[^>]*>/g, ' '));
      const pdfText = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
      expectWordsOnly(`record ${session} (PDF)`, pdfText);
    }
  }, 240_000);
});
