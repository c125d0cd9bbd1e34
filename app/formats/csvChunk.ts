/**
 * Many CSV rows at once, from a run of whole lines to column arrays: the work a parser thread does on its share of
 * a long file (main/capture/parallelCsv.ts). One pass over the bytes: numbers are parsed where they stand and the
 * separators and line ends found by the scan itself; a row the fast path cannot take whole (quotes, blanks, text,
 * a fault) is handed to parseCsvRow with its line, so the answers and the messages are the streaming reader's.
 */
import { InputError } from '../errors';
import { scanAsciiNumber, scanState } from './asciiNumber';
import { isEmptyRow, parseCsvRow, type CsvRowPlan } from './csvRows';

export interface CsvChunkColumns {
  /** Sample rows read (blank lines skipped). */
  rows: number;
  /** Lines in the chunk, blank ones included (the caller keeps the file's line count with it). */
  lines: number;
  /** Per row: seconds (NaN without a time column), volts. Arrays may be longer than `rows`. */
  time: Float64Array;
  sync: Float64Array;
  ramp: Float64Array;
  gate: Float64Array;
  control: Float64Array;
  /** Line (0-based in the chunk) of each row when some lines were blank; null when row k is line k. */
  rowLines: Int32Array | null;
}

export interface CsvChunkFailure {
  /** 0-based line in the chunk. */
  lineInChunk: number;
  /** The reason, without the place (the caller knows the file and the line number). */
  message: string;
}

const newline = 0x0a;
const carriageReturn = 0x0d;
const quote = 0x22;
const space = 0x20;
const tab = 0x09;

function grow(array: Float64Array, capacity: number): Float64Array<ArrayBuffer> {
  const grown = new Float64Array(capacity);
  grown.set(array);
  return grown;
}

/** Column arrays to fill, of one length (handed back by the caller for the next chunk: no new memory per chunk). */
export interface CsvChunkScratch {
  time: Float64Array;
  sync: Float64Array;
  ramp: Float64Array;
  gate: Float64Array;
  control: Float64Array;
}

/**
 * A faster reader of the plain rows (main/capture/csvFieldsWasm.ts, in WebAssembly). It must give exactly what the
 * fast path below gives for every line it takes, and stop before any line it does not take; the lines it leaves are
 * read here, with the messages and line numbers of the streaming reader.
 */
export interface CsvRowAccelerator {
  /** Called once per chunk, before any `take` on it. */
  load(bytes: Uint8Array, plan: CsvRowPlan): void;
  /**
   * Reads plain rows from byte `position` into the columns from index `row` on, at most `room` of them; returns how
   * many, and leaves in `stop` the byte after the last line taken (the chunk's length or more at its end).
   */
  take(position: number, columns: CsvChunkScratch, row: number, room: number): number;
  readonly stop: number;
}

/**
 * Parses `bytes` (whole lines; the last may lack its newline) with the layout's row plan, into `scratch` when given
 * (grown when too short). Returns the columns, or the first fault with its line in the chunk. An `accelerator`
 * reads the plain rows first, this code the rest.
 */
