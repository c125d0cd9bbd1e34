/**
 * `rampwright record --port <path> --db <file> --unit <serial> --design <file> [--seconds N]`: a headless session.
 * Logger lines (main/serial) -> decoder (app/logger) -> analysis (app/bench) -> logbook (main/store), with a progress
 * line on stderr. Ctrl-C (SIGINT) or the end of --seconds closes the session cleanly: what is queued is analysed and
 * written, the session gets its summary and status 'closed'. A killed recorder leaves it 'interrupted' (at most the
 * last batch lost). The reader never waits on the disk: the logbook writer only queues (main/store/logbookWriter.ts).
 */
import type { Command } from 'commander';
import { createCaptureAnalyzer } from '../../../app/bench/captureAnalyzer';
import type { CaptureReadings } from '../../../app/bench/readings';
import { InputError } from '../../../app/errors';
import { createLoggerDecoder, encodeCommand, linkErrorCount, type LinkHealth, type LinkProblemCode } from '../../../app/logger';
import { loadBoardDesign } from '../../board/loadBoardDesign';
import { openLoggerLink, type LinkEvent } from '../../serial/loggerLink';
import type { LinkEventKind, LogbookWriter, SessionRow } from '../../store/logbookTypes';
import { openLogbook } from '../../store/openLogbook';

export interface RecordOptions {
  port: string;
  db: string;
  unit: string;
  designPath: string;
  seconds?: number;
  operator?: string;
  /** Stops the recording (Ctrl-C). */
  signal?: AbortSignal;
  onProgress?: (progress: RecordProgress) => void;
  progressIntervalMs?: number;
}

export interface RecordProgress {
  seconds: number;
  cycles: number;
  alphaDeg: number | null;
  rampPeakV: number | null;
  linkErrors: number;
  linkOpen: boolean;
  linesDropped: number;
}

export interface RecordResult {
  session: SessionRow;
  readings: CaptureReadings;
  decoder: LinkHealth;
}

/** Decoder problems go to the logbook as counted rows, one per kind per progress tick (a CRC storm is one row). */
const problemKinds: Partial<Record<LinkProblemCode, LinkEventKind>> = {
  crc: 'crc-failures',
  'sequence-gap': 'sequence-gap',
  garbage: 'garbage',
  'logger-overrun': 'logger-overrun',
};

function linkEventRow(event: LinkEvent): { kind: LinkEventKind; detail: string; count: number } | null {
  switch (event.kind) {
    case 'opened':
    case 'closed':
      return { kind: event.kind, detail: event.path, count: 1 };
    case 'reopened':
      return { kind: 'reopened', detail: event.path, count: 1 };
    case 'unplugged':
      return { kind: 'unplugged', detail: `${event.path}: ${event.detail}`, count: 1 };
    case 'watchdog-timeout':
      return { kind: 'watchdog-timeout', detail: `${event.path}: silent for ${event.silentMs} ms`, count: 1 };
    case 'error':
      return { kind: 'link-error', detail: `${event.path}: ${event.message}`, count: 1 };
    case 'line-too-long':
      return { kind: 'line-too-long', detail: `${event.bytes} bytes, cut at ${event.keptBytes}`, count: 1 };
    case 'lines-dropped':
      return { kind: 'lines-dropped', detail: 'the recorder fell behind', count: event.count };
  }
}

