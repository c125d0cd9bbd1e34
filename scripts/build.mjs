// Builds the command line (dist/rampwright.js), the Electron shell and the renderer bundle with esbuild.
// Runs on `npm install` (prepare), so `node dist/rampwright.js ...` works right after install.
// Source maps only in development (RAMPWRIGHT_DEV=1): a map hands out the source to whoever loads the screens.
import { build } from 'esbuild';
import { existsSync, mkdirSync, cpSync, chmodSync, readdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';

const development = process.env.RAMPWRIGHT_DEV === '1';

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
    packages: 'external',
    banner: { js: '#!/usr/bin/env node' },
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
if (existsSync('dist/rampwright.js')) chmodSync('dist/rampwright.js', 0o755);
if (existsSync('renderer/static')) cpSync('renderer/static', 'dist/renderer', { recursive: true });
