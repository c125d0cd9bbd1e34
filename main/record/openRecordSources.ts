/** Opening an existing logbook for the record, recall and exchange commands: the Logbook and its database. */
import { existsSync } from 'node:fs';
import { InputError } from '../../app/errors';
import { openLogbookDatabase } from '../store/openDatabase';
import { createSqliteLogbook } from '../store/sqliteLogbook';
import type { RecordSources } from './buildRecord';

export function openRecordSources(path: string, options: { create?: boolean } = {}): RecordSources & { close(): Promise<void> } {
  if (!options.create && !existsSync(path)) throw new InputError('there is no logbook here (give --db the file a session was recorded to)', path);
  const db = openLogbookDatabase(path);
  const logbook = createSqliteLogbook(db, path);
  return { db, logbook, close: () => logbook.close() };
}
