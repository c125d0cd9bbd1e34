/**
 * `rampwright report --db <file> --session <id> --out <file.pdf|.html>`: the commissioning record of a session.
 * `rampwright report --db <file> [--session <id>] --verify <record>`: recomputes the capture digest from the
 * logbook's samples and says whether the record matches (exit 2 when it does not).
 * Recall pages (HTML): `--compare <a>,<b>` two sessions side by side, `--unit <serial>` a unit's drift with the trend
 * warning, `--design <name>` the fleet of a board design against the Monte Carlo prediction (with `--unit`, that unit
 * marked on the fleet).
 */
import type { Command } from 'commander';
import { InputError } from '../../../app/errors';
import { openRecordSources, type OpenedRecordSources } from '../../record/openRecordSources';
import { compareReport, driftReport, fleetReport } from '../../record/recall';
import { comparisonPage, driftPage, fleetPage } from '../../record/recallPages';
import { writeWholeFile } from '../../files/writeWholeFile';
import { verifyRecordFile, writeRecordFile } from '../../record/writeReport';

interface ReportOptions {
  db?: string;
  session?: string;
  out?: string;
  verify?: string;
  compare?: string;
  unit?: string;
  design?: string;
}

async function writeRecallPage(options: ReportOptions, sources: OpenedRecordSources): Promise<boolean> {
  const chosen = [options.compare, options.unit, options.design].filter((value) => value !== undefined).length;
  if (chosen === 0) return false;
  // --design with --unit: that unit against its design's fleet; otherwise one page kind at a time.
  const unitInFleet = options.design !== undefined && options.unit !== undefined && options.compare === undefined;
  if (chosen > 1 && !unitInFleet) throw new InputError('give one of --compare, --unit or --design (or --design with --unit)', '--compare');
  if (!options.out || !/\.html?$/i.test(options.out)) throw new InputError('recall pages are HTML: give --out <file.html>', '--out');
  let html: string;
  if (options.compare !== undefined) {
    const ids = options.compare.split(',').map((part) => parseSessionId(part.trim(), true) as number);
    if (ids.length !== 2) throw new InputError(`"${options.compare}" is not two sessions: use --compare <a>,<b>`, '--compare');
    html = comparisonPage(await compareReport(sources, ids[0], ids[1]));
  } else if (options.design !== undefined) html = fleetPage(await fleetReport(sources, options.design, { unitSerial: options.unit }));
  else html = driftPage(await driftReport(sources, options.unit as string));
  await writeWholeFile(options.out, new TextEncoder().encode(html));
  process.stdout.write(`Wrote ${options.out}\n`);
  return true;
}

export function parseSessionId(text: string | undefined, required: boolean): number | undefined {
  if (text === undefined) {
    if (required) throw new InputError('give the session with --session <id> (rampwright log lists them)', '--session');
    return undefined;
  }
  if (!/^\d+$/.test(text.trim()) || Number(text) < 1) throw new InputError(`"${text}" is not a session number`, '--session');
  return Number(text);
}

export function registerReportCommand(program: Command): void {
  program
    .command('report')
    .description('Write the commissioning record of a session (PDF or HTML), or check a record against the logbook')
    .option('--db <file|address>', 'logbook file, or a shared logbook\'s postgres:// address')
    .option('--session <id>', 'session number (rampwright log lists them)')
    .option('--out <file>', 'record to write: .pdf or .html')
    .option('--verify <record>', 'a record file to check against the logbook\'s captures')
    .option('--compare <a,b>', 'recall page: two sessions side by side (HTML)')
    .option('--unit <serial>', 'recall page: drift of a unit across its sessions (HTML)')
    .option('--design <name>', 'recall page: the fleet of a board design (HTML)')
    .action(async (options: ReportOptions) => {
      if (!options.db) throw new InputError('give the logbook with --db <file>', '--db');
      if (options.compare !== undefined || options.unit !== undefined || options.design !== undefined) {
        const sources = await openRecordSources(options.db);
        try {
          await writeRecallPage(options, sources);
        } finally {
          await sources.close();
        }
        return;
      }
      if (!options.out && !options.verify) throw new InputError('give --out <file.pdf|.html> to write a record, or --verify <record> to check one', '--out');
      const sources = await openRecordSources(options.db);
      try {
        if (options.verify) {
          const result = await verifyRecordFile(sources, options.verify, parseSessionId(options.session, false));
          process.stdout.write(
            result.matches
              ? `Record matches the logbook: session ${result.sessionId}, capture digest ${result.recomputed ?? 'none (no captures)'}\n`
              : `Record does NOT match the logbook for session ${result.sessionId}:\n  record says   ${result.stated ?? 'none'}\n  logbook gives ${result.recomputed ?? 'none'}\n`,
          );
          if (!result.matches) process.exitCode = 2;
        }
        if (options.out) {
          const written = await writeRecordFile(sources, parseSessionId(options.session, true) as number, options.out);
          process.stdout.write(`Wrote ${written.path} (${written.bytes} bytes)\n`);
        }
      } finally {
        await sources.close();
      }
    });
}
