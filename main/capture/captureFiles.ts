import { stat } from 'node:fs/promises';
import { basename, dirname, extname, join } from 'node:path';
import { readdirSync } from 'node:fs';
import { InputError } from '../../app/errors';

export type CaptureFileKind = 'csv' | 'comtrade' | 'comtrade-single';

/** Which reader a path needs, from its extension (any letter case). */
export function captureKindOf(path: string): CaptureFileKind {
  const extension = extname(path).toLowerCase();
  if (extension === '.csv') return 'csv';
  if (extension === '.cfg' || extension === '.dat') return 'comtrade';
  if (extension === '.cff') return 'comtrade-single';
  throw new InputError(
    `unknown capture type "${extension || '(no extension)'}": use .csv, a COMTRADE .cfg with its .dat, or a single-file .cff`,
    path,
  );
}

/** Throws an InputError unless `path` is a readable regular file. */
export async function assertFileExists(path: string, what = 'capture file'): Promise<void> {
  try {
    const info = await stat(path);
    if (!info.isFile()) throw new InputError(`the ${what} is not a file`, path);
  } catch (error) {
    if (error instanceof InputError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(code === 'ENOENT' ? `no such ${what}` : `cannot open the ${what} (${code ?? String(error)})`, path);
  }
}

/**
 * The other half of a COMTRADE pair: same folder and base name, the partner extension in whichever letter
 * case the folder holds (recorders write .CFG/.DAT as often as .cfg/.dat).
 */
export function comtradePartner(path: string, wantedExtension: '.cfg' | '.dat'): string | undefined {
  const folder = dirname(path);
  const base = basename(path, extname(path));
  let names: string[];
  try {
    names = readdirSync(folder);
  } catch {
    return undefined;
  }
  const exact = `${base}${wantedExtension}`;
  if (names.includes(exact)) return join(folder, exact);
  const match = names.find((name) => name.toLowerCase() === exact.toLowerCase());
  return match === undefined ? undefined : join(folder, match);
}
