/**
 * Writes a file whole or not at all: to `<path>.partial` first, renamed into place when complete, so a failed
 * write never leaves a half file under the real name (nor replaces a good one). Failures are InputErrors naming
 * the path.
 */
import { rename, rm, writeFile } from 'node:fs/promises';
import { InputError } from '../../app/errors';

export async function writeWholeFile(path: string, content: Uint8Array | string): Promise<void> {
  const partial = `${path}.partial`;
  try {
    await writeFile(partial, content);
    await rename(partial, path);
  } catch (error) {
    await rm(partial, { force: true });
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(`cannot write the file${code ? ` (${code})` : ''}`, path);
  }
}
