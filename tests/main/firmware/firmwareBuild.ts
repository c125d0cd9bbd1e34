/**
 * The firmware built from source for the tests (`make -C firmware`, incremental: nothing is rebuilt when the image is
 * newer than its sources), with its flash and static RAM as avr-size reports them.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseIntelHex } from '../../../main/firmware/intelHex';
import { flashBytes } from '../../../main/firmware/loggerChip';

export const firmwareDirectory = fileURLToPath(new URL('../../../firmware', import.meta.url));
export const hexPath = `${firmwareDirectory}/build/rampwright-logger.hex`;
export const elfPath = `${firmwareDirectory}/build/rampwright-logger.elf`;

export interface FirmwareBuild {
  image: Uint8Array;
  /** avr-size: .text + .data (flash). */
  flashBytes: number;
  /** avr-size: .data + .bss + .noinit (static RAM; the stack comes on top). */
  staticRamBytes: number;
  sizeReport: string;
}

let built: FirmwareBuild | null = null;

export function buildFirmware(): FirmwareBuild {
  if (built) return built;
  execFileSync('make', ['-s', '-C', firmwareDirectory, 'build/rampwright-logger.hex'], { stdio: 'pipe' });
  const sizeReport = execFileSync('avr-size', ['--format=avr', '--mcu=atmega328p', elfPath], { encoding: 'utf8' });
  const program = /Program:\s+(\d+) bytes/.exec(sizeReport);
  const data = /Data:\s+(\d+) bytes/.exec(sizeReport);
  if (!program || !data) throw new Error(`avr-size printed no Program/Data lines:\n${sizeReport}`);
  built = {
    image: parseIntelHex(readFileSync(hexPath, 'latin1'), flashBytes, hexPath),
    flashBytes: Number(program[1]),
    staticRamBytes: Number(data[1]),
    sizeReport,
  };
  return built;
}
