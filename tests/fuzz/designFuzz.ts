/** Mutated board designs through `analyze --design`, `trim --design` and `sim --design`. Shared by the test and the soak. */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runCommandLine } from '../../main/cli/rampwright';
import { fuzz, mutateBytes, mutateJson, type Random } from './commandFuzz';

const fixtures = fileURLToPath(new URL('../../fixtures', import.meta.url));
const boardFiles = ['charger-ch50h.board.json', 'field-fd50f.board.json', 'heater-ht60f.board.json'];

export async function fuzzDesigns(folder: string, runs: number, seed: number) {
  const designs = boardFiles.map((name) => JSON.parse(readFileSync(join(fixtures, 'boards', name), 'utf8')) as unknown);
  // A few cycles of the virtual board, for trim to measure.
  const capture = join(folder, 'board.csv');
  const quiet = process.stdout.write;
  process.stdout.write = (() => true) as typeof process.stdout.write;
  try {
    await runCommandLine(['sim', '--design', join(fixtures, 'boards', boardFiles[0]), '--out', capture, '--seconds', '0.08', '--rate', '4000']);
  } finally {
    process.stdout.write = quiet;
  }
  const tinyCapture = join(fixtures, 'captures', 'unit-rw0142.csv');
  return fuzz('mutated design', runs, seed, async (random: Random, run: number) => {
    const original = random.pick(designs);
    const text = random.chance(0.8) ? JSON.stringify(mutateJson(original, random)) : mutateBytes(new TextEncoder().encode(JSON.stringify(original, null, 2)), random);
    const path = join(folder, `design-${run % 64}.board.json`);
    writeFileSync(path, text);
    const use = random.next();
    if (use < 0.7) return ['analyze', random.chance(0.5) ? tinyCapture : capture, '--design', path, '--json'];
    if (use < 0.93) return ['trim', '--design', path, '--capture', capture, ...(random.chance(0.5) ? ['--json'] : [])];
    return ['sim', '--design', path, '--out', join(folder, `sim-${run % 8}.csv`), '--seconds', '0.02', '--rate', '2000'];
  });
}
