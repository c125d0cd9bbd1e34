/**
 * Streaming a logger to a device path in real time, for `rampwright sim`: the path is opened as a plain file for
 * writing (a socat pseudo-terminal behaves like one), and, when it is a terminal, read back for host commands. No
 * serial library: a simulated logger needs no baud rate.
 */
import { closeSync, constants, existsSync, openSync, writeSync } from 'node:fs';
import { isatty, ReadStream, WriteStream } from 'node:tty';
import { InputError } from '../../app/errors';
import type { VirtualLogger } from '../../app/sim/virtualLogger';

/** What streams to the link: the virtual logger, or the real firmware on the simulated chip (simFirmware.ts). */
export type StreamedLogger = Pick<VirtualLogger, 'linesUntil' | 'skipUntil' | 'timeS' | 'isUnplugged'> & { handleCommandLine(line: string): unknown };

export interface LinkRunOptions {
  /** Stop after this much signal (s); run until stopped when absent. */
  seconds: number | null;
  /** The logger's time advances in steps of up to this (s): it has caught up when within one step of the time asked. */
  stepS: number;
  /** The link's speed (bytes/s): output queued beyond half a second of it means the reader is not keeping up. */
  linkBytesPerS: number;
  /** Called every tick with the signal time sent so far. */
  onTick?: (timeS: number) => void;
  /** Resolves when the caller wants to stop (Ctrl-C). */
  stopSignal?: Promise<void>;
  tickMs?: number;
}

export interface LinkRunResult {
  dataLines: number;
  commandsAnswered: number;
  signalS: number;
  unplugged: boolean;
}

/** Output waiting beyond this many seconds of data means the reader is not keeping up: the logger overruns. */
const backlogLimitS = 0.5;

interface LinkWriter {
  push(text: string): void;
  queuedBytes(): number;
  close(): void;
}

/**
 * A terminal (pseudo-terminal) gets libuv's tty stream switched to non-blocking writes: Node makes tty writes
 * blocking by default, and a blocking write to a terminal nobody reads would freeze the process, Ctrl-C
 * included. Unsent bytes wait in the stream; their count drives the logger's overruns. A plain file is written
 * synchronously (it never waits on a reader).
 */
function createLinkWriter(fd: number, path: string): LinkWriter {
  if (isatty(fd)) {
    const stream = new WriteStream(fd);
    (stream as unknown as { _handle?: { setBlocking?: (blocking: boolean) => void } })._handle?.setBlocking?.(false);
    let failure: Error | null = null;
    stream.on('error', (error) => (failure = error));
    return {
      push(text) {
        if (failure) throw new InputError(`writing failed (${(failure as NodeJS.ErrnoException).code ?? failure.message}): the other end of the link went away`, path);
        stream.write(text, 'latin1');
      },
      queuedBytes: () => stream.writableLength,
      close: () => stream.destroy(),
    };
  }
  return {
    push(text) {
      try {
        writeSync(fd, text, null, 'latin1');
      } catch (error) {
        throw new InputError(`writing failed (${(error as NodeJS.ErrnoException).code ?? String(error)})`, path);
      }
    },
    queuedBytes: () => 0,
    close: () => closeSync(fd),
  };
}

function listenForCommands(path: string, logger: StreamedLogger, onCommand: () => void): ReadStream {
  const input = new ReadStream(openSync(path, constants.O_RDONLY | constants.O_NOCTTY));
  try {
    input.setRawMode(true);
  } catch {
    // Raw mode only stops echo and line editing; socat's raw,echo=0 does the same.
  }
  let partial = '';
  input.setEncoding('latin1');
  input.on('data', (text: string) => {
    const lines = (partial + text).split('\n');
    partial = lines.pop() ?? '';
    if (partial.length > 4096) partial = '';
    for (const line of lines) {
      if (line.replace(/\r$/, '').length === 0) continue;
      logger.handleCommandLine(line);
      onCommand();
    }
  });
  input.on('error', () => undefined);
  return input;
}

export async function streamLogger(path: string, logger: StreamedLogger, options: LinkRunOptions): Promise<LinkRunResult> {
  if (!existsSync(path)) {
    throw new InputError('no such device or file; start the pseudo-terminal pair first, e.g. socat -d -d pty,raw,echo=0,link=/tmp/rw-logger pty,raw,echo=0,link=/tmp/rw-host, then give --link /tmp/rw-logger', path);
  }
  let writeFd: number;
  try {
    writeFd = openSync(path, constants.O_WRONLY | constants.O_NOCTTY | constants.O_APPEND);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(code === 'EACCES' ? 'permission denied opening it for writing' : `cannot open it for writing (${code ?? String(error)})`, path);
  }
  const writer = createLinkWriter(writeFd, path);
  let commandsAnswered = 0;
  const input = isatty(writeFd) ? listenForCommands(path, logger, () => commandsAnswered++) : null;
  const tickMs = options.tickMs ?? 20;
  const startedMs = performance.now();
  let dataLines = 0;
  let stopping = false;
  void options.stopSignal?.then(() => (stopping = true));
  try {
    while (!stopping) {
      const elapsedS = (performance.now() - startedMs) / 1000;
      const untilS = options.seconds === null ? elapsedS : Math.min(elapsedS, options.seconds);
      if (writer.queuedBytes() > backlogLimitS * options.linkBytesPerS) logger.skipUntil(untilS);
      const lines = logger.linesUntil(untilS);
      if (lines.length > 0) {
        dataLines += lines.filter((line) => line.startsWith('D ')).length;
        writer.push(`${lines.join('\n')}\n`);
      }
      options.onTick?.(logger.timeS());
      if (logger.isUnplugged()) break;
      if (options.seconds !== null && untilS >= options.seconds && logger.timeS() >= untilS - options.stepS) break;
      await new Promise((resolve) => setTimeout(resolve, tickMs));
    }
    // Give a slow reader up to a second for what is still queued.
    for (let wait = 0; wait < 50 && writer.queuedBytes() > 0; wait++) await new Promise((resolve) => setTimeout(resolve, 20));
  } finally {
    input?.destroy();
    writer.close();
  }
  return { dataLines, commandsAnswered, signalS: logger.timeS(), unplugged: logger.isUnplugged() };
}

/** Runs until Ctrl-C (or the end of `seconds`), then says how it went. */
export async function streamUntilInterrupted(what: string, run: (stopSignal: Promise<void>) => Promise<LinkRunResult>): Promise<void> {
  let onInterrupt: (() => void) | null = null;
  const stopSignal = new Promise<void>((resolve) => {
    onInterrupt = () => resolve();
    process.once('SIGINT', onInterrupt);
  });
  try {
    const result = await run(stopSignal);
    const ending = result.unplugged ? 'went silent (unplug-after fault)' : 'stopped';
    process.stderr.write(`${what} ${ending} after ${result.signalS.toFixed(2)} s: ${result.dataLines} data lines sent, ${result.commandsAnswered} commands answered\n`);
  } finally {
    if (onInterrupt) process.off('SIGINT', onInterrupt);
  }
}
