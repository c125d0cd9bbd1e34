import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { formatOhm } from '../../../../app/board/formatValues';
import { parseBoardDesign } from '../../../../app/board/parseBoardDesign';
import { predictRamp } from '../../../../app/board/rampModel';
import { runCli } from '../cliRun';

let folder = '';
beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-size-'));
});
afterAll(() => rmSync(folder, { recursive: true, force: true }));

const base = ['size', '--supply', '15', '--mains', '50', '--rectifier', 'full-wave', '--ramp-height', '6', '--capacitor', '470n'];

describe('rampwright size', () => {
  it('writes a board design that loads and lands on the target, and prints the part set', async () => {
    const out = join(folder, 'sized.board.json');
    const result = await runCli([...base, '--name', 'Sized bench board', '--out', out]);
    expect(result.stderr).toBe('');
    expect(result.code).toBe(0);
    expect(result.stdout).toContain(`Written to ${out}`);
    const design = parseBoardDesign(JSON.parse(readFileSync(out, 'utf8')), out);
    // The part set in words, its values as marked on parts (IEC 60062 code).
    expect(result.stdout).toMatch(new RegExp(`emitter resistor +${formatOhm(design.parts.rEmitter.ohm)} +exact \\d+k\\d*, 5 %`));
    expect(result.stdout).toMatch(/ramp capacitor +470n +chosen/);
    // The divider's reference is its ideal for the asked emitter drop, not an exact value it misses: said so.
    expect(result.stdout).toMatch(new RegExp(`upper bias resistor +${formatOhm(design.parts.rBiasTop.ohm)} +ideal \\d+k\\d*`));
    expect(result.stdout).toMatch(/Divider, ideal: for the emitter\s+drop asked/);
    expect(design.name).toBe('Sized bench board');
    expect(Math.abs(predictRamp(design).peakV / 6 - 1)).toBeLessThan(0.03);
  });

  it('--json gives the design, prediction and tolerance spread', async () => {
    const result = await runCli([...base, '--series', 'e96', '--json']);
    expect(result.code).toBe(0);
    const parsed = JSON.parse(result.stdout) as { design: { parts: { rEmitter: { ohm: number; tolerancePct: number } } }; prediction: { peakV: number }; tolerance: { runs: number } };
    expect(parsed.design.parts.rEmitter.tolerancePct).toBe(1); // E96 parts are 1 % (REFERENCES.md)
    expect(Math.abs(parsed.prediction.peakV / 6 - 1)).toBeLessThan(0.01);
    expect(parsed.tolerance.runs).toBeGreaterThan(0);
  });

  it('bad options exit 2 with a message naming the option', async () => {
    const badCapacitor = await runCli(['size', '--supply', '15', '--mains', '50', '--rectifier', 'full-wave', '--ramp-height', '6', '--capacitor', '47x']);
    expect(badCapacitor.code).toBe(2);
    expect(badCapacitor.stderr).toContain('--capacitor');
    const badRectifier = await runCli(['size', '--supply', '15', '--mains', '50', '--rectifier', 'three-phase', '--ramp-height', '6', '--capacitor', '470n']);
    expect(badRectifier.code).toBe(2);
    expect(badRectifier.stderr).toContain('--rectifier');
    const tooTall = await runCli([...base.slice(0, 7), '--ramp-height', '14', '--capacitor', '470n']);
    expect(tooTall.code).toBe(2);
    expect(tooTall.stderr).toContain('--emitter-drop');
    const badSeries = await runCli([...base, '--series', 'E7']);
    expect(badSeries.code).toBe(2);
    expect(badSeries.stderr).toContain('--series');
  });
});
