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
import { createLoggerDecoder, edgeRequestAfter, encodeCommand, type LinkHealth } from '../../../app/logger';
import { loadBoardDesign } from '../../board/loadBoardDesign';
import { openLoggerLink } from '../../serial/loggerLink';
import { createLinkAccount } from '../../session/linkAccount';
import type { LogbookWriter, SessionRow } from '../../store/logbookTypes';
import { logbookDisplayLocation, openLogbook } from '../../store/index';
import { defaultLogbookPath } from './log';
import { localFirst, pushAfterSession } from './push';

export interface RecordOptions {
  port: string;
  db: string;
  unit: string;
  designPath: string;
  seconds?: number;
  operator?: string;
  /** The bench's name on the session (default: RAMPWRIGHT_BENCH or the host name). */
  bench?: string;
  /** Stops the recording (Ctrl-C). */
  signal?: AbortSignal;
  onProgress?: (progress: RecordProgress) => void;
  /** Told at once, in words, when the logbook can no longer be written (the recording then stops). */
  onStorageFault?: (message: string) => void;
  progressIntervalMs?: number;
}

export interface RecordProgress {
  seconds: number;
  /** Cycles stored in the logbook so far (not merely analysed). */
  cycles: number;
  alphaDeg: number | null;
  rampPeakV: number | null;
  /** Link errors written to the session so far: the number the logbook and the final summary give. */
  linkErrors: number;
  linkOpen: boolean;
  linesDropped: number;
  /** Seconds of the silence still running (0 while data flows), and all silence so far. */
  silentNowS: number;
  silentS: number;
}

export interface RecordResult {
  session: SessionRow;
  readings: CaptureReadings;
  decoder: LinkHealth;
  /** Stretches of link silence (their total is the session row's `linkSilentS`). */
  silentStretches: number;
}

