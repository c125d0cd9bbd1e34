/**
 * The window comes back where the technician left it: bounds and maximised state in a small JSON file in the
 * user's data folder. A saved position on a screen that is no longer attached is dropped (centred instead).
 */
import { readFileSync, writeFileSync, mkdirSync, renameSync } from 'node:fs';
import { dirname } from 'node:path';
import { z } from 'zod';

const windowStateSchema = z.object({
  x: z.number().int().optional(),
  y: z.number().int().optional(),
  width: z.number().int().min(400).max(20000),
  height: z.number().int().min(300).max(20000),
  maximized: z.boolean().default(false),
});
export type WindowState = z.infer<typeof windowStateSchema>;

export interface Rectangle {
  x: number;
  y: number;
  width: number;
  height: number;
}

export const defaultWindowState: WindowState = { width: 1280, height: 820, maximized: false };

/** Keeps the saved position only if at least 100 x 50 px of the title area is on some display's work area. */
export function placeWindowState(state: WindowState, workAreas: readonly Rectangle[]): WindowState {
  if (state.x === undefined || state.y === undefined) return { width: state.width, height: state.height, maximized: state.maximized };
  const { x, y } = state;
  const visible = workAreas.some((area) => {
    const overlapX = Math.min(x + state.width, area.x + area.width) - Math.max(x, area.x);
    const overlapY = Math.min(y + 50, area.y + area.height) - Math.max(y, area.y);
    return overlapX >= 100 && overlapY >= 50;
  });
  return visible ? state : { width: state.width, height: state.height, maximized: state.maximized };
}

export function parseWindowState(text: string | null): WindowState {
  if (text === null) return defaultWindowState;
  try {
    const parsed = windowStateSchema.safeParse(JSON.parse(text));
    return parsed.success ? parsed.data : defaultWindowState;
  } catch {
    return defaultWindowState;
  }
}

export function loadWindowState(file: string, workAreas: readonly Rectangle[]): WindowState {
  let text: string | null = null;
  try {
    text = readFileSync(file, 'utf8');
  } catch {
    text = null;
  }
  return placeWindowState(parseWindowState(text), workAreas);
}

/** Written to a temporary file and renamed, so a crash mid-write never leaves half a file. */
export function saveWindowState(file: string, bounds: Rectangle, maximized: boolean): void {
  const state: WindowState = { x: Math.round(bounds.x), y: Math.round(bounds.y), width: Math.max(400, Math.round(bounds.width)), height: Math.max(300, Math.round(bounds.height)), maximized };
  mkdirSync(dirname(file), { recursive: true });
  const temporary = `${file}.tmp`;
  writeFileSync(temporary, JSON.stringify(state));
  renameSync(temporary, file);
}
