/**
 * From a sniffed dialect and the channel map to what each column feeds: the time (and its unit) or a role (and
 * its volts factor: unit x scale x sign), plus the one line that says how the file was read.
 */
import { InputError } from '../errors';
import { channelMapOption, type ChannelMap } from '../capture/channelMap';
import { describeResolvedRoles, findChannel, resolveChannelRoles, type FileChannel, type ResolvedRoles } from '../capture/resolveChannels';
import { signalRoles } from '../capture/samples';
import { csvOptionNames, voltsFactorOf, type CsvColumnInfo, type CsvDialect, type CsvDialectOptions, type CsvTimeUnit } from './csvSniff';
import { numberOfText, secondsPerTimeUnit } from './csvText';

export interface CsvLayoutOptions extends CsvDialectOptions {
  /** The map given for this file (the command line's --map): always applies. */
  channelMap?: ChannelMap;
  /** A board design's stored map: applies when it fits the file; otherwise columns named after the roles are used. */
  defaultMap?: ChannelMap;
}

export interface CsvChannel extends FileChannel {
  column: CsvColumnInfo;
}

export interface CsvLayout {
  dialect: CsvDialect;
  columnCount: number;
  /** Per column: -1 not read, 0 time, 1..4 sync, ramp, gate, control. */
  slots: Int8Array;
  /** Per slot 0..4: seconds per time unit (slot 0), volts factor (roles). */
  factors: Float64Array;
  /** Column names for messages, per column. */
  columnLabels: string[];
  fixedRateHz: number | undefined;
  hasControl: boolean;
  roles: ResolvedRoles<CsvChannel>;
  /** Which map found the roles: the one given with the file, the design's, or the roles' own names. */
  mapUsed: 'given' | 'design' | 'names';
  /** How the file was read, in one line. */
  readAs: string;
}

/** Names of a time column (our format writes `t`; any letter case, unit aside). */
const timeNames = new Set(['t', 'time', 'timestamp', 'time stamp']);
/** A time column without a unit is taken in seconds (our format) unless only another unit gives a usable sample rate. */
const usableRateHz = { min: 1e3, max: 1e6 };

function channelLabel(column: CsvColumnInfo): string {
  return column.header === '' ? `column ${column.number}` : column.header;
}

function channelsOf(columns: readonly CsvColumnInfo[]): CsvChannel[] {
  return columns.map((column) => ({
    number: column.number,
    names: column.header === '' ? [] : column.name === column.header ? [column.header] : [column.header, column.name],
    label: channelLabel(column),
    column,
  }));
}

function medianPositiveInterval(values: number[]): number | null {
  const intervals: number[] = [];
  for (let index = 1; index < values.length; index++) {
    const interval = values[index] - values[index - 1];
    if (interval > 0 && Number.isFinite(interval)) intervals.push(interval);
  }
  if (intervals.length === 0) return null;
  intervals.sort((a, b) => a - b);
  return intervals[Math.floor(intervals.length / 2)];
}

function formatRate(rateHz: number): string {
  if (rateHz >= 1e6) return `${+(rateHz / 1e6).toPrecision(4)} MS/s`;
  if (rateHz >= 1e3) return `${+(rateHz / 1e3).toPrecision(4)} kS/s`;
  return `${+rateHz.toPrecision(4)} S/s`;
}

/** Seconds per unit of the time column, and how that was known. */
function timeUnitOf(column: CsvColumnInfo, dialect: CsvDialect, options: CsvLayoutOptions, where: string): { secondsPerUnit: number; said: string } {
  const stated = options.timeUnit;
  const headerUnit = column.unit;
  const headerFactor = headerUnit === '' ? undefined : secondsPerTimeUnit[headerUnit] ?? secondsPerTimeUnit[headerUnit.toLowerCase()];
  if (stated !== undefined) {
    const note = headerFactor !== undefined && secondsPerTimeUnit[stated] !== headerFactor ? ` (${csvOptionNames.timeUnit}; the header says ${headerUnit})` : ` (${csvOptionNames.timeUnit})`;
    return { secondsPerUnit: secondsPerTimeUnit[stated], said: `time in ${stated}${note}` };
  }
  if (headerUnit !== '') {
    if (headerFactor === undefined) {
      throw new InputError(`the time column "${column.header}" is in "${headerUnit}", not a unit of time: give ${csvOptionNames.timeUnit} s|ms|us`, where);
    }
    return { secondsPerUnit: headerFactor, said: `time in ${headerUnit} from the header` };
  }
  // Our own format's `t` is seconds by definition (app/formats/README.md).
  if (column.name.trim().toLowerCase() === 't') return { secondsPerUnit: 1, said: 'time in s' };
  const values = dialect.firstRows.map((row) => numberOfText(row[column.number - 1] ?? '', dialect.decimalMark)).filter((value) => Number.isFinite(value));
  const intervalInUnits = medianPositiveInterval(values);
  if (intervalInUnits !== null) {
    const usable = (['s', 'ms', 'us'] as CsvTimeUnit[]).filter((unit) => {
      const rateHz = 1 / (intervalInUnits * secondsPerTimeUnit[unit]);
      return rateHz >= usableRateHz.min && rateHz <= usableRateHz.max;
    });
    if (!usable.includes('s') && usable.length > 0) {
      const readings = ['s', ...usable].map((unit) => `in ${unit} ${formatRate(1 / (intervalInUnits * secondsPerTimeUnit[unit]))}`).join(', ');
      throw new InputError(
        `the time column "${column.header}" has no unit, and its steps of ${intervalInUnits} give ${readings}: say which with ${csvOptionNames.timeUnit} s|ms|us`,
        where,
      );
    }
  }
  return { secondsPerUnit: 1, said: 'time in s' };
}

