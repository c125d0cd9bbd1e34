/** Mutated captures (CSV, COMTRADE .cfg/.dat pairs, .cff) through `rampwright analyze`. Shared by the test and the soak. */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runCommandLine } from '../../main/cli/rampwright';
import { fuzz, mutateBytes, type Random } from './commandFuzz';

const fixtures = fileURLToPath(new URL('../../fixtures', import.meta.url));
const design = join(fixtures, 'boards', 'charger-ch50h.board.json');

interface Seed {
  /** File names relative to fixtures/captures (a .cfg with its .dat), or bytes made here. */
  files: Array<{ name: string; bytes: Uint8Array }>;
  /** The file given to analyze. */
  main: string;
}

function fixtureSeed(...names: string[]): Seed {
  return { files: names.map((name) => ({ name, bytes: readFileSync(join(fixtures, 'captures', name)) })), main: names[0] };
}

/** The seeds: our fixtures of every format, and a short capture of the virtual board (real cycles to analyse). */
export async function captureSeeds(folder: string): Promise<Seed[]> {
  const simulated = join(folder, 'seed-board.csv');
  const quiet = { write: process.stdout.write };
  process.stdout.write = (() => true) as typeof process.stdout.write;
  try {
    await runCommandLine(['sim', '--design', design, '--out', simulated, '--seconds', '0.06', '--rate', '4000']);
  } finally {
    process.stdout.write = quiet.write;
  }
  return [
    fixtureSeed('unit-rw0142.csv'),
    fixtureSeed('unit-rw0142-messy.csv'),
    { files: [{ name: 'board.csv', bytes: readFileSync(simulated) }], main: 'board.csv' },
    fixtureSeed('unit-rw0142-ascii-1999.cfg', 'unit-rw0142-ascii-1999.dat'),
    fixtureSeed('unit-rw0142-binary-2013.cfg', 'unit-rw0142-binary-2013.dat'),
    fixtureSeed('unit-rw0311-float32-2013.cfg', 'unit-rw0311-float32-2013.dat'),
    fixtureSeed('recorder-rw0391-binary-multirate.cfg', 'recorder-rw0391-binary-multirate.dat'),
    fixtureSeed('unit-rw0142-ascii-2013.cff'),
    fixtureSeed('recorder-rw0388-multirate-2013.cff'),
  ];
}

export async function fuzzCaptures(folder: string, runs: number, seed: number) {
  const seeds = await captureSeeds(folder);
  return fuzz('mutated capture', runs, seed, async (random: Random, run: number) => {
    const chosen = random.pick(seeds);
    const victim = random.below(chosen.files.length);
    const stem = `capture-${run % 64}`;
    for (const [index, file] of chosen.files.entries()) {
      const extension = file.name.slice(file.name.lastIndexOf('.'));
      writeFileSync(join(folder, `${stem}${extension}`), index === victim ? mutateBytes(file.bytes, random) : file.bytes);
    }
    const main = join(folder, `${stem}${chosen.main.slice(chosen.main.lastIndexOf('.'))}`);
    return ['analyze', main, ...(random.chance(0.5) ? ['--json'] : []), ...(random.chance(0.4) ? ['--design', design] : [])];
  });
}
