/**
 * What the disk or the file system did to a logbook, in words a technician can act on: the disk is full, the file
 * or its folder is read-only (and who owns it), the file is damaged. SQLite reports these as result codes on its
 * errors (sqlite.org, "Result and Error Codes"): SQLITE_FULL, SQLITE_READONLY*, SQLITE_CANTOPEN, SQLITE_CORRUPT,
 * SQLITE_NOTADB, SQLITE_IOERR*; the file system as errno codes (ENOSPC, EACCES, EPERM, EROFS).
 */
import { accessSync, constants, readFileSync, statSync } from 'node:fs';
import { dirname } from 'node:path';

export type StorageFaultKind = 'disk-full' | 'read-only' | 'damaged' | 'io';

export interface StorageFault {
  kind: StorageFaultKind;
  /** One sentence: what happened to which file, without the file name in front (InputError adds it). */
  message: string;
}

export function errorCode(error: unknown): string {
  return typeof error === 'object' && error !== null && 'code' in error ? String((error as { code: unknown }).code) : '';
}

/** `rw-r--r--` from a mode. */
function modeText(mode: number): string {
  const bits = 'rwxrwxrwx';
  return [...bits].map((letter, index) => ((mode >> (8 - index)) & 1 ? letter : '-')).join('');
}

/** The user name of a uid from /etc/passwd (POSIX systems), or null. */
function userNameOf(uid: number): string | null {
  try {
    for (const line of readFileSync('/etc/passwd', 'utf8').split('\n')) {
      const fields = line.split(':');
      if (fields.length > 2 && Number(fields[2]) === uid) return fields[0];
    }
  } catch {
    // No passwd file (Windows): the uid alone.
  }
  return null;
}

/** "owned by ana (uid 1000), mode r--r--r--", or '' when the file cannot be looked at. */
export function ownerWords(path: string): string {
  try {
    const info = statSync(path);
    if (process.platform === 'win32') return `mode ${modeText(info.mode & 0o777)}`;
    const name = userNameOf(info.uid);
    return `owned by ${name === null ? `uid ${info.uid}` : `${name} (uid ${info.uid})`}, mode ${modeText(info.mode & 0o777)}`;
  } catch {
    return '';
  }
}

const readOnlyAdvice = 'reading commands (log, report, export) still work on it; to record, ask its owner for write access or give --db a copy in a folder of your own';

/**
 * Why this process may not write the logbook at `path` (the file, or the folder where SQLite keeps its
 * write-ahead log beside it), or null when it may. Root passes permission bits, so a read-only file system
 * (EROFS) is what stops it.
 */
export function writeAccessProblem(path: string): string | null {
  const folder = dirname(path);
  let exists = true;
  try {
    accessSync(path, constants.F_OK);
  } catch {
    exists = false;
  }
  if (exists) {
    try {
      accessSync(path, constants.W_OK);
    } catch (error) {
      const readOnlySystem = errorCode(error) === 'EROFS';
      return `is read-only (${readOnlySystem ? 'on a read-only file system' : ownerWords(path)}): ${readOnlyAdvice}`;
    }
  }
  try {
    accessSync(folder, constants.W_OK);
  } catch (error) {
    const readOnlySystem = errorCode(error) === 'EROFS';
    return `cannot be written: its folder ${folder} is read-only (${readOnlySystem ? 'a read-only file system' : ownerWords(folder)}), and the logbook keeps its write-ahead log beside it; ${readOnlyAdvice}`;
  }
  return null;
}

/** The storage fault an error stands for, or null when it is something else (a bug). */
export function storageFaultOf(error: unknown, path: string): StorageFault | null {
  const code = errorCode(error);
  if (code === 'SQLITE_FULL' || code === 'ENOSPC' || (code === 'SQLITE_IOERR_WRITE' && /no space/i.test(String((error as Error).message)))) {
    return { kind: 'disk-full', message: `cannot be written: the disk is full (writing ${path} and its write-ahead log ${path}-wal)` };
  }
  if (code.startsWith('SQLITE_READONLY') || code === 'EROFS') {
    const words = code === 'SQLITE_READONLY_DIRECTORY' ? `its folder ${dirname(path)} is read-only (${ownerWords(dirname(path))})` : `the file is read-only (${ownerWords(path)})`;
    return { kind: 'read-only', message: `cannot be written: ${words}; ${readOnlyAdvice}` };
  }
  if (code === 'SQLITE_CORRUPT' || code === 'SQLITE_NOTADB' || code.startsWith('SQLITE_CORRUPT')) {
    return { kind: 'damaged', message: `is damaged (SQLite finds malformed pages): run rampwright salvage --db ${path} to see which sessions can still be read and copy them to a new logbook` };
  }
  if (code === 'EACCES' || code === 'EPERM' || code === 'SQLITE_CANTOPEN') {
    return { kind: 'read-only', message: `cannot be opened (${ownerWords(path) || 'permission denied'}): ask its owner for access` };
  }
  if (code.startsWith('SQLITE_IOERR') || code === 'EIO') {
    return { kind: 'io', message: `cannot be read or written: the disk reports an input/output error (${String((error as Error).message)}); copy what you can and check the disk` };
  }
  return null;
}
