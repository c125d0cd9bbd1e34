/**
 * The export hook: formats are registered by whoever writes them (the commissioning record, CSV and COMTRADE
 * exports of the sign-off and recall work); the service lists them and runs the one asked for. One format ships
 * here, the session as JSON, so the path from the Logbook screen to a file works from the start.
 */
import { BenchFault, type ExportFormat } from '../../app/contract';
import type { Logbook } from '../store/logbookTypes';
import type { DesignCatalog } from './designCatalog';
import { sessionDetailView } from './logbookViews';

export interface ExportContext {
  logbook: Logbook;
  designs: DesignCatalog;
}

export interface SessionExporter {
  format: ExportFormat;
  write(context: ExportContext, sessionId: number): Promise<{ fileName: string; bytes: Uint8Array; savedPath?: string | null }>;
}

export const sessionJsonExporter: SessionExporter = {
  format: { id: 'session-json', label: 'Session as JSON', mediaType: 'application/json', extension: 'json' },
  async write(context, sessionId) {
    const detail = await sessionDetailView(context.logbook, context.designs, sessionId);
    const text = `${JSON.stringify(detail, null, 2)}\n`;
    return { fileName: `session-${sessionId}-${detail.row.unit.replace(/[^A-Za-z0-9_-]+/g, '_')}.json`, bytes: new TextEncoder().encode(text) };
  },
};

export async function exportSessionWith(exporters: readonly SessionExporter[], context: ExportContext, sessionId: number, formatId: string) {
  const exporter = exporters.find((candidate) => candidate.format.id === formatId);
  if (!exporter) {
    const known = exporters.map((candidate) => candidate.format.id).join(', ') || 'none yet';
    throw new BenchFault('not-available', `no export format "${formatId}" on this bench (available: ${known})`, 'format');
  }
  const file = await exporter.write(context, sessionId);
  return { fileName: file.fileName, mediaType: exporter.format.mediaType, contentBase64: Buffer.from(file.bytes).toString('base64'), savedPath: file.savedPath ?? null };
}
