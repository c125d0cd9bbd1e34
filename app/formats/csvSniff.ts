/**
 * Works out how a CSV capture is written from its first lines: the separator (comma, semicolon, tab), the
 * decimal mark, where the column names are (after any block of header lines an instrument writes), units in the
 * names, the time column and its unit, or a sample interval in the header block when there is no time column.
 * What it can tell, it says (one line, `readAs`); where two readings are possible it refuses and names the option
 * that settles it. Pure and small: it sees only a window at the start of the file.
 */
import { InputError } from '../errors';
import { intervalOfHeaderLine } from './csvHeaderBlock';
import { isNotANumberWord, isUnitOnly, numberOfText, splitCsvLine, splitNameAndUnit, voltsPerUnit, withoutTrailingEmpty } from './csvText';

export type CsvSeparatorName = 'comma' | 'semicolon' | 'tab';
export type CsvDecimalName = 'point' | 'comma';
export type CsvTimeUnit = 's' | 'ms' | 'us';

/** What the technician may state when the file cannot tell (the command line's options). */
export interface CsvDialectOptions {
  separator?: CsvSeparatorName;
  decimal?: CsvDecimalName;
  /** Unit of the time column when its header gives none. */
  timeUnit?: CsvTimeUnit;
  /** 1-based line of the column names (0: the file has none). */
  headerLine?: number;
  /** Sample rate for a file without a time column (overrides a sample interval in the header block). */
  sampleRateHz?: number;
}

/** Option names as the command line spells them, for refusals. */
export const csvOptionNames = {
  separator: '--separator',
  decimal: '--decimal',
  timeUnit: '--time-unit',
  headerLine: '--header-line',
  sampleRateHz: '--rate',
} as const;

export interface CsvColumnInfo {
  /** 1-based position in the row. */
  number: number;
  /** The header text as written ('' without a header). */
  header: string;
  /** The name without its unit. */
  name: string;
  /** The unit as written, '' when none. */
  unit: string;
}

export interface CsvDialect {
  separator: string;
  decimalMark: string;
  /** Line of the column names, null when the file has none. */
  headerLine: number | null;
  /** Line holding only units under the names, null when none. */
  unitsLine: number | null;
  /** Line of the first sample row: lines before it are the header block, the names and the units. */
  firstDataLine: number;
  /** The first sample rows as text fields (up to 200), for what the caller sniffs from values (the time unit). */
  firstRows: string[][];
  columns: CsvColumnInfo[];
  /** Sample interval stated in the header block (s), null when none. */
  headerIntervalS: number | null;
  /** Where the header block states it, for the "read as" line. */
  headerIntervalLine: number | null;
  /** What was sniffed rather than stated, in words. */
  notes: string[];
}

export interface SniffLine {
  number: number;
  text: string;
}

const separators: Record<CsvSeparatorName, string> = { comma: ',', semicolon: ';', tab: '\t' };
const decimals: Record<CsvDecimalName, string> = { point: '.', comma: ',' };
const separatorWords: Record<string, string> = { ',': 'comma', ';': 'semicolon', '\t': 'tab' };

function isBlankLine(text: string): boolean {
  return /^[\s,;]*$/.test(text);
}

interface Reading {
  separator: string;
  decimalMark: string;
  /** Data rows at the end of the window, all with `fieldCount` fields. */
  runStart: number;
  runLength: number;
  fieldCount: number;
  numericFields: number;
  /** Some field of the run holds a decimal mark (so the decimal reading is not a free choice). */
  sawDecimalMark: boolean;
}

function numericCount(fields: string[], decimalMark: string): { count: number; sawMark: boolean } {
  let count = 0;
  let sawMark = false;
  for (const field of fields) {
    if (!Number.isNaN(numberOfText(field, decimalMark))) {
      count++;
      if (field.includes(decimalMark)) sawMark = true;
    } else if (isNotANumberWord(field)) count++;
  }
  return { count, sawMark };
}

/** A sample row: at least two fields and at least half of them numbers (text columns such as notes may sit among them). */
function isDataRow(fields: string[], count: number): boolean {
  return fields.length >= 2 && count >= Math.max(2, Math.ceil(fields.length / 2));
}

/**
 * The longest run of data rows with one field count, read with one separator and decimal mark (the earliest of
 * equal runs: a ragged row later on is the reader's to name, with its line).
 */
