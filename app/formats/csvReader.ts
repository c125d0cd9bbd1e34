import { InputError } from '../errors';
import type { SampleBlock } from '../capture/samples';
import { defaultBlockSamples, type CaptureReader } from './captureReader';
import { fieldTextForMessage, isBlankText, isNotANumberText, scanAsciiNumber, scanState } from './asciiNumber';
import { parseCsvHeader, type CsvLayout } from './csvHeader';
import { LineSplitter } from './lineSplitter';
import { SampleBlockBuilder } from './sampleBlockBuilder';
import { decodeUtf8, startsWithByteOrderMark } from './utf8';

export interface CsvReaderOptions {
  /** Needed when the file has no `t` column; with a `t` column the rate is measured from the times. */
  sampleRateHz?: number;
  blockSamples?: number;
  /** File name for error messages. */
  source?: string;
}

/** Slot of each value in the per-row scratch array. */
const slotOf = { time: 0, sync: 1, ramp: 2, gate: 3, control: 4, ignored: -1 } as const;

/**
 * Streaming reader for our CSV capture: header `t,sync,ramp,gate[,control]`, seconds and volts, comma separated,
 * optional UTF-8 byte order mark, LF or CRLF, blank lines skipped, `NaN` for a missing sample.
 */
export function createCsvReader(options: CsvReaderOptions = {}): CaptureReader {
  const source = options.source ?? 'CSV capture';
  const blockSamples = options.blockSamples ?? defaultBlockSamples;
  if (options.sampleRateHz !== undefined && !(options.sampleRateHz > 0 && Number.isFinite(options.sampleRateHz))) {
    throw new InputError(`the sample rate must be a positive number of hertz, not ${options.sampleRateHz}`, source);
  }
  let layout: CsvLayout | null = null;
  let slots: Int8Array = new Int8Array(0);
  let builder: SampleBlockBuilder | null = null;
  let currentLine = 0;
  let sawAnyLine = false;
  let sawAnyByte = false;
  const row = new Float64Array(5);
  let out: SampleBlock[] = [];

  const where = (): string => `${source}, line ${currentLine}`;

  const readHeader = (bytes: Uint8Array, start: number, end: number): void => {
    if (startsWithByteOrderMark(bytes, start, end)) start += 3;
    layout = parseCsvHeader(decodeUtf8(bytes, start, end), where());
    slots = Int8Array.from(layout.columns, (column) => slotOf[column]);
    if (!layout.hasTime && options.sampleRateHz === undefined) {
      throw new InputError('the file has no t column, so the sample rate must be given (--rate)', where());
    }
    builder = new SampleBlockBuilder({
      blockSamples,
      hasControl: layout.hasControl,
      fixedRateHz: layout.hasTime ? undefined : options.sampleRateHz,
      fallbackRateHz: options.sampleRateHz,
      where,
    });
  };

  const readRow = (bytes: Uint8Array, start: number, end: number, currentLayout: CsvLayout, currentBuilder: SampleBlockBuilder): void => {
    const columnCount = slots.length;
    let column = 0;
    let fieldStart = start;
    row[0] = Number.NaN;
    for (;;) {
      const slot = column < columnCount ? slots[column] : -1;
      let fieldEnd: number;
      if (slot >= 0) {
        // Parse while scanning: the number should stop right at the comma or the line's end.
        let value = scanAsciiNumber(bytes, fieldStart, end);
        fieldEnd = scanState.stop;
        if (fieldEnd < end && bytes[fieldEnd] !== 0x2c) {
          value = Number.NaN;
          while (fieldEnd < end && bytes[fieldEnd] !== 0x2c) fieldEnd++;
        }
        if (value !== value && !(slot > 0 && isNotANumberText(bytes, fieldStart, fieldEnd))) {
          const text = fieldTextForMessage(bytes, fieldStart, fieldEnd);
          throw new InputError(`column ${currentLayout.names[column]} holds "${text}", which is not a number`, where());
        }
        if (slot === 0 && !Number.isFinite(value)) {
          throw new InputError(`column ${currentLayout.names[column]} holds "${fieldTextForMessage(bytes, fieldStart, fieldEnd)}", not a time in seconds`, where());
        }
        row[slot] = value;
      } else {
        fieldEnd = fieldStart;
        while (fieldEnd < end && bytes[fieldEnd] !== 0x2c) fieldEnd++;
      }
      column++;
      if (fieldEnd >= end) break;
      fieldStart = fieldEnd + 1;
    }
    if (column !== columnCount) {
      throw new InputError(`the row has ${column} field${column === 1 ? '' : 's'} but the header has ${columnCount}`, where());
    }
    currentBuilder.append(row[0], row[1], row[2], row[3], row[4], out);
  };

  const splitter = new LineSplitter((bytes, start, end, lineNumber) => {
    currentLine = lineNumber;
    if (isBlankText(bytes, start, end)) return;
    if (layout === null || builder === null) {
      sawAnyLine = true;
      readHeader(bytes, start, end);
      return;
    }
    readRow(bytes, start, end, layout, builder);
  }, source);

  return {
    push(chunk) {
      if (chunk.length > 0) sawAnyByte = true;
      out = [];
      splitter.push(chunk);
      return out;
    },
    finish() {
      out = [];
      splitter.finish();
      currentLine = splitter.linesSeen;
      if (!sawAnyLine) {
        throw new InputError(sawAnyByte ? 'the file holds only blank lines: no header, no samples' : 'the file is empty', source);
      }
      if (builder === null) throw new InputError('the file has no header line', source);
      const finalBuilder: SampleBlockBuilder = builder;
      if (finalBuilder.totalSamples === 0) {
        throw new InputError('the file has a header but no samples', source);
      }
      finalBuilder.flush(out);
      return out;
    },
  };
}
