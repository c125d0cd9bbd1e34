/** The sign-off exports through the bench API's export hook (main/session/exporters.ts), as the Logbook screen calls them. */
import { gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BenchFault } from '../../../app/contract';
import { openRecordSources, type OpenedRecordSources } from '../../../main/record/openRecordSources';
import { createDesignCatalog } from '../../../main/session/designCatalog';
import { exportSessionWith, sessionJsonExporter } from '../../../main/session/exporters';
import { recordExporters } from '../../../main/session/recordExporters';
import { recordSweepSession } from './recordFixture';
import { tempFolder, type TempFolder } from '../store/storeFixtures';

let folder: TempFolder;
let sources: OpenedRecordSources;
let sessionId = 0;

beforeAll(async () => {
  folder = tempFolder('rampwright-exporters-');
  sources = await openRecordSources(folder.file('logbook.sqlite'), { create: true });
  sessionId = (await recordSweepSession(sources.logbook, { seconds: 0.6 })).sessionId;
}, 60_000);

afterAll(async () => {
  await sources.close();
  folder.remove();
});

describe('record exporters on the export hook', () => {
  const context = () => ({ logbook: sources.logbook, designs: createDesignCatalog({ logbook: sources.logbook, exampleFolders: [], saveFolder: null }) });
  const all = () => [sessionJsonExporter, ...recordExporters];

  it('lists distinct format ids', () => {
    const ids = all().map((exporter) => exporter.format.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(ids).toEqual(expect.arrayContaining(['record-pdf', 'record-html', 'session-archive', 'transfer-csv', 'readings-csv']));
  });

  it('writes the record as PDF and HTML, the archive and the CSVs, each named after the unit and session', async () => {
    const pdf = await exportSessionWith(all(), context(), sessionId, 'record-pdf');
    expect(Buffer.from(pdf.contentBase64, 'base64').subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(pdf.fileName).toBe(`record-RW-7731-session-${sessionId}.pdf`);
    const html = Buffer.from((await exportSessionWith(all(), context(), sessionId, 'record-html')).contentBase64, 'base64').toString('utf8');
    expect(html).toContain('Commissioning record');
    const archive = JSON.parse(gunzipSync(Buffer.from((await exportSessionWith(all(), context(), sessionId, 'session-archive')).contentBase64, 'base64')).toString('utf8'));
    expect(archive.session.unit.serial).toBe('RW-7731');
    const transfer = Buffer.from((await exportSessionWith(all(), context(), sessionId, 'transfer-csv')).contentBase64, 'base64').toString('utf8');
    expect(transfer.split('\n')[0]).toBe('t_s,control_v,alpha_deg');
    expect(transfer.trim().split('\n').length - 1).toBe((await sources.logbook.transferCurve(sessionId)).length);
  });

  it('a session that is not there is an expected fault, not a bug', async () => {
    await expect(exportSessionWith(all(), context(), 999, 'record-pdf')).rejects.toBeInstanceOf(BenchFault);
  });
});
