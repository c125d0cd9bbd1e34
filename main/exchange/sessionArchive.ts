/**
 * Exporting a session as a portable archive and importing one into another logbook (app/exchange/ARCHIVE.md).
 * Identity is the content hash: the sha-256 of the canonical JSON of the archive's `session` section, the same
 * canonical form the logbook hashes designs with (main/store/canonicalJson.ts: keys sorted, no spaces). Importing
 * an archive whose session is already in the logbook changes nothing; anything wrong with an archive (not gzip, not
 * JSON, not our format, a hash that does not match, content that fails the logbook's own rules, a signature that
 * does not hold, a damaged capture, anything that expands beyond its declared size) is an InputError found before
 * the store's single transaction that writes it, so a refused archive leaves the logbook exactly as it was.
 */
import { createHash } from 'node:crypto';
import { gunzipSync, gzipSync } from 'node:zlib';
import { describeSchemaIssues } from '../../app/contract';
import { InputError } from '../../app/errors';
import { archiveContentProblems } from '../../app/exchange/archiveContent';
import { archiveFormatName, archiveFormatVersion, sessionArchiveSchema, signedArchiveMessage, type ArchiveSession, type SessionArchive } from '../../app/exchange/archiveSchema';
import { legacySignOffOf } from '../../app/exchange/legacySignOff';
import { archiveContentHash } from '../store/canonicalJson';
import { decodeCapture } from '../store/captureCodec';
import type { ArchiveImportResult, Logbook } from '../store/logbookTypes';
import { keyFingerprint, signatureHolds, signBytes, type BenchKey } from './benchKey';

export { archiveContentHash };

const sha256 = (text: string | Uint8Array) => createHash('sha256').update(text).digest('hex');

export async function buildSessionArchive(logbook: Logbook, sessionId: number, options: { now?: Date; key?: BenchKey | null } = {}): Promise<SessionArchive> {
  const { session, captureData } = await logbook.archiveSession(sessionId);
  const archive: SessionArchive = {
    format: archiveFormatName,
    version: archiveFormatVersion,
    exportedAt: (options.now ?? new Date()).toISOString(),
    contentSha256: archiveContentHash(session),
    session,
    captureData: captureData.map((bytes) => Buffer.from(bytes).toString('base64')),
  };
  if (options.key) {
    archive.signature = {
      algorithm: 'ed25519',
      publicKey: options.key.publicKey.toString('base64'),
      value: signBytes(options.key, Buffer.from(signedArchiveMessage(archive), 'utf8')).toString('base64'),
    };
  }
  return archive;
}

export function encodeSessionArchive(archive: SessionArchive): Buffer {
  return gzipSync(Buffer.from(`${JSON.stringify(archive)}\n`, 'utf8'), { level: 9 });
}

/** Most bytes an archive's JSON may declare: 1 GiB (a day of cycles and an hour of kept samples; our rule). */
export const maxArchiveJsonBytes = 1024 * 1024 * 1024;

/**
 * Gunzips an archive no further than its own header declares: the gzip trailer's ISIZE (RFC 1952, 2.3.1: the
 * uncompressed size modulo 2^32, the archive's one member). A file that would expand beyond it (a decompression
 * bomb, or a second member) stops there and is refused, costing at most the declared size in memory.
 */
function gunzipDeclared(bytes: Uint8Array, where: string): Buffer {
  if (bytes.length < 18 || bytes[0] !== 0x1f || bytes[1] !== 0x8b) throw new InputError('is not a Rampwright session archive (not gzip-compressed, or cut short)', where);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const declared = view.getUint32(bytes.length - 4, true);
  let text: Buffer;
  try {
    text = gunzipSync(bytes, { maxOutputLength: Math.max(1, Math.min(declared, maxArchiveJsonBytes)) });
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ERR_BUFFER_TOO_LARGE') {
      if (declared > maxArchiveJsonBytes) throw new InputError(`declares ${declared} bytes of content, more than this program reads (${maxArchiveJsonBytes / 1024 ** 3} GiB)`, where);
      throw new InputError(`expands beyond its declared size (${declared} bytes): it is not an archive this program wrote`, where);
    }
    throw new InputError('is not a Rampwright session archive (not gzip-compressed, or cut short)', where);
  }
  if (text.length !== declared) throw new InputError(`expands to ${text.length} bytes, not the ${declared} its header declares: it is damaged`, where);
  return text;
}

