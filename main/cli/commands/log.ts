/**
 * `rampwright log [--db <file|address>] [--unit <serial>] [--json]`: the sessions in a logbook, oldest first, with
 * the bench that recorded each one (a shared logbook holds several benches' sessions) and, in a bench's own logbook
 * that pushes to a shared one, which sessions are shared. Times are stored in UTC and shown in local time with the
 * offset; --json gives them in UTC (ISO 8601). The logbook is opened read-only (a read-only file or a full disk can
 * be listed); a session whose recorder is gone shows as interrupted. Without --db, the logbook in the user's data folder.
 */
import type { Command } from 'commander';
import { homedir } from 'node:os';
import { join } from 'node:path';
import { outcomeWords } from '../../../app/contract/records';
import { localTimeText } from '../../../app/record/localTime';
import { defaultLogbookFileName, userDataFolder } from '../../session/dataFolder';
import type { SessionRow } from '../../store/logbookTypes';
import { openLogbook } from '../../store/openLogbook';
import { jsonOutput } from '../jsonOutput';

interface LogCommandOptions {
  db?: string;
  unit?: string;
  design?: string;
  from?: string;
  to?: string;
  json?: boolean;
}

export function defaultLogbookPath(): string {
  return join(userDataFolder({ platform: process.platform, env: process.env, home: homedir() }), defaultLogbookFileName);
}

/** The work of the command without printing. */
export async function listLogbook(path: string, filter: { unit?: string; design?: string; from?: string; to?: string } = {}): Promise<{ sessions: SessionRow[] }> {
  const logbook = await openLogbook(path, { mustExist: true, readOnly: true });
  try {
    const sessions = await logbook.listSessions({ unitSerial: filter.unit, designName: filter.design, from: filter.from, to: filter.to });
    return { sessions };
  } finally {
    await logbook.close();
  }
}

const number = (value: number | null, digits: number): string => (value === null ? '-' : value.toFixed(digits));

/** Whether a session went to the shared logbook: its push time, "not yet" when finished but unshared. */
const sharedText = (row: SessionRow, timeZone?: string): string => (row.sharedAt !== null ? localTimeText(row.sharedAt, timeZone) : row.status === 'open' ? '-' : 'not yet');

export function formatLogbookTable(sessions: SessionRow[], options: { timeZone?: string } = {}): string {
  if (sessions.length === 0) return 'No sessions.\n';
  const { timeZone } = options;
  // The shared column only in a bench's logbook that has pushed (a shared logbook's own rows are never "shared").
  const pushes = sessions.some((row) => row.sharedAt !== null);
  // Figures as recorded at the steps (the board as signed for); a count of cycles, judged by nothing.
  const header = ['session', 'unit', 'bench', 'outcome', 'started', 'ended', ...(pushes ? ['shared'] : []), 'cycles', 'ramp peak V (recorded)', 'alpha deg (recorded range)', 'link errors', 'link silent s'];
  const range = (row: SessionRow) => (row.alphaMinDeg === null && row.alphaMaxDeg === null ? '-' : `${number(row.alphaMinDeg, 1)} to ${number(row.alphaMaxDeg, 1)}`);
  const rows = sessions.map((row) => [
    String(row.id), row.unit, row.bench ?? '-', outcomeWords[row.outcome].phrase, localTimeText(row.startedAt, timeZone), localTimeText(row.endedAt, timeZone), ...(pushes ? [sharedText(row, timeZone)] : []),
    String(row.cycles), number(row.rampPeakV, 3), range(row), String(row.linkErrors), row.linkSilentS > 0 ? row.linkSilentS.toFixed(1) : '-',
  ]);
  const firstNumber = header.indexOf('cycles');
  const widths = header.map((title, column) => Math.max(title.length, ...rows.map((row) => row[column].length)));
  const line = (cells: string[]): string => cells.map((cell, column) => (column >= firstNumber ? cell.padStart(widths[column]) : cell.padEnd(widths[column]))).join('  ').trimEnd();
  return `${[line(header), ...rows.map(line)].join('\n')}\n`;
}

export function registerLogCommand(program: Command): void {
  program
    .command('log')
    .description('List the sessions in a logbook')
    .option('--db <file|address>', 'logbook file, or a shared logbook\'s postgres:// address (default: the logbook in your data folder)')
    .option('--unit <serial>', 'only this unit')
    .option('--design <name>', 'only sessions of this board design')
    .option('--from <date>', 'only sessions started on or after this date (ISO 8601)')
    .option('--to <date>', 'only sessions started before this date (ISO 8601)')
    .option('--json', 'print JSON: { "sessions": [ ... ] }')
    .action(async (options: LogCommandOptions) => {
      const path = options.db ?? defaultLogbookPath();
      const listing = await listLogbook(path, options);
      process.stdout.write(options.json ? jsonOutput(listing) : formatLogbookTable(listing.sessions));
    });
}
