/**
 * `rampwright export --db <file> --session <id> --out <file> [--format <kind>]`: a session out of the logbook.
 * Default: the whole session as a portable archive (app/exchange/ARCHIVE.md) that `rampwright import` reads on
 * another bench. Other kinds: its captures as CSV or COMTRADE, its transfer points or readings as CSV.
 */
import type { Command } from 'commander';
import { InputError } from '../../../app/errors';
import { benchKeyFileName, defaultBenchKeyPath, loadOrCreateBenchKey } from '../../exchange/benchKey';
import { exportKinds, exportSessionFile, type ExportKind } from '../../exchange/exportFiles';
import { openRecordSources } from '../../record/openRecordSources';
import { parseSessionId } from './report';

interface ExportOptions {
  db?: string;
  session?: string;
  out?: string;
  format?: string;
  key?: string;
  unsigned?: boolean;
}

export function registerExportCommand(program: Command): void {
  program
    .command('export')
    .description('Export a session: a portable archive (default), captures as CSV or COMTRADE, transfer points or readings as CSV')
    .option('--db <file|address>', 'logbook file, or a shared logbook\'s postgres:// address')
    .option('--session <id>', 'session number (rampwright log lists them)')
    .option('--out <file>', 'file to write')
    .option('--format <kind>', `what to write: ${exportKinds.join(', ')}`, 'archive')
    .option('--key <file>', `bench signing key for an archive (default: ${benchKeyFileName} in your data folder, made on first use)`)
    .option('--unsigned', 'write the archive without a signature')
    .action(async (options: ExportOptions) => {
      if (!options.db) throw new InputError('give the logbook with --db <file>', '--db');
      if (!options.out) throw new InputError('give the file to write with --out <file>', '--out');
      const kind = options.format ?? 'archive';
      if (!(exportKinds as readonly string[]).includes(kind)) throw new InputError(`"${kind}" is not an export kind (use ${exportKinds.join(', ')})`, '--format');
      const sessionId = parseSessionId(options.session, true) as number;
      const key = kind === 'archive' && !options.unsigned ? loadOrCreateBenchKey(options.key ?? defaultBenchKeyPath()) : null;
      const sources = await openRecordSources(options.db);
      try {
        const written = await exportSessionFile(sources, sessionId, options.out, kind as ExportKind, { key });
        process.stdout.write(`Wrote ${written.join(', ')}\n`);
        if (key) process.stdout.write(`Signed with this bench's key ${key.fingerprint} (compare it with what the importing bench reports)\n`);
      } finally {
        await sources.close();
      }
    });
}
