/**
 * What the disk or the file system did to a logbook, in words a technician can act on: the disk is full, the file
 * or its folder is read-only (and who owns it), the file is damaged. SQLite reports these as result codes on its
 * errors (sqlite.org, "Result and Error Codes"): SQLITE_FULL, SQLITE_READONLY*, SQLITE_CANTOPEN, SQLITE_CORRUPT,
 * SQLITE_NOTADB, SQLITE_IOERR*; the file system as errno codes (ENOSPC, EACCES, EPERM, EROFS).
 */
import { accessSync, constants, readFileSync, statSync, statfsSync } from 'node:fs';
import { dirname } from 'node:path';
import { InputError } from '../../app/errors';

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

/**
 * True when the file system holding `path` has (almost) no room left: less than 64 KiB, two index-file pages of
 * SQLite's write-ahead mode. SQLite reports some writes that fail for want of space as input/output errors
 * (growing its -shm index file), so an I/O error on a full disk is called what it is.
 */
export function diskIsFull(path: string): boolean {
  try {
    const info = statfsSync(dirname(path));
    return info.bavail * info.bsize < 64 * 1024;
  } catch {
    return false;
  }
}

/** The storage fault an error stands for, or null when it is something else (a bug). */
export function storageFaultOf(error: unknown, path: string): StorageFault | null {
  const code = errorCode(error);
  const ioError = code.startsWith('SQLITE_IOERR') || code === 'EIO';
  if (code === 'SQLITE_FULL' || code === 'ENOSPC' || (ioError && diskIsFull(path))) {
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

/** An error as the InputError its storage fault stands for (naming the file), or the error itself (a bug). */
export function storageInputError(error: unknown, path: string): unknown {
  if (error instanceof InputError) return error;
  const fault = storageFaultOf(error, path);
  return fault ? new InputError(fault.message, path) : error;
}

/**
 * The same object with every method's storage faults turned into InputErrors naming the file: a full disk, a
 * read-only file, a damaged page met in any query is said in words, never thrown as a bug with a stack trace.
 */
export function guardStorage<T extends object>(target: T, path: string): T {
  const guarded: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(target)) {
    guarded[key] =
      typeof value === 'function'
        ? async (...args: unknown[]) => {
            try {
              return await (value as (...inner: unknown[]) => unknown).apply(target, args);
            } catch (error) {
              throw storageInputError(error, path);
            }
          }
        : value;
  }
  return guarded as T;
}
