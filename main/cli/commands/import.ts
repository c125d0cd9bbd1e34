/**
 * `rampwright import --db <file> <archive>`: a session archive from another bench into this logbook. Idempotent:
 * a session already here (same content hash) is left as it is; a damaged archive changes nothing.
 */
import type { Command } from 'commander';
import { readFile } from 'node:fs/promises';
import { InputError } from '../../../app/errors';
import { importSessionArchive } from '../../exchange/sessionArchive';
import { openRecordSources } from '../../record/openRecordSources';

export function registerImportCommand(program: Command): void {
  program
    .command('import')
    .description('Import a session archive (from rampwright export) into a logbook; importing it again changes nothing')
    .argument('<archive>', 'archive file')
    .option('--db <file|address>', 'logbook file (created when missing), or a shared logbook\'s postgres:// address')
    .option('--signed-by <fingerprint>', 'import only an archive signed by this bench key (the fingerprint the exporting bench printed)')
    .action(async (archivePath: string, options: { db?: string; signedBy?: string }) => {
      if (!options.db) throw new InputError('give the logbook with --db <file>', '--db');
      let bytes: Buffer;
      try {
        bytes = await readFile(archivePath);
      } catch {
        throw new InputError('cannot read the archive', archivePath);
      }
      const sources = await openRecordSources(options.db, { create: true });
      try {
        const result = await importSessionArchive(sources.logbook, bytes, archivePath, { signedBy: options.signedBy });
        process.stdout.write(
          result.imported
            ? `Imported as session ${result.sessionId} (content sha-256 ${result.contentSha256})\n`
            : `Already in this logbook as session ${result.sessionId} (content sha-256 ${result.contentSha256}); nothing changed\n`,
        );
        process.stdout.write(
          result.signer
            ? `Signed by bench key ${result.signer.fingerprint}: the holder of that key exported exactly this content (compare the fingerprint with the one the exporting bench printed)\n`
            : 'Not signed: the content is intact (its sha-256 holds), but nothing says which bench exported it\n',
        );
      } finally {
        await sources.close();
      }
    });
}
