/**
 * Copies an installed npm package and every package it depends on (as node_modules resolution finds them, nested
 * copies included) into another node_modules folder. For a child process run as another user, who may not be able
 * to enter the folder the checkout sits in (a clone under a private temporary folder): it gets its own copy.
 */
import { cpSync, existsSync, readFileSync } from 'node:fs';
import { dirname, join, relative, sep } from 'node:path';

/** The folder of package `name` as Node would find it from `fromFolder`: node_modules/<name> up the tree. */
function packageFolder(name: string, fromFolder: string): string | null {
  for (let folder = fromFolder; ; folder = dirname(folder)) {
    const candidate = join(folder, 'node_modules', name);
    if (existsSync(join(candidate, 'package.json'))) return candidate;
    if (dirname(folder) === folder) return null;
  }
}

/**
 * Copies `name` (found from `projectFolder`) and its dependency closure into `targetNodeModules`, each at the same
 * place below node_modules as in the project, so nested copies resolve as they did. Returns the packages copied.
 */
export function copyPackageClosure(name: string, projectFolder: string, targetNodeModules: string): string[] {
  const projectNodeModules = join(projectFolder, 'node_modules');
  const copied = new Set<string>();
  const visit = (packageName: string, fromFolder: string): void => {
    const folder = packageFolder(packageName, fromFolder);
    if (!folder || copied.has(folder)) return;
    copied.add(folder);
    const manifest = JSON.parse(readFileSync(join(folder, 'package.json'), 'utf8')) as { dependencies?: Record<string, string>; optionalDependencies?: Record<string, string> };
    for (const dependency of Object.keys({ ...manifest.dependencies, ...manifest.optionalDependencies })) visit(dependency, folder);
  };
  visit(name, projectFolder);
  for (const folder of copied) {
    const below = relative(projectNodeModules, folder);
    if (below.startsWith('..') || below.startsWith(sep)) throw new Error(`${folder} is outside ${projectNodeModules}`);
    cpSync(folder, join(targetNodeModules, below), { recursive: true, dereference: true });
  }
  return [...copied].map((folder) => relative(projectNodeModules, folder));
}
