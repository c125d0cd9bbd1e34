/**
 * The sign-off and recall exports for the bench API's export hook (exporters.ts): the commissioning record as PDF
 * or HTML, the session archive, transfer points and readings as CSV, read through the bench's logbook.
 * Registration: pass `exporters: recordExporters` to openBenchContext (benchContext.ts).
 */
import { readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { BenchFault, type ExportFormat } from '../../app/contract';
import { exportSessionFile, type ExportKind } from '../exchange/exportFiles';
import { loadOrCreateBenchKey } from '../exchange/benchKey';
import { buildSessionArchive, encodeSessionArchive } from '../exchange/sessionArchive';
import { renderRecordFile } from '../record/writeReport';
import type { ExportContext, SessionExporter } from './exporters';

const slug = (text: string) => text.replace(/[^A-Za-z0-9_-]+/g, '_');

async function unitOf(context: ExportContext, sessionId: number): Promise<string> {
  const detail = await context.logbook.session(sessionId);
  if (!detail) throw new BenchFault('not-found', `there is no session ${sessionId} in the logbook`, 'sessionId');
  return slug(detail.row.unit);
}

function recordExporter(format: 'pdf' | 'html'): SessionExporter {
  const descriptor: ExportFormat = format === 'pdf'
    ? { id: 'record-pdf', label: 'Commissioning record (PDF)', mediaType: 'application/pdf', extension: 'pdf' }
    : { id: 'record-html', label: 'Commissioning record (HTML page)', mediaType: 'text/html', extension: 'html' };
  return {
    format: descriptor,
    async write(context, sessionId) {
      const unit = await unitOf(context, sessionId);
      const bytes = await renderRecordFile(context, sessionId, format);
      return { fileName: `record-${unit}-session-${sessionId}.${format}`, bytes };
    },
  };
}

/** A CSV export through the file writer, via a temporary file (the writers stream to disk). */
function csvExporter(kind: Extract<ExportKind, 'transfer-csv' | 'readings-csv'>, label: string): SessionExporter {
  return {
    format: { id: kind, label, mediaType: 'text/csv', extension: 'csv' },
    async write(context, sessionId) {
      const unit = await unitOf(context, sessionId);
      const path = join(tmpdir(), `rampwright-${process.pid}-${Date.now()}-${kind}.csv`);
      try {
        await exportSessionFile(context, sessionId, path, kind);
        return { fileName: `${kind.replace('-csv', '')}-${unit}-session-${sessionId}.csv`, bytes: await readFile(path) };
      } finally {
        await rm(path, { force: true });
      }
    },
  };
}

export const sessionArchiveExporter: SessionExporter = {
  format: { id: 'session-archive', label: 'Session archive (for another bench)', mediaType: 'application/gzip', extension: 'rwsession' },
  async write(context, sessionId) {
    const unit = await unitOf(context, sessionId);
    // Signed with this bench's key, as `rampwright export` signs (main/exchange/benchKey.ts).
    const bytes = encodeSessionArchive(await buildSessionArchive(context.logbook, sessionId, { key: loadOrCreateBenchKey() }));
    return { fileName: `session-${unit}-${sessionId}.rwsession`, bytes };
  },
};

export const recordExporters: readonly SessionExporter[] = [
  recordExporter('pdf'),
  recordExporter('html'),
  sessionArchiveExporter,
  csvExporter('transfer-csv', 'Transfer points (CSV)'),
  csvExporter('readings-csv', 'Readings against the design (CSV)'),
];
