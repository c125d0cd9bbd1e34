/**
 * Exports of a session from the logbook to files: its stored captures as CSV or COMTRADE (IEEE C37.111, written by
 * main/capture/writeCaptureFile.ts), its transfer points and its readings (judged against the design version it
 * used) as CSV, and the whole session as an archive (sessionArchive.ts).
 */
import { writeWholeFile } from '../files/writeWholeFile';
import { basename, dirname, extname, join } from 'node:path';
import { judgeReadings } from '../../app/bench/judge';
import { parseStoredDesign } from '../store/storedContent';
import { InputError } from '../../app/errors';
import { parseStepReports } from '../../app/contract/readings';
import { readingsCsv, stepReadingsCsv, transferPointsCsv } from '../../app/exchange/recordCsv';
import { writeCaptureFile, type CaptureWriteFormat } from '../capture/writeCaptureFile';
import type { RecordSources } from '../record/buildRecord';
import type { BenchKey } from './benchKey';
import { buildSessionArchive, encodeSessionArchive } from './sessionArchive';

export const exportKinds = ['archive', 'captures-csv', 'captures-comtrade', 'captures-comtrade-ascii', 'transfer-csv', 'readings-csv'] as const;
export type ExportKind = (typeof exportKinds)[number];

async function sessionDetail(sources: RecordSources, sessionId: number) {
  const detail = await sources.logbook.session(sessionId);
  if (!detail) throw new InputError(`there is no session ${sessionId} in this logbook`, sources.logbook.location);
  return detail;
}

/** Each stored capture to its own file: `<out>` for one capture, `<name>-1<ext>`, `<name>-2<ext>`... for several. */
export async function exportCaptures(sources: RecordSources, sessionId: number, outPath: string, format: CaptureWriteFormat): Promise<string[]> {
  const detail = await sessionDetail(sources, sessionId);
  if (detail.captures.length === 0) throw new InputError(`session ${sessionId} kept no capture to export`, outPath);
  const design = parseStoredDesign((await sources.logbook.designVersion(detail.designId)).designJson, `${sources.logbook.location}: session ${sessionId}`);
  const extension = extname(outPath);
  const stem = join(dirname(outPath), basename(outPath, extension));
  const written: string[] = [];
  for (const [index, info] of detail.captures.entries()) {
    const stored = await sources.logbook.readCapture(info.id);
    if (!stored) continue;
    const path = detail.captures.length === 1 ? outPath : `${stem}-${index + 1}${extension}`;
    const result = await writeCaptureFile(path, [stored.block], {
      format,
      stationName: `${detail.row.unit} session ${sessionId}`,
      lineFrequencyHz: design.mainsHz,
      recordedAt: new Date(info.startedAt),
    });
    written.push(...result.paths);
  }
  return written;
}

/** `key`: the bench key an archive is signed with (null: unsigned). Other kinds ignore it. */
export async function exportSessionFile(sources: RecordSources, sessionId: number, outPath: string, kind: ExportKind, options: { key?: BenchKey | null } = {}): Promise<string[]> {
  switch (kind) {
    case 'archive':
      await writeWholeFile(outPath, encodeSessionArchive(await buildSessionArchive(sources.logbook, sessionId, { key: options.key ?? null })));
      return [outPath];
    case 'captures-csv':
      return exportCaptures(sources, sessionId, outPath, 'csv');
    case 'captures-comtrade':
      return exportCaptures(sources, sessionId, outPath, 'comtrade-binary');
    case 'captures-comtrade-ascii':
      return exportCaptures(sources, sessionId, outPath, 'comtrade-ascii');
    case 'transfer-csv': {
      const detail = await sessionDetail(sources, sessionId);
      await writeWholeFile(outPath, transferPointsCsv(detail.transfer.points));
      return [outPath];
    }
    case 'readings-csv': {
      // As recorded at each step; a session from before steps were kept: its stored readings judged against the
      // design version it used.
      const detail = await sessionDetail(sources, sessionId);
      const recorded = parseStepReports(detail.stepsJson);
      if (recorded !== null && recorded.length > 0) {
        await writeWholeFile(outPath, stepReadingsCsv(recorded));
        return [outPath];
      }
      if (!detail.readings) throw new InputError(`session ${sessionId} has no stored readings to export`, outPath);
      const design = parseStoredDesign((await sources.logbook.designVersion(detail.designId)).designJson, `${sources.logbook.location}: session ${sessionId}`);
      await writeWholeFile(outPath, readingsCsv(judgeReadings(detail.readings, design)));
      return [outPath];
    }
  }
}
