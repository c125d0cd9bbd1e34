/**
 * Runs every benchmark module in scripts/bench/ (each exports `async function run(): Promise<void>` that prints
 * figures), in name order, with a header per module. `npm run bench -- analysis formats` runs only the modules
 * whose names contain one of the given words. Benchmarks print; they assert nothing (speed is not a unit test).
 */
import { readdirSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const folder = join(dirname(fileURLToPath(import.meta.url)), 'bench');
const wanted = process.argv.slice(2);

async function main(): Promise<void> {
  const modules = readdirSync(folder)
    .filter((name) => name.endsWith('.ts'))
    .sort()
    .filter((name) => wanted.length === 0 || wanted.some((word) => name.includes(word)));
  if (modules.length === 0) {
    console.error(`no benchmark matches ${wanted.join(', ')}`);
    process.exitCode = 2;
    return;
  }
  for (const name of modules) {
    console.log(`\n=== ${basename(name, '.ts')} ===`);
    const module = (await import(pathToFileURL(join(folder, name)).href)) as { run?: () => Promise<void> };
    if (typeof module.run !== 'function') {
      console.log('  (no run() exported; skipped)');
      continue;
    }
    await module.run();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exitCode = 1;
});
