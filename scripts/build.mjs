// Builds the command line (dist/rampwright.js), the Electron shell and the renderer bundle with esbuild.
// Runs on `npm install` (prepare), so `node dist/rampwright.js ...` works right after install.
// Source maps only in development (RAMPWRIGHT_DEV=1): a map hands out the source to whoever loads the screens.
import asc from 'assemblyscript/asc';
import { build } from 'esbuild';
import { existsSync, mkdirSync, cpSync, chmodSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';

const development = process.env.RAMPWRIGHT_DEV === '1';

// Packages stay in node_modules (native addons, ones that only some commands load), except zod, which nearly every
// command loads at start: bundled, it saves resolving and reading its ~100 module files on each run (about a tenth
// of a second of start-up).
const manifest = JSON.parse(readFileSync('package.json', 'utf8'));
const bundled = new Set(['zod']);
const external = [...Object.keys(manifest.dependencies ?? {}), ...Object.keys(manifest.optionalDependencies ?? {})]
  .filter((name) => !bundled.has(name))
  .flatMap((name) => [name, `${name}/*`]);

const targets = [
  // The command line in chunks: each command's code (and the packages only it needs) loads when that command runs.
  {
    entryPoints: ['main/cli/rampwright.ts'],
    outdir: 'dist',
    entryNames: '[name]',
    chunkNames: 'chunks/[name]-[hash]',
    splitting: true,
    platform: 'node',
    format: 'esm',
    banner: { js: '#!/usr/bin/env node' },
    external,
  },
  {
    entryPoints: ['main/electron/main.ts'],
    outfile: 'dist/electron/main.js',
    platform: 'node',
    format: 'esm',
    packages: 'external',
  },
  // The CSV parser thread (main/capture/parallelCsv.ts starts it from here, for the command line and the desktop app).
  {
    entryPoints: ['main/capture/csvChunkWorker.ts'],
    outfile: 'dist/csvChunkWorker.js',
    platform: 'node',
    format: 'esm',
    packages: 'external',
  },
  {
    entryPoints: ['main/electron/preload.ts'],
    outfile: 'dist/electron/preload.cjs',
    platform: 'node',
    format: 'cjs',
    external: ['electron'],
  },
  {
    entryPoints: ['renderer/index.ts'],
    outfile: 'dist/renderer/index.js',
    platform: 'browser',
    format: 'esm',
    bundle: true,
  },
];

mkdirSync('dist', { recursive: true });
// Chunks of an earlier build would pile up under new hashes.
rmSync('dist/chunks', { recursive: true, force: true });
for (const target of targets) {
  const entry = target.entryPoints[0];
  if (!existsSync(entry)) continue;
  await build({ bundle: true, target: 'es2022', sourcemap: development, logLevel: 'warning', ...target });
}
if (!development) {
  // Maps left from an earlier development build would still be shipped and served.
  for (const entry of readdirSync('dist', { recursive: true, withFileTypes: true })) {
    if (entry.isFile() && entry.name.endsWith('.map')) rmSync(join(entry.parentPath ?? entry.path, entry.name));
  }
}
// The CSV parser threads' plain-row path in WebAssembly (wasm/csvFields.ts, AssemblyScript): no runtime, no
// assertions, the memory given by the caller. Without it the threads use the TypeScript parser alone.
const fields = await asc.main(['wasm/csvFields.ts', '-O3', '--runtime', 'stub', '--noAssert', '--importMemory', '--initialMemory', '1', '--outFile', 'dist/csvFields.wasm']);
if (fields.error) throw new Error(`wasm/csvFields.ts did not compile: ${fields.error.message}\n${fields.stderr.toString()}`);
if (existsSync('dist/rampwright.js')) chmodSync('dist/rampwright.js', 0o755);
if (existsSync('renderer/static')) cpSync('renderer/static', 'dist/renderer', { recursive: true });