function readRun(lines: readonly SniffLine[], separator: string, decimalMark: string): Reading {
  const best: Reading = { separator, decimalMark, runStart: 0, runLength: 0, fieldCount: 0, numericFields: 0, sawDecimalMark: false };
  let current: Reading | null = null;
  for (let index = 0; index < lines.length; index++) {
    const fields = withoutTrailingEmpty(splitCsvLine(lines[index].text, separator));
    const { count, sawMark } = numericCount(fields, decimalMark);
    if (!isDataRow(fields, count)) {
      current = null;
      continue;
    }
    if (current === null || fields.length !== current.fieldCount) {
      current = { separator, decimalMark, runStart: index, runLength: 0, fieldCount: fields.length, numericFields: 0, sawDecimalMark: false };
    }
    current.runLength++;
    current.numericFields += count;
    current.sawDecimalMark ||= sawMark;
    if (current.runLength > best.runLength) Object.assign(best, current);
  }
  return best;
}

function describeLine(line: SniffLine | undefined): string {
  if (line === undefined) return '';
  const text = line.text.length > 60 ? `${line.text.slice(0, 60)}...` : line.text;
  return ` (line ${line.number}: "${text.replace(/\t/g, '\\t')}")`;
}

function chooseReading(lines: readonly SniffLine[], options: CsvDialectOptions, source: string): Reading {
  const separatorChoices = options.separator ? [separators[options.separator]] : [',', ';', '\t'];
  const decimalChoices = options.decimal ? [decimals[options.decimal]] : ['.', ','];
  const readings: Reading[] = [];
  for (const separator of separatorChoices) {
    for (const decimalMark of decimalChoices) {
      if (separator === decimalMark) continue;
      const reading = readRun(lines, separator, decimalMark);
      if (reading.runLength > 0) readings.push(reading);
    }
  }
  const where = `${source}, line ${lines[lines.length - 1]?.number ?? 1}`;
  if (readings.length === 0) {
    if (lines.length === 1 && !/\d/.test(lines[0].text.replace(/[a-z_]\d+/gi, ''))) throw new InputError('the file has a header but no samples', source);
    if (options.separator === 'comma' && options.decimal === 'comma') {
      throw new InputError('a decimal comma needs another separator: semicolon or tab', csvOptionNames.decimal);
    }
    throw new InputError(
      `found no rows of numbers in the first ${lines.length} lines${describeLine(lines[lines.length - 1])}: ` +
        `give the separator (${csvOptionNames.separator} comma|semicolon|tab) and the decimal mark (${csvOptionNames.decimal} point|comma)`,
      where,
    );
  }
  const best = (a: Reading, b: Reading) => b.runLength - a.runLength || b.numericFields - a.numericFields || a.fieldCount - b.fieldCount;
  readings.sort(best);
  const [first] = readings;
  // A second reading as good as the first gives other columns or other values: refuse rather than guess.
  const rival = readings.find(
    (other) =>
      other !== first &&
      other.runLength === first.runLength &&
      other.numericFields === first.numericFields &&
      (other.separator !== first.separator || (other.sawDecimalMark && first.sawDecimalMark)),
  );
  if (rival) {
    const option = rival.separator !== first.separator ? csvOptionNames.separator : csvOptionNames.decimal;
    const choices =
      rival.separator !== first.separator
        ? `${separatorWords[first.separator]} (${first.fieldCount} columns) or ${separatorWords[rival.separator]} (${rival.fieldCount} columns)`
        : `a decimal ${first.decimalMark === '.' ? 'point' : 'comma'} or a decimal ${rival.decimalMark === '.' ? 'point' : 'comma'}`;
    throw new InputError(`the rows read two ways, as ${choices}: say which with ${option}`, `${source}, line ${lines[first.runStart].number}`);
  }
  return first;
}

/**
 * Sniffs the dialect from the first lines of a file (complete lines only, blank ones included or not).
 * Throws an InputError naming the file, the line and the option when it cannot tell.
 */
