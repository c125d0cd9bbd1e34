/**
 * One bench of the four-bench test (fourBenches.test.ts), as its own process: it commissions units on its virtual
 * board into its own SQLite logbook while its background pusher shares finished sessions with the shared logbook;
 * when it has recorded them all it says so and waits for `push` on standard input, then pushes whatever is left,
 * retrying while the server is away, and prints the report. Lines on stdout: `recorded <id> <cycles> <startedAt>`,
 * `recorded-all`, `background <json>`, `report <json>`. Run with tsx; not a test itself.
 */
import { createInterface } from 'node:readline';
import { pushSessions, type PushReport } from '../../../main/share/pushSessions';
import { openBenchContext } from '../../../main/session/benchContext';
import { runCommissioningDemo } from '../../../main/session/commissioningDemo';
import { openLogbook } from '../../../main/store/openLogbook';

interface BenchChildConfig {
  logbook: string;
  pushTo: string;
  bench: string;
  sessions: number;
  unitPrefix: string;
  /** Idle time between units (the technician swaps boards): the virtual board runs flat out and leaves none. */
  swapMs: number;
}

async function main(): Promise<void> {
  const config = JSON.parse(process.argv[2]) as BenchChildConfig;
  const background: PushReport[] = [];
  const context = await openBenchContext({ logbookPath: config.logbook, virtualPaced: false, bench: config.bench, pushTo: config.pushTo, pushIntervalMs: 250, onPushReport: (report) => background.push(report) });
  try {
    for (let index = 1; index <= config.sessions; index += 1) {
      const report = await runCommissioningDemo(context, { unitSerial: `${config.unitPrefix}-${String(index).padStart(3, '0')}`, settleS: 1.2, sweepS: 2 });
      process.stdout.write(`recorded ${report.session.id} ${report.session.cycles} ${report.session.startedAt}\n`);
      await new Promise((resolve) => setTimeout(resolve, config.swapMs));
    }
    process.stdout.write('recorded-all\n');
    const lines = createInterface({ input: process.stdin });
    for await (const line of lines) if (line.trim() === 'push') break;
    lines.close();
    await context.sharing?.stop();
    const retried = background.flatMap((report) => report.retried);
    process.stdout.write(`background ${JSON.stringify({ pushes: background.length, pushed: background.flatMap((report) => report.sessions).length, retried })}\n`);
    const report = await pushSessions(context.logbook, config.pushTo, () => openLogbook(config.pushTo), { retryForMs: 90_000, retryDelayMs: 200 });
    process.stdout.write(`report ${JSON.stringify(report)}\n`);
  } finally {
    await context.close();
  }
}

main().catch((error: unknown) => {
  process.stderr.write(`${error instanceof Error ? error.stack : String(error)}\n`);
  process.exit(1);
});
