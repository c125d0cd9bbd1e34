/**
 * JSON with object keys sorted at every level, so equal contents hash equal whatever order they were written in:
 * board design versions and session archives are identified by the sha-256 of this form (app/exchange/ARCHIVE.md).
 */
import { createHash } from 'node:crypto';
import type { ArchiveSession } from '../../app/exchange/archiveSchema';

export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
    entries.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

export const sha256OfText = (text: string): string => createHash('sha256').update(text).digest('hex');

/** The identity of a session: the sha-256 of the canonical JSON of its archive's `session` section. */
export function archiveContentHash(session: ArchiveSession): string {
  return sha256OfText(canonicalJson(session));
}
