/**
 * Where Rampwright's own files are at run time (the example designs, the built screens), whether it runs from
 * the sources (tsx, tests) or from dist/ after a build: walk up from this module to the package's root.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export function packageRoot(from: string = fileURLToPath(import.meta.url)): string {
  let folder = dirname(from);
  for (let depth = 0; depth < 8; depth++) {
    const manifest = join(folder, 'package.json');
    if (existsSync(manifest)) {
      try {
        if ((JSON.parse(readFileSync(manifest, 'utf8')) as { name?: string }).name === 'rampwright') return folder;
      } catch {
        // Not ours; keep walking up.
      }
    }
    const parent = dirname(folder);
    if (parent === folder) break;
    folder = parent;
  }
  throw new Error('cannot find the rampwright package folder above this module');
}

export function exampleDesignsFolder(): string {
  return join(packageRoot(), 'fixtures', 'boards');
}

export function rendererFolder(): string {
  return join(packageRoot(), 'dist', 'renderer');
}