export async function recordSession(options: RecordOptions): Promise<RecordResult> {
  if (options.seconds !== undefined && !(options.seconds > 0)) throw new InputError(`must be a number of seconds above 0 (got ${options.seconds})`, '--seconds');
  const design = await loadBoardDesign(options.designPath);
  const logbook = await openLogbook(options.db);
  let writer: LogbookWriter | null = null;
  try {
    const link = await openLoggerLink({ path: options.port, reopen: true });
    try {
      writer = await logbook.startSession({ unitSerial: options.unit, design, operator: options.operator ?? 'record', bench: options.bench });
    } catch (error) {
      await link.close();
      throw error;
    }
    const session = writer;
    // Set when the logbook refuses writes that waiting will not cure (disk full, file read-only or damaged).
    let storageFault: { message: string } | null = null;
    const decoder = createLoggerDecoder();
    const analyzer = createCaptureAnalyzer({ rectifier: design.rectifier, syncPhaseDeg: design.syncPhaseDeg, keepPerCycle: false });
    const startedMs = Date.now();
    const account = createLinkAccount(session, startedMs);
    let lastAlphaDeg: number | null = null;
    let lastRampPeakV: number | null = null;
    // A logger already streaming when the port opens sends data before any greeting: ask for the greeting, once
    // per opening (PROTOCOL.md: `identify` brings it back without restarting the stream).
    let identifyAsked = false;
    const askIdentify = (): void => {
      identifyAsked = true;
      void link.write(encodeCommand({ command: 'identify' })).catch(() => undefined);
    };

    const stop = (): void => void link.close();
    /** Stops the recording at once when the logbook can no longer be written; true when it has. */
    const storageFailed = (): boolean => {
      if (storageFault) return true;
      const failure = session.stats().writeFailure;
      if (!failure) return false;
      storageFault = failure;
      options.onStorageFault?.(failure.message);
      stop();
      return true;
    };
    const progress = (): void => {
      account.flush();
      if (storageFailed()) return;
      const stats = link.stats();
      const nowMs = Date.now();
      const health = account.summary(nowMs);
      // Cycles stored, not cycles analysed: the line never claims what the logbook does not hold.
      options.onProgress?.({
        seconds: (nowMs - startedMs) / 1000, cycles: session.stats().cyclesWritten, alphaDeg: lastAlphaDeg, rampPeakV: lastRampPeakV,
        linkErrors: health.errors, linkOpen: stats.open, linesDropped: stats.linesDropped, silentNowS: health.silentNowS, silentS: health.silentS,
      });
    };
    const ticker = setInterval(progress, options.progressIntervalMs ?? 500);
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
          account.event(item);
          if (item.kind === 'reopened') askIdentify();
          continue;
        }
        const firstLine = account.line(item.atMs);
        const request = edgeRequestAfter(item.text);
        if (request) void link.write(request).catch(() => undefined);
        for (const event of decoder.pushLine(item.text)) {
          if (event.kind === 'problem') {
            account.problem(event.problem, firstLine);
            if (event.problem.code === 'data-before-greeting' && !identifyAsked) askIdentify();
          } else if (event.kind === 'block') {
            if (storageFailed()) break;
            for (const reading of analyzer.push(event.block)) {
              session.addCycle(reading);
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
    const endedMs = Date.now();
    account.finish(endedMs);
    if (storageFailed() && storageFault) {
      const fault: { message: string } = storageFault;
      const storedCycles = session.stats().cyclesWritten;
      const note = `Recording stopped at ${new Date(endedMs).toISOString()}: ${fault.message}. The ${storedCycles} cycles stored before were kept.`;
      const row = await session.close('interrupted', undefined, { note });
      writer = null;
      throw new InputError(
        `${fault.message}. Recording stopped after ${((endedMs - startedMs) / 1000).toFixed(1)} s; session ${row.id} keeps the ${row.cycles} cycles stored before, marked interrupted with a note of why. Free space (or make the file writable), then record again`,
      );
    }
    progress();
    const readings = analyzer.finish();
    session.setReadings(readings);
    const row = await session.close('closed');
    writer = null;
    return { session: row, readings, decoder: decoder.health(), silentStretches: account.summary(endedMs).silentStretches };
  } finally {
    // A failure after the session opened still ends it (interrupted) rather than leaving it open.
    if (writer) await writer.close('interrupted').catch(() => undefined);
    await logbook.close();
  }
}

const fixed = (value: number | null, digits: number): string => (value === null ? '-' : value.toFixed(digits));

/** `3 link errors`, `1 link error`, `no link errors`. */
export function linkErrorsText(count: number): string {
  return count === 0 ? 'no link errors' : `${count} link error${count === 1 ? '' : 's'}`;
}

/** `link silent 8.0 s in 1 stretch`, or '' for a link that never went quiet. */
export function linkSilenceText(silentS: number, stretches: number): string {
  return silentS > 0 ? `link silent ${silentS.toFixed(1)} s in ${stretches} stretch${stretches === 1 ? '' : 'es'}` : '';
}

export function formatProgress(progress: RecordProgress): string {
  const state = progress.silentNowS > 0 ? `link SILENT for ${progress.silentNowS.toFixed(0)} s, waiting for the logger` : progress.linkOpen ? 'link ok' : 'link LOST, waiting for the logger';
  const silentBefore = progress.silentS - progress.silentNowS;
  const earlier = silentBefore > 0 ? `, silent ${silentBefore.toFixed(1)} s before` : '';
  const dropped = progress.linesDropped > 0 ? `, ${progress.linesDropped} lines dropped` : '';
  return `${progress.seconds.toFixed(0)} s  cycles ${progress.cycles}  alpha ${fixed(progress.alphaDeg, 1)} deg  ramp peak ${fixed(progress.rampPeakV, 3)} V  ${state}, ${linkErrorsText(progress.linkErrors)}${earlier}${dropped}`;
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
    .requiredOption('--db <file|address>', 'this bench\'s logbook file (created if missing); given a shared logbook\'s postgres:// address, the session is recorded into the logbook in your data folder and pushed there')
    .requiredOption('--unit <serial>', 'serial number of the unit on the bench')
    .requiredOption('--design <file>', 'board design file (*.board.json)')
    .option('--seconds <n>', 'stop after this many seconds')
    .option('--operator <name>', 'who is at the bench', 'record')
    .option('--bench <name>', 'this bench\'s name on the session (default: RAMPWRIGHT_BENCH or the computer\'s name)')
    .option('--push-to <address>', 'after the session, push this bench\'s finished sessions to a shared logbook (postgres://...)')
    .action(async (options: { port: string; db: string; unit: string; design: string; seconds?: string; operator: string; bench?: string; pushTo?: string }) => {
      // A session is recorded into this bench's own logbook file first, so a server that goes away never costs it.
      Object.assign(options, localFirst(options.db, options.pushTo, defaultLogbookPath()));
      const controller = new AbortController();
      const onInterrupt = (): void => controller.abort();
      process.once('SIGINT', onInterrupt);
      const interactive = process.stderr.isTTY === true;
      let lastPrintMs = 0;
      try {
        const result = await recordSession({
          port: options.port, db: options.db, unit: options.unit, designPath: options.design, seconds: secondsOption(options.seconds), operator: options.operator, bench: options.bench,
          signal: controller.signal,
          onStorageFault: (message) => process.stderr.write(`${interactive ? '\n' : ''}rampwright: ${message}: recording stops now; what is stored is kept\n`),
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
        const silence = linkSilenceText(row.linkSilentS, result.silentStretches);
        process.stdout.write(
          `Session ${row.id} of unit ${row.unit} ${row.status}: ${row.cycles} cycles, ramp peak ${fixed(row.rampPeakV, 3)} V, alpha ${fixed(row.wholeSession.alphaMeanDeg, 1)} deg mean over the recording, ${linkErrorsText(row.linkErrors)}${silence ? `, ${silence}` : ''}. Logbook: ${logbookDisplayLocation(options.db)}\n`,
        );
        if (silence) process.stdout.write(`Note: the logger sent nothing for ${row.linkSilentS.toFixed(1)} s of the session; readings cover only the time it was heard (see rampwright report).\n`);
        // The session is safe in this bench's logbook already: a shared logbook out of reach only delays sharing.
        if (options.pushTo !== undefined) process.stdout.write(`${(await pushAfterSession(options.db, options.pushTo)).join('\n')}\n`);
      } finally {
        process.removeListener('SIGINT', onInterrupt);
      }
    });
}
