/** Reads a firmware image (Intel HEX, as `npm run firmware` writes firmware/build/rampwright-logger.hex). */
import { readFile } from 'node:fs/promises';
import { InputError } from '../../app/errors';
import { parseIntelHex } from './intelHex';
import { flashBytes } from './loggerChip';

export async function loadFirmwareImage(path: string): Promise<Uint8Array> {
  let text: string;
  try {
    text = await readFile(path, 'latin1');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(code === 'ENOENT' ? 'no such file; build it with `npm run firmware` (firmware/build/rampwright-logger.hex)' : `cannot read it (${code ?? String(error)})`, path);
  }
  return parseIntelHex(text, flashBytes, path);
}
