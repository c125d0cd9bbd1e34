// No NaN or infinity reaches any output: every command that prints JSON (analyze, trim, size, log, demo) run
// in-process on designs drawn over the whole of every physical range (designs a user could load, extremes
// included), on captures the virtual board makes from them. A command either answers (exit 0, every number
// finite, no "NaN"/"Infinity" in its human text) or refuses in words (exit 2); it never throws.
import fc from 'fast-check';
import { writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BoardDesign } from '../../../app/board/design';
import { designRanges } from '../../../app/board/designRanges';
import { firstNonFiniteNumber } from '../../../main/cli/jsonOutput';
import { anyValidDesignArbitrary } from '../../app/board/boardArbitraries';
import { tempFolder, type TempFolder } from '../store/storeFixtures';
import { runCli, type CliResult } from './cliRun';

let folder: TempFolder;
beforeAll(() => {
  folder = tempFolder('rampwright-finite-');
});
afterAll(() => folder.remove());

const stackTrace = /\n\s+at \S+ \(|\n\s+at file:|internal error/;

/** Checks one command's run: exit 0 with finite JSON (when asked for JSON) and no NaN in text, or exit 2 in words. */
function expectClearOutcome(result: CliResult, json: boolean): void {
  expect(result.stderr).not.toMatch(stackTrace);
  expect([0, 2]).toContain(result.code);
  if (result.code === 2) {
    expect(result.stderr).toMatch(/^rampwright: \S/);
    return;
  }
  expect(result.stdout).not.toMatch(/\bNaN\b|\bInfinity\b|undefined/);
  if (json) expect(firstNonFiniteNumber(JSON.parse(result.stdout))).toBeNull();
}

let runIndex = 0;

describe('every JSON output is finite on any valid design', () => {
  it('sim -> analyze and trim (JSON and text) on designs across the physical ranges', async () => {
    await fc.assert(
      fc.asyncProperty(anyValidDesignArbitrary, fc.boolean(), async (design: BoardDesign, withFault) => {
        runIndex += 1;
        const designPath = folder.file(`design-${runIndex}.board.json`);
        const capturePath = folder.file(`capture-${runIndex}.csv`);
        writeFileSync(designPath, JSON.stringify(design));
        const sim = await runCli(['sim', '--design', designPath, '--out', capturePath, '--seconds', '0.5', '--rate', '8000', ...(withFault ? ['--fault', 'capacitor-low'] : [])]);
        expectClearOutcome(sim, false);
        if (sim.code !== 0) return;
        for (const json of [true, false]) {
          const flag = json ? ['--json'] : [];
          expectClearOutcome(await runCli(['analyze', capturePath, '--design', designPath, ...flag]), json);
          expectClearOutcome(await runCli(['trim', '--design', designPath, '--capture', capturePath, ...flag]), json);
        }
        // Another board's capture judged against this design: readings far off, still finite.
        expectClearOutcome(await runCli(['analyze', 'fixtures/captures/unit-rw0142.csv', '--design', designPath, '--json']), true);
      }),
      { numRuns: Number(process.env.RAMPWRIGHT_PROPERTY_RUNS ?? 12) },
    );
  }, 300_000);

  it('size --json on targets across the physical ranges', async () => {
    const logUniform = (min: number, max: number) => fc.double({ min: Math.log(min), max: Math.log(max), noNaN: true }).map(Math.exp);
    await fc.assert(
      fc.asyncProperty(
        logUniform(designRanges.supplyV.min, designRanges.supplyV.max),
        fc.double({ min: 0.05, max: 0.9, noNaN: true }),
        logUniform(designRanges.rampCapacitorFarad.min, designRanges.rampCapacitorFarad.max),
        fc.constantFrom('half-wave', 'full-wave'),
        fc.constantFrom('E12', 'E24', 'E96'),
        async (supplyV, share, farad, rectifier, series) => {
          const result = await runCli(['size', '--supply', String(supplyV), '--mains', '50', '--rectifier', rectifier, '--ramp-height', String(Math.max(0.5, supplyV * share)), '--capacitor', String(farad), '--series', series, '--json']);
          expectClearOutcome(result, true);
        },
      ),
      { numRuns: Number(process.env.RAMPWRIGHT_PROPERTY_RUNS ?? 25) },
    );
  }, 300_000);

  it('demo --json and log --json', async () => {
    const db = folder.file('demo.sqlite');
    expectClearOutcome(await runCli(['demo', '--db', db, '--json']), true);
    expectClearOutcome(await runCli(['log', '--db', db, '--json']), true);
  }, 300_000);
});
