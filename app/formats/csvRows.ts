/**
 * The sample rows of a CSV capture, read straight from bytes once the layout is known: one pass per row that
 * parses the numbers it needs while it looks for the separators, skips the columns no role reads (quoted text
 * included), and scales to seconds and volts. Shared by the streaming reader and the parallel chunk parser.
 */
import { InputError } from '../errors';
import { fieldTextForMessage, isNotANumberText, scanAsciiNumber, scanState } from './asciiNumber';
import { csvOptionNames } from './csvSniff';

export interface CsvRowPlan {
  separator: number;
  decimalMark: number;
  columnCount: number;
  /** Per column: -1 not read, 0 time, 1..4 sync, ramp, gate, control. */
  slots: Int8Array;
  /** Per slot: seconds per time unit (0), volts factor (1..4). */
  factors: Float64Array;
  columnLabels: readonly string[];
}

const quote = 0x22;
const space = 0x20;
const tab = 0x09;
const substitute = 0x1a;

/** True for a line with nothing but spaces, separators and the old end-of-file mark (0x1A): spreadsheets write `;;;;` rows. */
export function isEmptyRow(bytes: Uint8Array, start: number, end: number, separator: number): boolean {
  for (let index = start; index < end; index++) {
    const byte = bytes[index];
    if (byte !== space && byte !== tab && byte !== separator && byte !== substitute && byte !== 0x0d) return false;
  }
  return true;
}

/** End of a field that starts with a quote: the byte after its closing quote (`""` is a quote inside). */
function endOfQuoted(bytes: Uint8Array, start: number, end: number): number {
  let index = start + 1;
  while (index < end) {
    if (bytes[index] === quote) {
      if (index + 1 < end && bytes[index + 1] === quote) index += 2;
      else return index + 1;
    } else index++;
  }
  return end;
}

function notANumberHint(bytes: Uint8Array, start: number, end: number, plan: CsvRowPlan): string {
  let comma = false;
  let point = false;
  for (let index = start; index < end; index++) {
    if (bytes[index] === 0x2c) comma = true;
    if (bytes[index] === 0x2e) point = true;
  }
  if (plan.decimalMark === 0x2e && comma && !point && plan.separator !== 0x2c) return ` (if the file writes a decimal comma, give ${csvOptionNames.decimal} comma)`;
  if (plan.decimalMark === 0x2c && point && !comma) return ` (if the file writes a decimal point, give ${csvOptionNames.decimal} point)`;
  return '';
}

/**
 * Parses one row into `row` (slot 0 the time in seconds, NaN when the file has no time column; 1..4 the roles in
 * volts). Throws an InputError naming the column and the text when a read field is not a number.
 */
export function parseCsvRow(bytes: Uint8Array, start: number, end: number, plan: CsvRowPlan, row: Float64Array, where: () => string): void {
  const { separator, decimalMark, slots, factors, columnCount } = plan;
  let column = 0;
  let fieldStart = start;
  row[0] = Number.NaN;
  for (;;) {
    const slot = column < columnCount ? slots[column] : -1;
    let fieldEnd: number;
    let first = fieldStart;
    while (first < end && (bytes[first] === space || bytes[first] === tab) && bytes[first] !== separator) first++;
    const quoted = first < end && bytes[first] === quote;
    if (slot >= 0) {
      let value: number;
      let valueStart = fieldStart;
      let valueEnd: number;
      if (quoted) {
        fieldEnd = endOfQuoted(bytes, first, end);
        valueStart = first + 1;
        valueEnd = fieldEnd - 1;
        value = scanAsciiNumber(bytes, valueStart, valueEnd, decimalMark, separator !== tab);
        if (scanState.stop !== valueEnd) value = Number.NaN;
        while (fieldEnd < end && bytes[fieldEnd] !== separator) {
          if (bytes[fieldEnd] !== space && bytes[fieldEnd] !== tab) value = Number.NaN;
          fieldEnd++;
        }
      } else {
        // Parse while scanning: the number should stop right at the separator or the line's end.
        value = scanAsciiNumber(bytes, fieldStart, end, decimalMark, separator !== tab);
        fieldEnd = scanState.stop;
        if (fieldEnd < end && bytes[fieldEnd] !== separator) {
          value = Number.NaN;
          while (fieldEnd < end && bytes[fieldEnd] !== separator) fieldEnd++;
        }
        valueEnd = fieldEnd;
      }
      if (value !== value && !(slot > 0 && isNotANumberText(bytes, valueStart, valueEnd))) {
        const text = fieldTextForMessage(bytes, fieldStart, fieldEnd);
        throw new InputError(`column ${plan.columnLabels[column]} holds "${text}", which is not a number${notANumberHint(bytes, fieldStart, fieldEnd, plan)}`, where());
      }
      if (slot === 0 && !Number.isFinite(value)) {
        throw new InputError(`column ${plan.columnLabels[column]} holds "${fieldTextForMessage(bytes, fieldStart, fieldEnd)}", not a time`, where());
      }
      row[slot] = value * factors[slot];
    } else {
      fieldEnd = quoted ? endOfQuoted(bytes, first, end) : fieldStart;
      while (fieldEnd < end && bytes[fieldEnd] !== separator) fieldEnd++;
      if (column >= columnCount) {
        // Beyond the header's columns only empty fields may follow (trailing separators).
        for (let index = fieldStart; index < fieldEnd; index++) {
          const byte = bytes[index];
          if (byte !== space && byte !== tab && byte !== 0x0d) throw new InputError(`the row has more fields than the ${columnCount} columns of the header`, where());
        }
      }
    }
    column++;
    if (fieldEnd >= end) break;
    fieldStart = fieldEnd + 1;
  }
  if (column < columnCount) {
    throw new InputError(`the row has ${column} field${column === 1 ? '' : 's'} but the header has ${columnCount}`, where());
  }
}
