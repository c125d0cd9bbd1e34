/**
 * `rampwright salvage --db <logbook> [--into <new logbook>] [--json]`: for a damaged logbook. Runs SQLite's
 * integrity check, reads every session whole to say which can still be read, and with --into copies those into a
 * new logbook (the damaged file is only read). Exit 0 when every session was readable, 2 when some were not.
 */
import type { Command } from 'commander';
import { InputError } from '../../../app/errors';
import { checkDamagedLogbook, salvageLogbook, type SalvageReport } from '../../store/salvage';
import { jsonOutput } from '../jsonOutput';

export function formatSalvageReport(report: SalvageReport, into: string | null): string {
  const readable = report.sessions.filter((session) => session.readable);
  const lines = [
    report.integrityProblems.length === 0
      ? `${report.location}: SQLite's integrity check finds nothing wrong.`
      : `${report.location}: SQLite's integrity check finds the file damaged (${report.integrityProblems.length}${report.integrityProblems.length >= 50 ? ' or more' : ''} problems), first: ${report.integrityProblems[0]}`,
    `${readable.length} of ${report.sessions.length} sessions can be read whole:`,
  ];
  for (const session of report.sessions) {
    const name = `  session ${session.id}${session.unit ? ` (unit ${session.unit}${session.startedAt ? `, ${session.startedAt.replace('T', ' ').replace(/\.\d+Z$/, 'Z')}` : ''})` : ''}`;
    if (session.readable) lines.push(`${name}: readable${session.copiedAs !== undefined ? `, copied as session ${session.copiedAs}` : ''}`);
    else lines.push(`${name}: cannot be read: ${session.problem}`);
  }
  if (into) lines.push(`The readable sessions are in ${into}; ${report.location} was left as it was.`);
  else if (readable.length > 0 && readable.length < report.sessions.length) lines.push(`Copy the readable ones to a new logbook with: rampwright salvage --db ${report.location} --into <new file>`);
  return `${lines.join('\n')}\n`;
}

export function registerSalvageCommand(program: Command): void {
  program
    .command('salvage')
    .description('Check a damaged logbook: what can still be read, and copy the readable sessions into a new logbook')
    .option('--db <file>', 'the damaged logbook (only read)')
    .option('--into <file>', 'a new logbook to copy the readable sessions into')
    .option('--json', 'print the report as JSON')
    .action(async (options: { db?: string; into?: string; json?: boolean }) => {
      if (!options.db) throw new InputError('give the logbook with --db <file>', '--db');
      const report = options.into ? await salvageLogbook(options.db, options.into) : checkDamagedLogbook(options.db);
      process.stdout.write(options.json ? jsonOutput(report) : formatSalvageReport(report, options.into ?? null));
      if (report.sessions.some((session) => !session.readable)) process.exitCode = 2;
    });
}
