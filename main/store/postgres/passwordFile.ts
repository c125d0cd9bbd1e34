/**
 * The PostgreSQL password file (PostgreSQL docs, "The Password File"): lines `hostname:port:database:username:password`,
 * `*` matching anything in the first four fields, `\:` and `\\` escaping, `#` starting a comment. The first matching
 * line wins. Like libpq, a file others can read is ignored on Unix (the password would not be secret).
 */
import { readFileSync, statSync } from 'node:fs';
import { homedir } from 'node:os';
import { join } from 'node:path';

export interface PasswordLookup {
  host: string;
  port: number;
  database: string;
  user: string;
}

export function passwordFilePath(env: Record<string, string | undefined>, explicit?: string): string {
  if (explicit) return explicit;
  if (env.PGPASSFILE) return env.PGPASSFILE;
  return process.platform === 'win32' ? join(env.APPDATA ?? homedir(), 'postgresql', 'pgpass.conf') : join(homedir(), '.pgpass');
}

function splitFields(line: string): string[] {
  const fields: string[] = [];
  let current = '';
  for (let i = 0; i < line.length; i += 1) {
    const char = line[i];
    if (char === '\\' && i + 1 < line.length) {
      current += line[i + 1];
      i += 1;
    } else if (char === ':' && fields.length < 4) {
      fields.push(current);
      current = '';
    } else current += char;
  }
  fields.push(current);
  return fields;
}

/** The password for this connection from the file, or null (no file, no match, or a file others can read). */
export function passwordFromFile(path: string, lookup: PasswordLookup): string | null {
  let text: string;
  try {
    const stats = statSync(path);
    if (process.platform !== 'win32' && (stats.mode & 0o077) !== 0) return null;
    text = readFileSync(path, 'utf8');
  } catch {
    return null;
  }
  const wanted = [lookup.host, String(lookup.port), lookup.database, lookup.user];
  for (const raw of text.split(/\r?\n/)) {
    if (raw.trim() === '' || raw.startsWith('#')) continue;
    const fields = splitFields(raw);
    if (fields.length !== 5) continue;
    if (wanted.every((value, index) => fields[index] === '*' || fields[index] === value)) return fields[4];
  }
  return null;
}
