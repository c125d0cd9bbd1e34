/**
 * Writing a commissioning record to a file (.pdf or .html by its extension) and checking one against the logbook.
 * Files are written to `<name>.partial` and renamed, so a failed write never leaves half a record.
 */
import { readFile } from 'node:fs/promises';
import { extname } from 'node:path';
import { PDFDocument } from 'pdf-lib';
import { InputError } from '../../app/errors';
import { renderRecordHtml } from '../../app/record/renderRecordHtml';
import { buildRecord, recomputeCaptureDigest, type RecordSources } from './buildRecord';
import { digestKeywordPrefix, renderRecordPdf } from './renderRecordPdf';
import { writeWholeFile } from '../files/writeWholeFile';

export type RecordFormat = 'pdf' | 'html';

export function recordFormatOf(path: string): RecordFormat {
  const extension = extname(path).toLowerCase();
  if (extension === '.pdf') return 'pdf';
  if (extension === '.html' || extension === '.htm') return 'html';
  throw new InputError(`cannot tell the record format from "${extension || '(no extension)'}": use .pdf or .html`, path);
}

export async function renderRecordFile(sources: RecordSources, sessionId: number, format: RecordFormat, options: { now?: Date } = {}): Promise<Uint8Array> {
  const record = await buildRecord(sources, sessionId, options);
  return format === 'pdf' ? renderRecordPdf(record) : new TextEncoder().encode(renderRecordHtml(record));
}

export async function writeRecordFile(sources: RecordSources, sessionId: number, path: string, options: { now?: Date } = {}): Promise<{ path: string; bytes: number }> {
  const bytes = await renderRecordFile(sources, sessionId, recordFormatOf(path), options);
  await writeWholeFile(path, bytes);
  return { path, bytes: bytes.length };
}

/** The capture digest a record file states: the HTML meta tag, or the PDF's keywords. */
export async function readRecordDigest(path: string): Promise<{ sessionId: number | null; digest: string | null }> {
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch {
    throw new InputError('cannot read this record file', path);
  }
  if (recordFormatOf(path) === 'html') {
    const text = bytes.toString('utf8');
    const digest = /<meta name="rampwright-captures-sha256" content="([0-9a-f]*)">/.exec(text);
    const session = /<meta name="rampwright-session" content="(\d+)">/.exec(text);
    if (!digest) throw new InputError('this page is not a Rampwright commissioning record (no capture digest in it)', path);
    return { sessionId: session ? Number(session[1]) : null, digest: digest[1] === '' ? null : digest[1] };
  }
  let keywords: string;
  try {
    keywords = (await PDFDocument.load(bytes, { updateMetadata: false })).getKeywords() ?? '';
  } catch {
    throw new InputError('this file is not a readable PDF', path);
  }
  const digest = new RegExp(`${digestKeywordPrefix}([0-9a-f]{64}|none)`).exec(keywords);
  const session = /rampwright-session:(\d+)/.exec(keywords);
  if (!digest) throw new InputError('this PDF is not a Rampwright commissioning record (no capture digest in its keywords)', path);
  return { sessionId: session ? Number(session[1]) : null, digest: digest[1] === 'none' ? null : digest[1] };
}

export interface RecordVerification {
  matches: boolean;
  stated: string | null;
  recomputed: string | null;
  sessionId: number;
}

/** Recomputes the capture digest from the logbook's samples and compares it with what the record file states. */
export async function verifyRecordFile(sources: RecordSources, path: string, sessionId?: number): Promise<RecordVerification> {
  const stated = await readRecordDigest(path);
  const id = sessionId ?? stated.sessionId;
  if (id === null || id === undefined) throw new InputError('the record does not name its session: give --session', path);
  const recomputed = await recomputeCaptureDigest(sources.logbook, id);
  return { matches: recomputed === stated.digest, stated: stated.digest, recomputed, sessionId: id };
}
