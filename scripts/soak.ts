/**
 * The soak: the suite's command-line fuzzing (tests/fuzz/) at 10^5 runs of each kind (mutated captures, designs,
 * archives) instead of 10^4. Not part of `npm test`; run it before a release or after touching a reader:
 *
 *   node --import tsx scripts/soak.ts [runs] [captures|designs|archives ...]
 *
 * Prints the seed of each kind; a failure prints the seed and the run, and RAMPWRIGHT_FUZZ_SEED=<seed> with the
 * same runs replays it. Exit 1 when any run ended unclearly.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fuzzArchives } from '../tests/fuzz/archiveFuzz';
import { fuzzCaptures } from '../tests/fuzz/captureFuzz';
import { fuzzSeed } from '../tests/fuzz/commandFuzz';
import { fuzzDesigns } from '../tests/fuzz/designFuzz';

const kinds = { captures: fuzzCaptures, designs: fuzzDesigns, archives: fuzzArchives } as const;

async function main(): Promise<void> {
  const [runsText, ...names] = process.argv.slice(2);
  const runs = runsText === undefined ? 100_000 : Number(runsText);
  if (!Number.isInteger(runs) || runs <= 0) throw new Error(`"${runsText}" is not a number of runs`);
  const chosen = (names.length > 0 ? names : Object.keys(kinds)) as Array<keyof typeof kinds>;
  // Commands that keep files in the data folder by default (the bench signing key) keep them here.
  const data = mkdtempSync(join(tmpdir(), 'rampwright-soak-data-'));
  process.env.XDG_DATA_HOME = data;
  let failed = false;
  try {
    for (const name of chosen) {
      if (!(name in kinds)) throw new Error(`no fuzz kind "${name}" (captures, designs, archives)`);
      const folder = mkdtempSync(join(tmpdir(), `rampwright-soak-${name}-`));
      const seed = fuzzSeed();
      const started = Date.now();
      try {
        const result = await kinds[name](folder, runs, seed);
        const seconds = (Date.now() - started) / 1000;
        console.log(`${name}: ${result.ran} runs in ${seconds.toFixed(0)} s, seed ${seed}: ${result.failures.length === 0 ? 'every outcome clear' : `${result.failures.length} unclear`}`);
        for (const failure of result.failures) console.log(`  ${failure.problem}\n    rampwright ${failure.args.join(' ')}`);
        if (result.failures.length > 0) failed = true;
      } finally {
        rmSync(folder, { recursive: true, force: true });
      }
    }
  } finally {
    rmSync(data, { recursive: true, force: true });
  }
  process.exitCode = failed ? 1 : 0;
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? (error.stack ?? error.message) : String(error));
  process.exitCode = 1;
});