export function sniffCsvDialect(allLines: readonly SniffLine[], options: CsvDialectOptions, source: string): CsvDialect {
  const notes: string[] = [];
  let lines = allLines.filter((line) => !isBlankLine(line.text));
  if (lines.length === 0) throw new InputError('the file holds no lines with values', source);
  const forcedHeader = options.headerLine;
  if (forcedHeader !== undefined) {
    if (forcedHeader > 0 && !lines.some((line) => line.number === forcedHeader)) {
      throw new InputError(`line ${forcedHeader} is blank or beyond the first ${allLines.length} lines`, csvOptionNames.headerLine);
    }
    lines = lines.filter((line) => line.number > forcedHeader);
    if (lines.length === 0) throw new InputError(`no rows after line ${forcedHeader}`, csvOptionNames.headerLine);
  }
  const reading = chooseReading(lines, options, source);
  const { separator, decimalMark } = reading;
  const firstRow = lines[reading.runStart];
  const before = allLines.filter((line) => !isBlankLine(line.text) && line.number < firstRow.number);

  // Column names: the stated line, else the line just before the rows when it has as many fields and is not
  // itself a row of numbers; a line of units alone under the names is taken with them.
  let headerLine: number | null = null;
  let unitsLine: number | null = null;
  let names: string[] = [];
  let units: string[] = [];
  if (forcedHeader !== undefined) {
    if (forcedHeader > 0) {
      headerLine = forcedHeader;
      names = withoutTrailingEmpty(splitCsvLine(allLines.find((line) => line.number === forcedHeader)?.text ?? '', separator));
    }
  } else {
    const last = before[before.length - 1];
    const lastFields = last ? withoutTrailingEmpty(splitCsvLine(last.text, separator)) : [];
    if (last && lastFields.length === reading.fieldCount) {
      const previous = before[before.length - 2];
      const previousFields = previous ? withoutTrailingEmpty(splitCsvLine(previous.text, separator)) : [];
      if (lastFields.every(isUnitOnly) && previous && previousFields.length === reading.fieldCount) {
        headerLine = previous.number;
        unitsLine = last.number;
        names = previousFields;
        units = lastFields.map((field) => field.trim().replace(/^[([]\s*|\s*[)\]]$/g, ''));
      } else {
        headerLine = last.number;
        names = lastFields;
      }
    } else if (last) {
      notes.push(`no column names (line ${last.number} has ${lastFields.length} field${lastFields.length === 1 ? '' : 's'}, the rows ${reading.fieldCount})`);
    }
  }
  if (names.length > reading.fieldCount) {
    throw new InputError(`the header names ${names.length} columns but the rows have ${reading.fieldCount}`, `${source}, line ${headerLine}`);
  }
  const columns: CsvColumnInfo[] = [];
  for (let index = 0; index < reading.fieldCount; index++) {
    const header = names[index] ?? '';
    const split = splitNameAndUnit(header);
    columns.push({ number: index + 1, header, name: split.name, unit: units[index] || split.unit });
  }
  const seenNames = new Map<string, number>();
  for (const column of columns) {
    if (column.header === '') continue;
    const key = column.header.trim().toLowerCase();
    const earlier = seenNames.get(key);
    if (earlier !== undefined) {
      notes.push(`columns ${earlier} and ${column.number} are both named "${column.header}" (name them by number in the channel map)`);
    } else seenNames.set(key, column.number);
  }

  let headerIntervalS: number | null = null;
  let headerIntervalLine: number | null = null;
  const blockEnd = headerLine ?? firstRow.number;
  for (const line of allLines) {
    if (line.number >= blockEnd) break;
    const intervalS = intervalOfHeaderLine(line.text, decimalMark);
    if (intervalS !== null) {
      headerIntervalS = intervalS;
      headerIntervalLine = line.number;
      break;
    }
  }
  if (!options.separator && separator !== ',') notes.push(`separator ${separatorWords[separator]}`);
  if (!options.decimal && decimalMark === ',') notes.push('decimal comma');
  // A row of numbers above the rows, other than the names, means the rows are broken by a line that is not one:
  // skipping what is above it would lose samples without a word.
  const stray = before.find((line) => {
    if (line.number === headerLine || line.number === unitsLine) return false;
    const fields = withoutTrailingEmpty(splitCsvLine(line.text, separator));
    return fields.length === reading.fieldCount && isDataRow(fields, numericCount(fields, decimalMark).count) && line.number > (headerLine ?? 0);
  });
  if (stray) {
    const breaker = before[before.length - 1];
    throw new InputError(
      `line ${breaker.number} breaks the rows of numbers (rows above it from line ${stray.number})${describeLine(breaker)}: ` +
        `remove it, or say where the column names are with ${csvOptionNames.headerLine}`,
      `${source}, line ${breaker.number}`,
    );
  }
  const firstRows = lines.slice(reading.runStart, reading.runStart + 200).map((line) => withoutTrailingEmpty(splitCsvLine(line.text, separator)));
  return { separator, decimalMark, headerLine, unitsLine, firstDataLine: firstRow.number, firstRows, columns, headerIntervalS, headerIntervalLine, notes };
}

/** Volts per unit of a channel column ('' and unknown units: taken as volts, and said so by the caller). */
export function voltsFactorOf(unit: string): number | null {
  if (unit === '') return 1;
  return voltsPerUnit[unit.toLowerCase()] ?? null;
}
