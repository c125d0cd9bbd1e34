/**
 * `rampwright sim --firmware <image.hex> --link <device>`: the logger's real firmware on a simulated ATmega328P
 * (main/firmware) measuring the virtual board. Its serial output goes to the device as the logger's USB-serial
 * bridge would send it, and the host's commands come back into its receiver, so the Bench screen and `record` can
 * be tried end to end with the real firmware and no hardware.
 */
import { InputError } from '../../../app/errors';
import { isBoardFault, type BoardFaultName } from '../../../app/sim/faults';
import type { VirtualLoggerOptions } from '../../../app/sim/virtualLogger';
import { loadBoardDesign } from '../../board/loadBoardDesign';
import { createFirmwareLogger, type FirmwareLogger } from '../../firmware/firmwareLogger';
import { loadFirmwareImage } from '../../firmware/loadFirmwareImage';
import { streamLogger, streamUntilInterrupted, type StreamedLogger } from '../streamToLink';
import type { SimCommandOptions } from './sim';

/** Signal run per step at most, so host commands are read between steps even when the chip runs slower than real time. */
const maxStepS = 0.05;
/** The firmware's link: 1 000 000 baud, 10 bits a byte (firmware/src/config.h). */
const firmwareLinkBytesPerS = 100_000;

export function firmwareOnLink(logger: FirmwareLogger): StreamedLogger {
  const advance = (untilS: number): string[] => logger.runUntil(Math.min(untilS, logger.timeS() + maxStepS));
  return {
    linesUntil: advance,
    // A reader that does not keep up: the bridge drops what it cannot pass on, as a real one does.
    skipUntil: (untilS) => void advance(untilS),
    handleCommandLine: (line) => logger.sendLine(line),
    timeS: () => logger.timeS(),
    isUnplugged: () => false,
  };
}

export async function runFirmwareSim(imagePath: string, options: SimCommandOptions, loggerOptions: VirtualLoggerOptions, seconds: number | undefined): Promise<void> {
  if (!options.link) throw new InputError('streams to a link: give --link <device path> (the firmware writes no capture file)', '--firmware');
  const ownSettings: Array<[string | undefined, string, string]> = [
    [options.rate, '--rate', 'its sample rate (send it `rate <Hz>` from the host)'],
    [options.bits, '--bits', 'its ADC resolution (10 bits)'],
    [options.block, '--block', 'its block size (30 samples)'],
  ];
  for (const [given, option, what] of ownSettings) if (given !== undefined) throw new InputError(`the firmware sets ${what}; leave ${option} out with --firmware`, option);
  const faults = loggerOptions.faults ?? [];
  const linkFaults = faults.filter((fault) => !isBoardFault(fault));
  if (linkFaults.length > 0) throw new InputError(`${linkFaults.join(', ')} belongs to the virtual logger's link; with --firmware only board faults apply`, '--fault');
  const design = await loadBoardDesign(options.design);
  const image = await loadFirmwareImage(imagePath);
  const logger = createFirmwareLogger(image, design, {
    seed: loggerOptions.seed,
    controlV: loggerOptions.controlV,
    controlSweep: loggerOptions.controlSweep,
    faults: faults as BoardFaultName[],
    mainsHzOverride: loggerOptions.mainsHzOverride,
    ...(loggerOptions.noiseV !== undefined ? { noiseV: loggerOptions.noiseV } : {}),
  });
  const path = options.link;
  process.stderr.write(`logger firmware ${imagePath} on a simulated ATmega328P measuring "${design.name}", to ${path}${seconds === undefined ? ' (Ctrl-C stops)' : ` for ${seconds} s of signal`}\n`);
  await streamUntilInterrupted('logger firmware', (stopSignal) =>
    streamLogger(path, firmwareOnLink(logger), { seconds: seconds ?? null, stopSignal, stepS: 0.002, linkBytesPerS: firmwareLinkBytesPerS }),
  );
}
