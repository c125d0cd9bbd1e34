/** Opening a logbook (file or shared) for the record, recall and exchange commands. */
import { openLogbook } from '../store/openLogbook';
import type { RecordSources } from './buildRecord';

export type OpenedRecordSources = RecordSources & { close(): Promise<void> };

export async function openRecordSources(location: string, options: { create?: boolean } = {}): Promise<OpenedRecordSources> {
  const logbook = await openLogbook(location, { mustExist: !options.create });
  return { logbook, close: () => logbook.close() };
}
