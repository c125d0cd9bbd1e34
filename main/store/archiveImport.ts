/**
 * The rule every store follows when an archived session arrives (app/exchange/ARCHIVE.md, import rules): a
 * session of the same unit and start whose content hash matches is the same session (nothing is written); one
 * with other content is a conflict, because a finished session never changes; otherwise the session is new.
 */
import { InputError } from '../../app/errors';
import { archiveContentHash } from './canonicalJson';
import type { ArchiveImportRequest } from './logbookTypes';

export type ImportDecision = { kind: 'present'; sessionId: number } | { kind: 'insert' };

/** `candidates`: the finished sessions of the archive's unit that started at the same instant, with their hashes. */
export function decideImport(request: ArchiveImportRequest, candidates: ReadonlyArray<{ sessionId: number; contentSha256: string }>): ImportDecision {
  // The archive's own hash, or that of its session as this logbook keeps it: an archive written before sign-offs
  // were kept arrives classified (sessionArchive.ts withLegacySignOff), as the upgraded logbook holds the same session.
  const sameContent = new Set([request.contentSha256, archiveContentHash(request.session)]);
  const same = candidates.find((candidate) => sameContent.has(candidate.contentSha256));
  if (same) return { kind: 'present', sessionId: same.sessionId };
  if (candidates.length > 0) {
    const { serial } = request.session.unit;
    const started = new Date(request.session.record.startedAtMs).toISOString();
    throw new InputError(`this logbook already has a different session of unit ${serial} started at ${started} (session ${candidates[0].sessionId}); nothing was imported`, request.where);
  }
  return { kind: 'insert' };
}
