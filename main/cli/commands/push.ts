/**
 * `rampwright push --db <file> --to <postgres://address> [--retry-for <seconds>] [--json]`: copies this bench's
 * finished sessions that the shared logbook does not have yet (main/share/pushSessions.ts). Idempotent: pushing
 * again changes nothing. A lost connection is retried for --retry-for seconds (default 120); what was retried is
 * reported. Exit 0: every finished session is shared; 3: the shared logbook stayed out of reach (the sessions stay in
 * this bench's logbook for the next push); 2: the shared logbook refused a session (named), or bad input.
 */
import type { Command } from 'commander';
import { InputError } from '../../../app/errors';
import { pushSessions, type PushReport } from '../../share/pushSessions';
import { isPostgresLocation, openLogbook } from '../../store/index';
import { jsonOutput } from '../jsonOutput';

interface PushCommandOptions {
  db?: string;
  to?: string;
  retryFor: string;
  json?: boolean;
}

export function pushReportLines(report: PushReport): string[] {
  const pushed = report.sessions.filter((session) => session.outcome === 'pushed');
  const already = report.sessions.filter((session) => session.outcome === 'already-shared');
  const refused = report.sessions.filter((session) => session.outcome === 'refused');
  const cycles = pushed.reduce((sum, session) => sum + session.cycles, 0);
  const lines = [`Pushed ${pushed.length} session${pushed.length === 1 ? '' : 's'} (${cycles} cycles) to ${report.target} in ${(report.elapsedMs / 1000).toFixed(1)} s.`];
  if (already.length > 0) lines.push(`Already in the shared logbook (noted, not copied again): ${already.map((session) => session.sessionId).join(', ')}.`);
  for (const retry of report.retried) {
    const what = retry.sessionId === null ? 'opening the shared logbook' : `session ${retry.sessionId}`;
    lines.push(`Retried ${what} ${retry.attempts} time${retry.attempts === 1 ? '' : 's'} after the connection was lost or refused (${retry.reasons.join('; ')}).`);
  }
  for (const session of refused) lines.push(`Refused: session ${session.sessionId}: ${session.reason}`);
  if (report.gaveUp) lines.push('The shared logbook stayed out of reach: the sessions not shared stay in this logbook for the next push.');
  lines.push(report.waiting === 0 ? 'Every finished session of this bench is shared.' : `Not yet shared: ${report.waiting} finished session${report.waiting === 1 ? '' : 's'}.`);
  return lines;
}

/**
 * Where a session-recording command (record, demo) writes and pushes: always a logbook file on this bench; given a
 * shared logbook's address as --db, the file in the data folder, pushed to that address afterwards.
 */
export function localFirst(db: string | undefined, pushTo: string | undefined, defaultPath: string): { db: string; pushTo: string | undefined } {
  if (db !== undefined && isPostgresLocation(db)) {
    if (pushTo !== undefined) throw new InputError('give this bench\'s logbook file with --db and the shared logbook with --push-to', '--db');
    process.stderr.write(`Recording into this bench's logbook ${defaultPath}, then pushing to the shared logbook.\n`);
    return { db: defaultPath, pushTo: db };
  }
  if (pushTo !== undefined && !isPostgresLocation(pushTo)) throw new InputError('give the shared logbook as a postgres:// address', '--push-to');
  return { db: db ?? defaultPath, pushTo };
}

/** Pushes right after a session, trying for a few seconds only: the session is safe in the file already. */
export async function pushAfterSession(db: string, pushTo: string): Promise<string[]> {
  const local = await openLogbook(db);
  try {
    return pushReportLines(await pushSessions(local, pushTo, () => openLogbook(pushTo), { retryForMs: 10_000 }));
  } finally {
    await local.close();
  }
}

export function registerPushCommand(program: Command): void {
  program
    .command('push')
    .description('Push this bench\'s finished sessions to the shared logbook (only those it does not have yet)')
    .requiredOption('--db <file>', 'this bench\'s logbook file')
    .requiredOption('--to <address>', 'the shared logbook: postgres://user@host:port/database (password from a password file or PGPASSWORD)')
    .option('--retry-for <seconds>', 'keep retrying a lost connection this long', '120')
    .option('--json', 'print the report as JSON')
    .action(async (options: PushCommandOptions) => {
      const db = options.db as string;
      const to = options.to as string;
      if (isPostgresLocation(db)) throw new InputError('push copies from a bench\'s own logbook file into the shared one: give the file with --db', '--db');
      if (!isPostgresLocation(to)) throw new InputError('give the shared logbook as a postgres:// address', '--to');
      const retryForS = Number(options.retryFor);
      if (!Number.isFinite(retryForS) || retryForS < 0) throw new InputError(`"${options.retryFor}" is not a number of seconds`, '--retry-for');
      const local = await openLogbook(db, { mustExist: true });
      let report: PushReport;
      try {
        report = await pushSessions(local, to, () => openLogbook(to), { retryForMs: retryForS * 1000 });
      } finally {
        await local.close();
      }
      process.stdout.write(options.json ? jsonOutput(report) : `${pushReportLines(report).join('\n')}\n`);
      if (report.sessions.some((session) => session.outcome === 'refused')) process.exitCode = 2;
      else if (report.gaveUp) process.exitCode = 3;
    });
}
