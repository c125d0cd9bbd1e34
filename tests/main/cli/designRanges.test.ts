// The probe's absurd design values, each refused with its field and the reason, through the commands that read a
// design (analyze, trim), instead of "in tolerance ... design NaN deg", "charging current NaN mA" or a trim of
// "2e+22 Mohm" with exit 0. Also the ranges themselves: each has a source, and the fixtures sit inside them.
import { readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { designRanges } from '../../../app/board/designRanges';
import { parseBoardDesign } from '../../../app/board/parseBoardDesign';
import { checkMeasuredParts } from '../../../app/board/measuredParts';
import { tempFolder, type TempFolder } from '../store/storeFixtures';
import { runCli } from './cliRun';

const capture = 'fixtures/captures/unit-rw0142.csv';
let folder: TempFolder;
let charger: Record<string, unknown>;
let heater: Record<string, unknown>;

beforeAll(() => {
  folder = tempFolder('rampwright-ranges-');
  charger = JSON.parse(readFileSync('fixtures/boards/charger-ch50h.board.json', 'utf8')) as Record<string, unknown>;
  heater = JSON.parse(readFileSync('fixtures/boards/heater-ht60f.board.json', 'utf8')) as Record<string, unknown>;
});
afterAll(() => folder.remove());

function designWith(base: Record<string, unknown>, change: (design: { parts: Record<string, { ohm?: number; farad?: number }> } & Record<string, unknown>) => void, name: string): string {
  const copy = structuredClone(base) as { parts: Record<string, { ohm?: number; farad?: number }> } & Record<string, unknown>;
  change(copy);
  const path = folder.file(`${name}.board.json`);
  writeFileSync(path, JSON.stringify(copy));
  return path;
}

const probeCases: Array<{ name: string; base: () => Record<string, unknown>; change: Parameters<typeof designWith>[1]; field: string; reason: RegExp }> = [
  { name: 'emitter-1e-300', base: () => charger, change: (d) => (d.parts.rEmitter.ohm = 1e-300), field: 'parts.rEmitter.ohm', reason: /must be from 1R0 to 10M .*got 1e-300/ },
  { name: 'emitter-1e30', base: () => charger, change: (d) => (d.parts.rEmitter.ohm = 1e30), field: 'parts.rEmitter.ohm', reason: /must be from 1R0 to 10M .*got 1e\+30/ },
  { name: 'capacitor-1e-30', base: () => charger, change: (d) => (d.parts.cRamp.farad = 1e-30), field: 'parts.cRamp.farad', reason: /must be from 100p to 100u/ },
  // The heater board is a 12 V design; a 100 V supply is beyond a small-signal PNP transistor's rating.
  { name: 'supply-100', base: () => heater, change: (d) => (d.supplyV = 100), field: 'supplyV', reason: /must be from 3 V to 60 V .*V_CEO/ },
];

describe('design values outside their physical range', () => {
  for (const probe of probeCases) {
    it(`${probe.name}: analyze and trim exit 2 naming ${probe.field} and why, printing no reading`, async () => {
      const design = designWith(probe.base(), probe.change, probe.name);
      for (const args of [['analyze', capture, '--design', design, '--json'], ['trim', '--design', design, '--capture', capture]]) {
        const result = await runCli(args);
        expect(result.code).toBe(2);
        expect(result.stdout).toBe('');
        expect(result.stderr).toContain(`field ${probe.field}`);
        expect(result.stderr).toMatch(probe.reason);
        expect(result.stderr).toContain(design);
      }
    });
  }

  it('measured part values (trim --part) are held to the same ranges', () => {
    // A 2 ohm discharge resistor measured at 0.5 ohm: within ten times its design value, below any resistor made.
    const design = parseBoardDesign({ ...charger, parts: { ...(charger.parts as object), rDischarge: { ohm: 2, ref: 'R15' } } });
    expect(() => checkMeasuredParts(design, { R15: 0.5 })).toThrow(/the measured discharge resistor R15 must be from 1R0 to 10M .*got R5/);
  });

  it('every range states where it comes from, and every demo design sits inside them', () => {
    for (const [name, range] of Object.entries(designRanges)) {
      expect(range.min, name).toBeLessThan(range.max);
      expect(range.source.length, name).toBeGreaterThan(10);
    }
    for (const file of readdirSync('fixtures/boards')) {
      expect(() => parseBoardDesign(JSON.parse(readFileSync(`fixtures/boards/${file}`, 'utf8')), file)).not.toThrow();
    }
  });
});