export function parseCsvChunk(bytes: Uint8Array, plan: CsvRowPlan, scratch?: CsvChunkScratch, accelerator?: CsvRowAccelerator): CsvChunkColumns | CsvChunkFailure {
  const { separator, decimalMark, slots, factors, columnCount } = plan;
  const tabIsBlank = separator !== tab;
  const length = bytes.length;
  let capacity = scratch?.time.length ?? Math.max(64, Math.ceil(length / 48));
  let time = scratch?.time ?? new Float64Array(capacity);
  let sync = scratch?.sync ?? new Float64Array(capacity);
  let ramp = scratch?.ramp ?? new Float64Array(capacity);
  let gate = scratch?.gate ?? new Float64Array(capacity);
  let control = scratch?.control ?? new Float64Array(capacity);
  let rowLines: Int32Array | null = null;
  const row = new Float64Array(5);
  let rows = 0;
  let line = 0;
  let position = 0;
  let failedLine = -1;
  const where = (): string => '';
  const growAll = (): void => {
    capacity *= 2;
    time = grow(time, capacity);
    sync = grow(sync, capacity);
    ramp = grow(ramp, capacity);
    gate = grow(gate, capacity);
    control = grow(control, capacity);
    if (rowLines !== null) {
      const grown = new Int32Array(capacity);
      grown.set(rowLines);
      rowLines = grown;
    }
  };
  accelerator?.load(bytes, plan);
  while (position < length) {
    if (accelerator) {
      if (rows === capacity) growAll();
      const taken = accelerator.take(position, { time, sync, ramp, gate, control }, rows, capacity - rows);
      if (taken > 0) {
        if (rowLines !== null) for (let k = 0; k < taken; k++) rowLines[rows + k] = line + k;
        rows += taken;
        line += taken;
        position = accelerator.stop;
        continue;
      }
    }
    const lineStart = position;
    row[0] = Number.NaN;
    // Fast path: every field a plain number or a skipped unquoted field, the row ending at a line end.
    let column = 0;
    let fast = true;
    let rowEnd = -1;
    for (;;) {
      const slot = column < columnCount ? slots[column] : -1;
      let stop: number;
      if (slot >= 0) {
        const value = scanAsciiNumber(bytes, position, length, decimalMark, tabIsBlank);
        stop = scanState.stop;
        // NaN (text, a quote, a blank) or an infinity: the slow path decides.
        if (value - value !== 0) {
          fast = false;
          break;
        }
        row[slot] = value * factors[slot];
      } else {
        if (column >= columnCount) {
          // Beyond the header's columns only empty fields may follow (trailing separators).
          stop = position;
          while (stop < length && (bytes[stop] === space || bytes[stop] === tab) && bytes[stop] !== separator) stop++;
        } else {
          stop = position;
          while (stop < length) {
            const byte = bytes[stop];
            if (byte === separator || byte === newline || byte === carriageReturn) break;
            if (byte === quote) {
              fast = false;
              break;
            }
            stop++;
          }
          if (!fast) break;
        }
      }
      column++;
      if (stop >= length) {
        rowEnd = length;
        break;
      }
      const byte = bytes[stop];
      if (byte === separator) {
        position = stop + 1;
        continue;
      }
      if (byte === newline) {
        rowEnd = stop;
        break;
      }
      if (byte === carriageReturn && (stop + 1 === length || bytes[stop + 1] === newline)) {
        rowEnd = stop + 1 === length ? length : stop + 1;
        break;
      }
      fast = false;
      break;
    }
    if (fast && column < columnCount) fast = false;
    let lineEnd: number;
    if (fast) {
      lineEnd = rowEnd;
    } else {
      // The slow path: the whole line, as the streaming reader takes it.
      lineEnd = bytes.indexOf(newline, lineStart);
      if (lineEnd < 0) lineEnd = length;
      let contentEnd = lineEnd;
      if (contentEnd > lineStart && bytes[contentEnd - 1] === carriageReturn) contentEnd--;
      if (isEmptyRow(bytes, lineStart, contentEnd, separator)) {
        if (rowLines === null) {
          rowLines = new Int32Array(capacity);
          for (let k = 0; k < rows; k++) rowLines[k] = k;
        }
        line++;
        position = lineEnd + 1;
        continue;
      }
      try {
        parseCsvRow(bytes, lineStart, contentEnd, plan, row, where);
      } catch (error) {
        if (error instanceof InputError) {
          failedLine = line;
          return { lineInChunk: failedLine, message: error.message };
        }
        throw error;
      }
    }
    if (rows === capacity) growAll();
    time[rows] = row[0];
    sync[rows] = row[1];
    ramp[rows] = row[2];
    gate[rows] = row[3];
    control[rows] = row[4];
    if (rowLines !== null) rowLines[rows] = line;
    rows++;
    line++;
    position = lineEnd + 1;
  }
  return { rows, lines: line, time, sync, ramp, gate, control, rowLines };
}

export function isChunkFailure(result: CsvChunkColumns | CsvChunkFailure): result is CsvChunkFailure {
  return (result as CsvChunkFailure).message !== undefined;
}
