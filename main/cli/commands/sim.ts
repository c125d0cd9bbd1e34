/**
 * `rampwright sim`: the virtual board. Streams the logger protocol to a device path in real time (`--link`), or
 * writes a capture file (`--out`). Options are checked here, at the edge, with messages naming the option.
 */
import type { Command } from 'commander';
import { InputError } from '../../../app/errors';
import { faultDescriptions, faultNames, parseFaults } from '../../../app/sim/faults';
import { synthesiseCapture, type ControlSweep } from '../../../app/sim/virtualBoard';
import { createVirtualLogger, type VirtualLogger, type VirtualLoggerOptions } from '../../../app/sim/virtualLogger';
import { loadBoardDesign } from '../../board/loadBoardDesign';
import { writeCaptureFile } from '../../capture/writeCaptureFile';
import { streamLogger, streamUntilInterrupted, type LinkRunOptions, type LinkRunResult } from '../streamToLink';
import { runFirmwareSim } from './simFirmware';

export interface SimCommandOptions {
  design: string;
  link?: string;
  firmware?: string;
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

const virtualLinkBytesPerS = 271_073; // PROTOCOL.md link budget at 25 kS/s x 4 channels

/** Streams the virtual logger to `path` in real time. */
export function streamVirtualLogger(path: string, logger: VirtualLogger, options: Omit<LinkRunOptions, 'stepS' | 'linkBytesPerS'>): Promise<LinkRunResult> {
  const greeting = logger.greeting();
  return streamLogger(path, logger, { ...options, stepS: greeting.blockSamples / greeting.sampleRateHz, linkBytesPerS: virtualLinkBytesPerS });
}

async function runSim(options: SimCommandOptions): Promise<void> {
  if (!options.link && !options.out) throw new InputError('give --link <device path> to stream the logger protocol, or --out <capture file> to write a capture', 'rampwright sim');
  if (options.link && options.out) throw new InputError('give --link or --out, not both', 'rampwright sim');
  const { logger: loggerOptions, seconds } = simOptionsFrom(options);
  if (options.firmware !== undefined) return runFirmwareSim(options.firmware, options, loggerOptions, seconds);
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
  await streamUntilInterrupted('virtual logger', (stopSignal) => streamVirtualLogger(path, logger, { seconds: seconds ?? null, stopSignal }));
}

export function registerSimCommand(program: Command): void {
  program
    .command('sim')
    .description('Run the virtual board: stream the logger protocol to a device path, or write a capture file')
    .requiredOption('--design <file>', 'board design (*.board.json)')
    .option('--link <path>', 'device path to stream to in real time (e.g. one end of a socat pseudo-terminal pair)')
    .option('--firmware <image.hex>', 'run the logger firmware (firmware/build/rampwright-logger.hex) on a simulated chip measuring the virtual board, instead of the virtual logger (with --link)')
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
