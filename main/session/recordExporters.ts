/**
 * The sign-off and recall exports for the bench API's export hook (exporters.ts): the commissioning record as PDF
 * or HTML, the session archive, transfer points and readings as CSV. Each export opens its own connection to the
 * logbook file (WAL lets it read beside the session writer) for the queries the Logbook interface does not carry.
 * Registration: pass `exporters: recordExporters` to openBenchContext (benchContext.ts).
 */
import { readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { BenchFault, type ExportFormat } from '../../app/contract';
import { exportSessionFile, type ExportKind } from '../exchange/exportFiles';
import { buildSessionArchive, encodeSessionArchive } from '../exchange/sessionArchive';
import type { RecordSources } from '../record/buildRecord';
import { renderRecordFile } from '../record/writeReport';
import { openLogbookDatabase } from '../store/openDatabase';
import type { ExportContext, SessionExporter } from './exporters';

export async function withSources<T>(context: ExportContext, work: (sources: RecordSources) => Promise<T>): Promise<T> {
  const db = openLogbookDatabase(context.logbook.location);
  // InputErrors (nothing to export, an unwritable file) reach the screen as expected faults via toBenchError.
  try {
    return await work({ logbook: context.logbook, db });
  } finally {
    db.close();
  }
}

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
      const bytes = await withSources(context, (sources) => renderRecordFile(sources, sessionId, format));
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
        await withSources(context, (sources) => exportSessionFile(sources, sessionId, path, kind));
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
    const bytes = await withSources(context, async (sources) => encodeSessionArchive(buildSessionArchive(sources.db, sessionId)));
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
