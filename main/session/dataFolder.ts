/**
 * Where Rampwright keeps the technician's logbook when no `--db` is given: the platform's per-user data folder
 * (XDG Base Directory spec on Linux and other Unixes, %APPDATA% on Windows, ~/Library/Application Support on macOS).
 */
import { join } from 'node:path';

export interface DataFolderFacts {
  platform: string;
  env: Record<string, string | undefined>;
  home: string;
}

export function userDataFolder(facts: DataFolderFacts): string {
  const { platform, env, home } = facts;
  if (platform === 'win32') return join(env.APPDATA && env.APPDATA.trim() !== '' ? env.APPDATA : join(home, 'AppData', 'Roaming'), 'Rampwright');
  if (platform === 'darwin') return join(home, 'Library', 'Application Support', 'Rampwright');
  // XDG: an unset, empty or relative XDG_DATA_HOME means the default ~/.local/share.
  const xdg = env.XDG_DATA_HOME;
  const base = xdg && xdg.startsWith('/') ? xdg : join(home, '.local', 'share');
  return join(base, 'rampwright');
}

export const defaultLogbookFileName = 'logbook.sqlite';