function findTimeColumn(channels: readonly CsvChannel[], roles: ResolvedRoles<CsvChannel>, map: ChannelMap | undefined, where: string): CsvChannel | null {
  if (map?.time === null) return null;
  if (map?.time !== undefined) {
    const found = findChannel(channels, map.time, 'time', where);
    if (found === null) throw new InputError(`no column ${typeof map.time === 'number' ? `number ${map.time}` : `"${map.time}"`} for the time (${channelMapOption} time=...)`, where);
    return found;
  }
  const used = new Set(signalRoles.map((role) => roles[role]?.channel));
  const candidates = channels.filter((channel) => !used.has(channel) && timeNames.has(channel.column.name.trim().toLowerCase()));
  if (candidates.length > 1) {
    throw new InputError(`${candidates.map((channel) => channel.label).join(' and ')} could each be the time: name it with ${channelMapOption} time=<column>`, where);
  }
  return candidates[0] ?? null;
}

function resolveRoles(
  channels: CsvChannel[],
  options: CsvLayoutOptions,
  where: string,
): { roles: ResolvedRoles<CsvChannel>; map: ChannelMap | undefined; note: string | null; used: CsvLayout['mapUsed'] } {
  const resolve = (map: ChannelMap | undefined) => {
    const timeLike = new Set(map?.time === undefined ? channels.filter((channel) => timeNames.has(channel.column.name.trim().toLowerCase())) : []);
    return resolveChannelRoles(channels, map, where, 'the file has columns', timeLike);
  };
  if (options.channelMap !== undefined) return { roles: resolve(options.channelMap), map: options.channelMap, note: null, used: 'given' };
  if (options.defaultMap !== undefined) {
    try {
      return { roles: resolve(options.defaultMap), map: options.defaultMap, note: "the design's channel map", used: 'design' };
    } catch (designError) {
      try {
        return { roles: resolve(undefined), map: undefined, note: "columns named after the roles (the design's channel map does not fit this file)", used: 'names' };
      } catch {
        throw designError;
      }
    }
  }
  return { roles: resolve(undefined), map: undefined, note: null, used: 'names' };
}

/**
 * Builds the layout, refusing (with the file, the line and the option) a file whose roles, time column or time
 * unit it cannot tell.
 */
export function layoutCsv(dialect: CsvDialect, options: CsvLayoutOptions, source: string): CsvLayout {
  const where = `${source}, line ${dialect.headerLine ?? dialect.firstDataLine}`;
  const channels = channelsOf(dialect.columns);
  const { roles, map, note, used } = resolveRoles(channels, options, where);
  const time = findTimeColumn(channels, roles, map, where);
  const slots = new Int8Array(dialect.columns.length).fill(-1);
  const factors = new Float64Array(5);
  const notes: string[] = [];
  signalRoles.forEach((role, roleIndex) => {
    const entry = roles[role];
    if (entry === null) return;
    const volts = voltsFactorOf(entry.channel.column.unit);
    if (volts === null) notes.push(`${entry.channel.label} taken as volts`);
    slots[entry.channel.column.number - 1] = roleIndex + 1;
    factors[roleIndex + 1] = (volts ?? 1) * entry.pick.scale * (entry.pick.invert ? -1 : 1);
  });
  let fixedRateHz: number | undefined;
  let timeSaid: string;
  if (time !== null) {
    const unit = timeUnitOf(time.column, dialect, options, where);
    slots[time.column.number - 1] = 0;
    factors[0] = unit.secondsPerUnit;
    timeSaid = `${unit.said} (${time.label})`;
    if (options.sampleRateHz !== undefined) timeSaid += `; ${csvOptionNames.sampleRateHz} used only where the times cannot give the rate`;
  } else if (options.sampleRateHz !== undefined) {
    fixedRateHz = options.sampleRateHz;
    const headerSays = dialect.headerIntervalS === null ? '' : `; the header block says ${formatRate(1 / dialect.headerIntervalS)}`;
    timeSaid = `no time column, ${formatRate(fixedRateHz)} from ${csvOptionNames.sampleRateHz}${headerSays}`;
  } else if (dialect.headerIntervalS !== null) {
    // The interval is printed in decimal: its reciprocal to 12 digits gives back the round rate it stands for.
    fixedRateHz = Number((1 / dialect.headerIntervalS).toPrecision(12));
    timeSaid = `no time column, sample interval ${+dialect.headerIntervalS.toPrecision(6)} s (${formatRate(fixedRateHz)}) from line ${dialect.headerIntervalLine}`;
  } else {
    throw new InputError(
      `there is no time column (t, time or timestamp) and no sample interval in the lines above the rows: ` +
        `give the sample rate with ${csvOptionNames.sampleRateHz} <Hz>, or name the time column with ${channelMapOption} time=<column>`,
      where,
    );
  }
  const headerWords =
    dialect.headerLine === null
      ? 'no header'
      : dialect.headerLine > 1 || dialect.unitsLine !== null
        ? `names on line ${dialect.headerLine}${dialect.unitsLine !== null ? `, units on line ${dialect.unitsLine}` : ''}`
        : '';
  const readAs = [
    `read ${dialect.columns.length} columns${headerWords ? ` (${headerWords})` : ''}`,
    ...dialect.notes,
    timeSaid,
    `${describeResolvedRoles(roles)}${note ? ` by ${note}` : ''}`,
    ...notes,
  ].join(', ');
  return {
    dialect,
    columnCount: dialect.columns.length,
    slots,
    factors,
    columnLabels: dialect.columns.map(channelLabel),
    fixedRateHz,
    hasControl: roles.control !== null,
    roles,
    mapUsed: used,
    readAs,
  };
}