export interface ArchiveSigner {
  fingerprint: string;
}

/** Reads and checks an archive completely; throws InputError naming what is wrong. */
export function decodeSessionArchive(bytes: Uint8Array, where: string): { archive: SessionArchive; captureData: Buffer[]; signer: ArchiveSigner | null } {
  const text = gunzipDeclared(bytes, where).toString('utf8');
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
  const signer = checkSignature(archive, where);
  // The meaning, with the logbook's own rules: a hash recomputed over a broken design or readings passes the
  // checks above, and would break every view of the session once imported.
  const { problems } = archiveContentProblems(archive.session);
  if (problems.length > 0) throw new InputError(`the archive's session is not sound, so nothing was imported: ${problems.slice(0, 8).join('; ')}`, where);
  const declaredBytes = archive.session.captures.reduce((sum, info) => sum + info.roles.length * info.samplesPerChannel * 8, 0);
  if (declaredBytes > maxArchiveJsonBytes) throw new InputError(`its captures declare ${declaredBytes} bytes of samples, more than this program reads`, where);
  const captureData = archive.captureData.map((base64, index) => {
    const info = archive.session.captures[index];
    const data = Buffer.from(base64, 'base64');
    // Inflates no further than the capture declares, and checks the samples against their sha-256 (main/store/captureCodec.ts).
    decodeCapture({ ...info, data, where: `${where}: capture ${index + 1}` });
    return data;
  });
  return { archive, captureData, signer };
}

/** A signed archive must carry a signature that holds; the signer is named by its key's fingerprint. */
function checkSignature(archive: SessionArchive, where: string): ArchiveSigner | null {
  if (!archive.signature) return null;
  const publicKey = Buffer.from(archive.signature.publicKey, 'base64');
  const value = Buffer.from(archive.signature.value, 'base64');
  if (!signatureHolds(publicKey, Buffer.from(signedArchiveMessage(archive), 'utf8'), value)) {
    throw new InputError('the archive is signed, but the signature does not hold: it was changed after it was signed (or the signature was copied from another archive); nothing was imported', where);
  }
  return { fingerprint: keyFingerprint(publicKey) };
}

export type ImportResult = ArchiveImportResult & { signer: ArchiveSigner | null };

/**
 * An archive written before sign-offs were kept, of a session that was signed off then: its sign-off as the
 * upgraded logbook classifies it (app/exchange/legacySignOff.ts). Any other archive comes back as it is.
 */
export function withLegacySignOff(session: ArchiveSession): ArchiveSession {
  if (session.record.status !== 'closed' || session.record.signOff !== undefined) return session;
  const legacy = legacySignOffOf(session.record.stepsJson);
  if (!legacy) return session;
  const record = { ...session.record, signOff: legacy.kind };
  return {
    ...session,
    record: legacy.kind === 'signed-off' ? record : { ...record, signOffReason: legacy.reason, signOffExceptionsJson: JSON.stringify(legacy.exceptions) },
  };
}

export async function importSessionArchive(logbook: Logbook, bytes: Uint8Array, where: string, options: { signedBy?: string } = {}): Promise<ImportResult> {
  const { archive, captureData, signer } = decodeSessionArchive(bytes, where);
  if (options.signedBy !== undefined) {
    const wanted = options.signedBy.replace(/\s+/g, '').toLowerCase();
    const given = signer?.fingerprint.replace(/\s+/g, '') ?? null;
    if (given === null) throw new InputError(`the archive is not signed, and --signed-by asks for bench key ${options.signedBy}; nothing was imported`, where);
    if (given !== wanted) throw new InputError(`the archive is signed by bench key ${signer?.fingerprint}, not ${options.signedBy}; nothing was imported`, where);
  }
  // The store keeps the session as the upgraded logbook would hold it; its import rule also takes that session's
  // hash as "the same session" (archiveImport.ts), so an archive from before sign-offs were kept imports once.
  const result = await logbook.importArchiveSession({ session: withLegacySignOff(archive.session), captureData, contentSha256: archive.contentSha256, where });
  return { ...result, signer };
}
