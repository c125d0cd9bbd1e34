/** Opening a logbook (file or shared) for the record, recall and exchange commands. */
import { openLogbook } from '../store/openLogbook';
import type { RecordSources } from './buildRecord';

export type OpenedRecordSources = RecordSources & { close(): Promise<void> };

export async function openRecordSources(location: string, options: { create?: boolean } = {}): Promise<OpenedRecordSources> {
  // Only import writes; the record, recall and export read, and open read-only so a logbook on a full disk or a
  // read-only file can still be read.
  const logbook = await openLogbook(location, { mustExist: !options.create, readOnly: !options.create });
  return { logbook, close: () => logbook.close() };
}
