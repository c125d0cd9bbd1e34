/**
 * Opening a logbook by its location: a file path (the bench's SQLite logbook, the embedded default). Every command
 * and the server open their logbook here, so a new kind of store is one more branch in this file.
 */
import { existsSync, mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { InputError } from '../../app/errors';
import type { Logbook } from './logbookTypes';
import type { OpenLogbookDatabaseOptions } from './openDatabase';
import { openSqliteLogbook } from './sqliteLogbook';

export interface OpenLogbookOptions extends OpenLogbookDatabaseOptions {
  /** Refuse a logbook file that does not exist yet (reading commands), instead of starting a new one. */
  mustExist?: boolean;
}

/** A location as given on the command line, made absolute when it is a file path. */
export function resolveLogbookLocation(location: string): string {
  return resolve(location);
}

export async function openLogbook(location: string, options: OpenLogbookOptions = {}): Promise<Logbook> {
  if (!existsSync(location)) {
    if (options.mustExist || options.readOnly) throw new InputError('there is no logbook here (give --db the file a session was recorded to)', location);
    try {
      mkdirSync(dirname(resolve(location)), { recursive: true });
    } catch (error) {
      throw new InputError(`cannot be created: its folder cannot be made (${error instanceof Error ? error.message : String(error)})`, location);
    }
  }
  return openSqliteLogbook(location, options);
}
