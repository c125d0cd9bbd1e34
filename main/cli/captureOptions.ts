/**
 * The options every command that reads a capture file shares: the channel map and what a CSV cannot tell by
 * itself (separator, decimal mark, time unit, line of the column names, sample rate). Checked here, at the edge,
 * so a mistyped value is named with its option before any file is read.
 */
import type { Command } from 'commander';
import { parseChannelMap, type ChannelMap } from '../../app/capture/channelMap';
import type { BoardDesign } from '../../app/board/design';
import { InputError } from '../../app/errors';
import type { CsvDecimalName, CsvSeparatorName, CsvTimeUnit } from '../../app/formats/csvSniff';
import type { ReadCaptureOptions } from '../capture/readCaptureFile';

export interface CaptureCommandOptions {
  map?: string;
  rate?: string;
  separator?: string;
  decimal?: string;
  timeUnit?: string;
  headerLine?: string;
}

export function addCaptureOptions(command: Command): Command {
  return command
    .option('--map <roles>', 'which channel is which role: sync=CH1,ramp=CH2,gate=CH3[,control=CH4]; a name or 1-based column number; :x10 scales (10:1 probe left at 1:1), :invert negates; time=<column>|none')
    .option('--rate <Hz>', 'sample rate of a CSV capture that has no time column')
    .option('--separator <kind>', 'CSV field separator when it cannot be told: comma, semicolon or tab')
    .option('--decimal <mark>', 'CSV decimal mark when it cannot be told: point or comma')
    .option('--time-unit <unit>', 'unit of a CSV time column whose header gives none: s, ms or us')
    .option('--header-line <n>', 'line number of the CSV column names (0: the file has none)');
}

function choice<T extends string>(text: string | undefined, allowed: readonly T[], option: string): T | undefined {
  if (text === undefined) return undefined;
  const value = text.trim().toLowerCase();
  if (!(allowed as readonly string[]).includes(value)) throw new InputError(`must be ${allowed.join(', ').replace(/, ([^,]*)$/, ' or $1')} (got "${text}")`, option);
  return value as T;
}

export function rateOption(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text);
  if (text.trim() === '' || !Number.isFinite(value) || value < 1000 || value > 1_000_000) {
    throw new InputError(`must be a sample rate in Hz from 1000 to 1000000 (got "${text}")`, '--rate');
  }
  return value;
}

function headerLineOption(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  if (!/^\s*\d+\s*$/.test(text)) throw new InputError(`must be a line number (1 for the first line, 0 for a file without names), got "${text}"`, '--header-line');
  return Number(text);
}

export function mapOption(text: string | undefined): ChannelMap | undefined {
  return text === undefined ? undefined : parseChannelMap(text, '--map');
}

/** Reading options from the command line; the design's stored map is the default when --map is not given. */
export function captureReadOptions(options: CaptureCommandOptions, design: BoardDesign | null): ReadCaptureOptions {
  return {
    channelMap: mapOption(options.map),
    defaultMap: design?.channelMap,
    sampleRateHz: rateOption(options.rate),
    separator: choice<CsvSeparatorName>(options.separator, ['comma', 'semicolon', 'tab'], '--separator'),
    decimal: choice<CsvDecimalName>(options.decimal, ['point', 'comma'], '--decimal'),
    timeUnit: choice<CsvTimeUnit>(options.timeUnit === 'µs' ? 'us' : options.timeUnit, ['s', 'ms', 'us'], '--time-unit'),
    headerLine: headerLineOption(options.headerLine),
  };
}