export async function recordSession(options: RecordOptions): Promise<RecordResult> {
  if (options.seconds !== undefined && !(options.seconds > 0)) throw new InputError(`must be a number of seconds above 0 (got ${options.seconds})`, '--seconds');
  const design = await loadBoardDesign(options.designPath);
  const logbook = await openLogbook(options.db);
  let writer: LogbookWriter | null = null;
  try {
    const link = await openLoggerLink({ path: options.port, reopen: true });
    writer = await logbook.startSession({ unitSerial: options.unit, design, operator: options.operator ?? 'record' });
    const session = writer;
    const decoder = createLoggerDecoder();
    const analyzer = createCaptureAnalyzer({ rectifier: design.rectifier, syncPhaseDeg: design.syncPhaseDeg, keepPerCycle: false });
    const startedMs = Date.now();
    let cycles = 0;
    let lastAlphaDeg: number | null = null;
    let lastRampPeakV: number | null = null;
    let linkProblems = 0;
    const problemCounts = new Map<LinkProblemCode, { count: number; message: string }>();

    const flushProblems = (): void => {
      for (const [code, { count, message }] of problemCounts) session.addLinkEvent(problemKinds[code] ?? 'decoder-problem', `${code}: ${message}`, count);
      problemCounts.clear();
    };
    const progress = (): void => {
      flushProblems();
      const stats = link.stats();
      options.onProgress?.({
        seconds: (Date.now() - startedMs) / 1000, cycles, alphaDeg: lastAlphaDeg, rampPeakV: lastRampPeakV,
        linkErrors: linkErrorCount(decoder.health()) + linkProblems, linkOpen: stats.open, linesDropped: stats.linesDropped,
      });
    };
    const ticker = setInterval(progress, options.progressIntervalMs ?? 500);
    const stop = (): void => void link.close();
    const timer = options.seconds !== undefined ? setTimeout(stop, options.seconds * 1000) : null;
    options.signal?.addEventListener('abort', stop, { once: true });
    if (options.signal?.aborted) stop();
    // Ask the logger to stream: it answers with its greeting, which the decoder needs before any data line (the port
    // may have opened after the power-up greeting went by). After a reopen, `identify` brings the greeting back
    // without restarting the stream (PROTOCOL.md).
    await link.write(encodeCommand({ command: 'start' })).catch(() => undefined);

    try {
      for await (const item of link) {
        if (item.kind !== 'line') {
          const row = linkEventRow(item);
          if (row) session.addLinkEvent(row.kind, row.detail, row.count);
          if (item.kind === 'reopened') void link.write(encodeCommand({ command: 'identify' })).catch(() => undefined);
          if (item.kind !== 'opened' && item.kind !== 'closed' && item.kind !== 'reopened') linkProblems += item.kind === 'lines-dropped' ? item.count : 1;
          continue;
        }
        for (const event of decoder.pushLine(item.text)) {
          if (event.kind === 'problem') {
            const entry = problemCounts.get(event.problem.code) ?? { count: 0, message: event.problem.message };
            entry.count += 1;
            problemCounts.set(event.problem.code, entry);
          } else if (event.kind === 'block') {
            for (const reading of analyzer.push(event.block)) {
              session.addCycle(reading);
              cycles += 1;
              if (reading.alphaDeg !== null) lastAlphaDeg = reading.alphaDeg;
              if (reading.rampPeakV !== null) lastRampPeakV = reading.rampPeakV;
              if (reading.alphaDeg !== null && reading.controlV !== null) session.addTransferPoint({ t: reading.t, controlV: reading.controlV, alphaDeg: reading.alphaDeg });
            }
          }
        }
      }
    } finally {
      clearInterval(ticker);
      if (timer) clearTimeout(timer);
      options.signal?.removeEventListener('abort', stop);
      await link.close();
    }
    progress();
    const readings = analyzer.finish();
    session.setReadings(readings);
    const row = await session.close('closed');
    writer = null;
    return { session: row, readings, decoder: decoder.health() };
  } finally {
    // A failure after the session opened still ends it (interrupted) rather than leaving it open.
    if (writer) await writer.close('interrupted').catch(() => undefined);
    await logbook.close();
  }
}

const fixed = (value: number | null, digits: number): string => (value === null ? '-' : value.toFixed(digits));

export function formatProgress(progress: RecordProgress): string {
  const link = progress.linkOpen ? (progress.linkErrors === 0 ? 'link ok' : `link ${progress.linkErrors} errors`) : 'link LOST, waiting for the logger';
  const dropped = progress.linesDropped > 0 ? `, ${progress.linesDropped} lines dropped` : '';
  return `${progress.seconds.toFixed(0)} s  cycles ${progress.cycles}  alpha ${fixed(progress.alphaDeg, 1)} deg  ramp peak ${fixed(progress.rampPeakV, 3)} V  ${link}${dropped}`;
}

function secondsOption(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text);
  if (text.trim() === '' || !Number.isFinite(value) || value <= 0) throw new InputError(`must be a number of seconds above 0 (got "${text}")`, '--seconds');
  return value;
}

export function registerRecordCommand(program: Command): void {
  program
    .command('record')
    .description('Record a session from the data logger into a logbook (Ctrl-C ends it cleanly)')
    .requiredOption('--port <path>', 'serial device of the logger, e.g. /dev/ttyACM0 or COM3')
    .requiredOption('--db <file>', 'logbook file (created if missing)')
    .requiredOption('--unit <serial>', 'serial number of the unit on the bench')
    .requiredOption('--design <file>', 'board design file (*.board.json)')
    .option('--seconds <n>', 'stop after this many seconds')
    .option('--operator <name>', 'who is at the bench', 'record')
    .action(async (options: { port: string; db: string; unit: string; design: string; seconds?: string; operator: string }) => {
      const controller = new AbortController();
      const onInterrupt = (): void => controller.abort();
      process.once('SIGINT', onInterrupt);
      const interactive = process.stderr.isTTY === true;
      let lastPrintMs = 0;
      try {
        const result = await recordSession({
          port: options.port, db: options.db, unit: options.unit, designPath: options.design, seconds: secondsOption(options.seconds), operator: options.operator,
          signal: controller.signal,
          onProgress: (progress) => {
            // On a terminal the line is rewritten in place; in a log file, one line every 5 s.
            if (interactive) process.stderr.write(`\r${formatProgress(progress)}\u001b[K`);
            else if (Date.now() - lastPrintMs >= 5000) process.stderr.write(`${formatProgress(progress)}\n`);
            else return;
            lastPrintMs = Date.now();
          },
        });
        if (interactive) process.stderr.write('\n');
        const row = result.session;
        process.stdout.write(
          `Session ${row.id} of unit ${row.unit} ${row.status}: ${row.cycles} cycles, alpha ${fixed(row.alphaDeg, 1)} deg, ramp peak ${fixed(row.rampPeakV, 3)} V, ${row.linkErrors} link errors. Logbook: ${options.db}\n`,
        );
      } finally {
        process.removeListener('SIGINT', onInterrupt);
      }
    });
}
