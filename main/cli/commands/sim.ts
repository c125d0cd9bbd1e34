/**
 * `rampwright sim`: the virtual board. Streams the logger protocol to a device path in real time (`--link`), or
 * writes a capture file (`--out`). Options are checked here, at the edge, with messages naming the option.
 */
import { closeSync, constants, existsSync, openSync, writeSync } from 'node:fs';
import { isatty, ReadStream, WriteStream } from 'node:tty';
import type { Command } from 'commander';
import { InputError } from '../../../app/errors';
import { faultDescriptions, faultNames, parseFaults } from '../../../app/sim/faults';
import { synthesiseCapture, type ControlSweep } from '../../../app/sim/virtualBoard';
import { createVirtualLogger, type VirtualLogger, type VirtualLoggerOptions } from '../../../app/sim/virtualLogger';
import { loadBoardDesign } from '../../board/loadBoardDesign';
import { writeCaptureFile } from '../../capture/writeCaptureFile';

interface SimCommandOptions {
  design: string;
  link?: string;
  out?: string;
  seconds?: string;
  rate?: string;
  control?: string;
  controlSweep?: string;
  sweepPeriod?: string;
  fault: string[];
  seed?: string;
  noise?: string;
  bits?: string;
  block?: string;
  mains?: string;
}

function numberOption(text: string | undefined, option: string, what: string, range: { min: number; max: number; integer?: boolean }): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text);
  const fits = text.trim() !== '' && Number.isFinite(value) && value >= range.min && value <= range.max && (!range.integer || Number.isInteger(value));
  if (!fits) throw new InputError(`must be ${what} from ${range.min} to ${range.max}${range.integer ? ', a whole number' : ''} (got "${text}")`, option);
  return value;
}

function parseSweep(text: string | undefined, periodText: string | undefined, seconds: number | undefined): ControlSweep | undefined {
  if (text === undefined) return undefined;
  const match = /^(-?[\d.]+):(-?[\d.]+)$/.exec(text.trim());
  const fromV = match ? Number(match[1]) : Number.NaN;
  const toV = match ? Number(match[2]) : Number.NaN;
  if (!Number.isFinite(fromV) || !Number.isFinite(toV)) throw new InputError(`must be FROM:TO in volts, e.g. 1:9 (got "${text}")`, '--control-sweep');
  // Default: one triangle over the whole run, so a capture holds the transfer curve up and down once.
  const periodS = numberOption(periodText, '--sweep-period', 'seconds', { min: 0.1, max: 86_400 }) ?? seconds ?? 20;
  return { fromV, toV, periodS };
}

export function simOptionsFrom(options: SimCommandOptions): { logger: VirtualLoggerOptions; seconds: number | undefined } {
  const seconds = numberOption(options.seconds, '--seconds', 'seconds', { min: 0.001, max: 86_400 * 7 });
  const faults = parseFaults(options.fault);
  const logger: VirtualLoggerOptions = {
    sampleRateHz: numberOption(options.rate, '--rate', 'samples per second per channel', { min: 1000, max: 200_000, integer: true }),
    seed: numberOption(options.seed, '--seed', 'a seed', { min: 0, max: 2 ** 32 - 1, integer: true }),
    controlV: numberOption(options.control, '--control', 'a control voltage in volts', { min: -100, max: 100 }),
    controlSweep: parseSweep(options.controlSweep, options.sweepPeriod, seconds),
    noiseV: numberOption(options.noise, '--noise', 'rms volts', { min: 0, max: 10 }),
    adcBits: numberOption(options.bits, '--bits', 'ADC bits', { min: 4, max: 16, integer: true }),
    blockSamples: numberOption(options.block, '--block', 'samples per channel per line', { min: 1, max: 382, integer: true }),
    mainsHzOverride: numberOption(options.mains, '--mains', 'a mains frequency in Hz', { min: 45, max: 65 }),
    faults: [...faults.board, ...faults.link],
    unplugAfterS: faults.unplugAfterS ?? undefined,
  };
  if (options.control !== undefined && options.controlSweep !== undefined) throw new InputError('give either --control or --control-sweep, not both', '--control');
  return { logger, seconds };
}

/*
 * Streaming to a device path in real time: the path is opened as a plain file for writing (a socat
 * pseudo-terminal behaves like one), and, when it is a terminal, read back for host commands. No serial
 * library: a virtual board needs no baud rate.
 */
interface LinkRunOptions {
  /** Stop after this much signal (s); run until stopped when absent. */
  seconds: number | null;
  /** Called every tick with the signal time sent so far. */
  onTick?: (timeS: number) => void;
  /** Resolves when the caller wants to stop (Ctrl-C). */
  stopSignal?: Promise<void>;
  tickMs?: number;
}

