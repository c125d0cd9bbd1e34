/**
 * Opening a logbook by its location: a file path (the bench's SQLite logbook, the embedded default) or a
 * `postgres://` address (a shared logbook on PostgreSQL; see postgres/connection.ts for where the password comes
 * from). Every command and the server open their logbook here.
 */
import { existsSync, mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { InputError } from '../../app/errors';
import type { Logbook } from './logbookTypes';
import type { OpenLogbookDatabaseOptions } from './openDatabase';
import { isPostgresLocation } from './postgres/connection';
import { openPostgresLogbook } from './postgres/postgresLogbook';
import { openSqliteLogbook } from './sqliteLogbook';

export interface OpenLogbookOptions extends OpenLogbookDatabaseOptions {
  /** Refuse a logbook file that does not exist yet (reading commands), instead of starting a new one. */
  mustExist?: boolean;
}

export { isPostgresLocation };

/** A location as given on the command line: a file path made absolute, an address as it is. */
export function resolveLogbookLocation(location: string): string {
  return isPostgresLocation(location) ? location.trim() : resolve(location);
}

export async function openLogbook(location: string, options: OpenLogbookOptions = {}): Promise<Logbook> {
  if (isPostgresLocation(location)) return openPostgresLogbook(location);
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
