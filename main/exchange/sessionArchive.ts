/**
 * Exporting a session as a portable archive and importing one into another logbook (app/exchange/ARCHIVE.md).
 * Identity is the content hash: the sha-256 of the canonical JSON of the archive's `session` section, the same
 * canonical form the logbook hashes designs with (main/store/canonicalJson.ts: keys sorted, no spaces). Importing
 * an archive whose session is already in the logbook changes nothing; anything wrong with an archive (not gzip, not
 * JSON, not our format, a hash that does not match, a damaged capture) is an InputError found before the store's single
 * transaction that writes it, so a refused archive leaves the logbook exactly as it was.
 */
import { createHash } from 'node:crypto';
import { gunzipSync, gzipSync } from 'node:zlib';
import { describeSchemaIssues } from '../../app/contract';
import { InputError } from '../../app/errors';
import { archiveFormatName, archiveFormatVersion, sessionArchiveSchema, type SessionArchive } from '../../app/exchange/archiveSchema';
import { archiveContentHash } from '../store/canonicalJson';
import { decodeCapture } from '../store/captureCodec';
import type { ArchiveImportResult, Logbook } from '../store/logbookTypes';

export { archiveContentHash };

const sha256 = (text: string | Uint8Array) => createHash('sha256').update(text).digest('hex');

export async function buildSessionArchive(logbook: Logbook, sessionId: number, options: { now?: Date } = {}): Promise<SessionArchive> {
  const { session, captureData } = await logbook.archiveSession(sessionId);
  return {
    format: archiveFormatName,
    version: archiveFormatVersion,
    exportedAt: (options.now ?? new Date()).toISOString(),
    contentSha256: archiveContentHash(session),
    session,
    captureData: captureData.map((bytes) => Buffer.from(bytes).toString('base64')),
  };
}

export function encodeSessionArchive(archive: SessionArchive): Buffer {
  return gzipSync(Buffer.from(`${JSON.stringify(archive)}\n`, 'utf8'), { level: 9 });
}

/** Reads and checks an archive completely; throws InputError naming what is wrong. */
export function decodeSessionArchive(bytes: Uint8Array, where: string): { archive: SessionArchive; captureData: Buffer[] } {
  let text: string;
  try {
    text = gunzipSync(bytes).toString('utf8');
  } catch {
    throw new InputError('is not a Rampwright session archive (not gzip-compressed, or cut short)', where);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    throw new InputError(`the archive's JSON is damaged (${(error as Error).message})`, where);
  }
  if ((json as { format?: unknown } | null)?.format !== archiveFormatName) throw new InputError(`is not a Rampwright session archive (format should be "${archiveFormatName}")`, where);
  if ((json as { version?: unknown }).version !== archiveFormatVersion) throw new InputError(`archive version ${String((json as { version?: unknown }).version)} is not one this program reads (it reads ${archiveFormatVersion})`, where);
  const parsed = sessionArchiveSchema.safeParse(json);
  if (!parsed.success) throw new InputError(`the archive does not follow its format: ${describeSchemaIssues(parsed.error)}`, where);
  const archive = parsed.data;
  const hash = archiveContentHash(archive.session);
  if (hash !== archive.contentSha256) throw new InputError(`the archive's content does not match its sha-256 (stated ${archive.contentSha256}, content gives ${hash}): it was altered or damaged`, where);
  if (sha256(archive.session.design.designJson) !== archive.session.design.contentHash) throw new InputError('the board design in the archive does not match its content hash', where);
  const captureData = archive.captureData.map((base64, index) => {
    const info = archive.session.captures[index];
    const data = Buffer.from(base64, 'base64');
    // Inflates and checks the raw samples against their sha-256 (the capture's own rule, main/store/captureCodec.ts).
    decodeCapture({ ...info, data, where: `${where}: capture ${index + 1}` });
    return data;
  });
  return { archive, captureData };
}

export type ImportResult = ArchiveImportResult;

export async function importSessionArchive(logbook: Logbook, bytes: Uint8Array, where: string): Promise<ImportResult> {
  const { archive, captureData } = decodeSessionArchive(bytes, where);
  return logbook.importArchiveSession({ session: archive.session, captureData, contentSha256: archive.contentSha256, where });
}