interface LinkRunResult {
  dataLines: number;
  commandsAnswered: number;
  signalS: number;
  unplugged: boolean;
}

/** Output waiting beyond this many seconds of data means the reader is not keeping up: the logger overruns. */
const backlogLimitS = 0.5;
const linkBytesPerS = 271_073; // PROTOCOL.md link budget at 25 kS/s x 4 channels

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

function listenForCommands(path: string, logger: VirtualLogger, onCommand: () => void): ReadStream {
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

export async function streamVirtualLogger(path: string, logger: VirtualLogger, options: LinkRunOptions): Promise<LinkRunResult> {
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
      if (writer.queuedBytes() > backlogLimitS * linkBytesPerS) logger.skipUntil(untilS);
      const lines = logger.linesUntil(untilS);
      if (lines.length > 0) {
        dataLines += lines.filter((line) => line.startsWith('D ')).length;
        writer.push(`${lines.join('\n')}\n`);
      }
      options.onTick?.(logger.timeS());
      if (logger.isUnplugged()) break;
      if (options.seconds !== null && untilS >= options.seconds) break;
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

async function runSim(options: SimCommandOptions): Promise<void> {
  if (!options.link && !options.out) throw new InputError('give --link <device path> to stream the logger protocol, or --out <capture file> to write a capture', 'rampwright sim');
  if (options.link && options.out) throw new InputError('give --link or --out, not both', 'rampwright sim');
  const { logger: loggerOptions, seconds } = simOptionsFrom(options);
  const design = await loadBoardDesign(options.design);
  if (options.out) {
    const durationS = seconds ?? 2;
    const written = await writeCaptureFile(options.out, synthesiseCapture(design, { ...loggerOptions, durationS, blockSamples: 2500 }), { lineFrequencyHz: design.mainsHz, stationName: 'virtual board' });
    process.stdout.write(`wrote ${written.samples} samples (${durationS} s of "${design.name}") to ${written.paths.join(' and ')}\n`);
    return;
  }
  const path = options.link!;
  const logger = createVirtualLogger(design, loggerOptions);
  const greeting = logger.greeting();
  process.stderr.write(
    `virtual logger ${greeting.loggerId}: "${design.name}" at ${greeting.sampleRateHz} samples/s x ${greeting.channels.length} channels to ${path}` +
      `${seconds === undefined ? ' (Ctrl-C stops)' : ` for ${seconds} s`}\n`,
  );
  let onInterrupt: (() => void) | null = null;
  const stopSignal = new Promise<void>((resolve) => {
    onInterrupt = () => resolve();
    process.once('SIGINT', onInterrupt);
  });
  try {
    const result = await streamVirtualLogger(path, logger, { seconds: seconds ?? null, stopSignal });
    const ending = result.unplugged ? 'went silent (unplug-after fault)' : 'stopped';
    process.stderr.write(`virtual logger ${ending} after ${result.signalS.toFixed(2)} s: ${result.dataLines} data lines sent, ${result.commandsAnswered} commands answered\n`);
  } finally {
    if (onInterrupt) process.off('SIGINT', onInterrupt);
  }
}

export function registerSimCommand(program: Command): void {
  program
    .command('sim')
    .description('Run the virtual board: stream the logger protocol to a device path, or write a capture file')
    .requiredOption('--design <file>', 'board design (*.board.json)')
    .option('--link <path>', 'device path to stream to in real time (e.g. one end of a socat pseudo-terminal pair)')
    .option('--out <capture>', 'write a capture file instead (.csv, or .cfg/.dat for COMTRADE)')
    .option('--seconds <n>', 'seconds of signal (default: 2 for --out, until Ctrl-C for --link)')
    .option('--rate <hz>', 'samples per second per channel (default 25000)')
    .option('--control <volts>', 'constant control voltage (default: the one that fires the design at 90 degrees)')
    .option('--control-sweep <from:to>', 'sweep the control voltage up and down between two voltages')
    .option('--sweep-period <seconds>', 'seconds for one sweep up and down (default: the whole run)')
    .option('--fault <name>', `add a fault (repeatable): ${faultNames.join(', ')}`, (value: string, previous: string[]) => [...previous, value], [] as string[])
    .option('--seed <n>', 'seed of the noise and the faults (default 1)')
    .option('--noise <volts>', 'measurement noise, rms volts (default 0.005)')
    .option('--bits <n>', 'ADC resolution (default 12)')
    .option('--block <n>', 'samples per channel in each data line (default 120)')
    .option('--mains <hz>', 'run on another mains frequency than the design says')
    .addHelpText('after', `\nFaults:\n${faultNames.map((name) => `  ${name.padEnd(24)} ${faultDescriptions[name]}`).join('\n')}\n`)
    .action(async (options: SimCommandOptions) => runSim(options));
}
