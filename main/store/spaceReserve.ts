/**
 * A little disk kept in reserve beside a logbook while a session records, so that when the disk fills the
 * session can still be ended in the logbook: the reserve is given back, and the few pages that mark the session
 * (its status, end, totals and why it stopped) fit in the space it held. One file per recording process,
 * `<logbook>-reserve-<pid>`, removed when the session ends; one left by a process that died is removed by the
 * next process that opens the logbook to write.
 */
import { readdirSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../../app/errors';
import { processExists } from './sessionRecovery';
import { storageFaultOf } from './storageFaults';

/**
 * 512 KiB: the closing transaction writes a handful of 4 KiB pages to the write-ahead log (the session row, a
 * note, an index page or two); a hundred times that leaves room for a checkpoint's growth as well (our rule).
 */
export const reserveBytes = 512 * 1024;

export interface SpaceReserve {
  readonly path: string;
  /** Gives the space back (idempotent). */
  release(): void;
}

const reservePattern = (logbookPath: string): RegExp => new RegExp(`^${basename(logbookPath).replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}-reserve-(\\d+)$`);

/** Takes the reserve; a disk already too full for it is refused before any session starts. */
export function takeSpaceReserve(logbookPath: string): SpaceReserve {
  const path = `${logbookPath}-reserve-${process.pid}`;
  try {
    writeFileSync(path, Buffer.alloc(reserveBytes));
  } catch (error) {
    rmSync(path, { force: true });
    const fault = storageFaultOf(error, logbookPath);
    if (fault?.kind === 'disk-full') throw new InputError(`${fault.message}: no session was started; free some space first`, logbookPath);
    if (fault) throw new InputError(fault.message, logbookPath);
    throw error;
  }
  let released = false;
  return {
    path,
    release() {
      if (released) return;
      released = true;
      rmSync(path, { force: true });
    },
  };
}

/** Removes reserves left beside the logbook by processes of this computer that are gone. */
export function removeStaleReserves(logbookPath: string): void {
  const pattern = reservePattern(logbookPath);
  let names: string[];
  try {
    names = readdirSync(dirname(logbookPath));
  } catch {
    return;
  }
  for (const name of names) {
    const match = pattern.exec(name);
    if (match && !processExists(Number(match[1]))) rmSync(join(dirname(logbookPath), name), { force: true });
  }
}
