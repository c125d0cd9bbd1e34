/**
 * Reads a `*.board.json` file into a checked BoardDesign. Every fault is an InputError naming the file and,
 * for content faults, the field (app/board/parseBoardDesign.ts).
 */
import { readFile, writeFile } from 'node:fs/promises';
import type { BoardDesign } from '../../app/board/design';
import { parseBoardDesign } from '../../app/board/parseBoardDesign';
import { InputError } from '../../app/errors';

/** A design file is a few kilobytes; anything far bigger is the wrong file. */
const maxDesignBytes = 1 << 20;

export async function loadBoardDesign(path: string): Promise<BoardDesign> {
  let text: string;
  try {
    const bytes = await readFile(path);
    if (bytes.length > maxDesignBytes) throw new InputError(`the file is ${bytes.length} bytes: not a board design?`, path);
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch (error) {
    if (error instanceof InputError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new InputError('no such board design file', path);
    if (code === 'EISDIR') throw new InputError('is a folder, not a board design file', path);
    if (error instanceof TypeError) throw new InputError('the file is not UTF-8 text', path);
    throw new InputError(`cannot read the board design (${code ?? String(error)})`, path);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    throw new InputError(`not valid JSON (${error instanceof Error ? error.message : String(error)})`, path);
  }
  return parseBoardDesign(json, path);
}

/** Writes a design as pretty JSON with a trailing newline (the format `size --out` produces). */
export async function saveBoardDesign(path: string, design: BoardDesign): Promise<void> {
  try {
    await writeFile(path, `${JSON.stringify(design, null, 2)}\n`, { flag: 'w' });
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(`cannot write the board design (${code ?? String(error)})`, path);
  }
}
