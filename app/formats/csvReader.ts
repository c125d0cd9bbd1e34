import { InputError } from '../errors';
import type { SampleBlock } from '../capture/samples';
import { defaultBlockSamples, type CaptureReader } from './captureReader';
import { layoutCsv, type CsvLayout, type CsvLayoutOptions } from './csvLayout';
import { isEmptyRow, parseCsvRow, type CsvRowPlan } from './csvRows';
import { sniffCsvDialect, type SniffLine } from './csvSniff';
import { LineSplitter } from './lineSplitter';
import { SampleBlockBuilder } from './sampleBlockBuilder';
import { decodeUtf8, encodeUtf8, startsWithByteOrderMark } from './utf8';

export interface CsvReaderOptions extends CsvLayoutOptions {
  /**
   * Sample rate for a file without a time column (the command line's --rate); with a time column the rate is
   * measured from the times, and this is used only where they cannot give it (a stretch of one sample).
   */
  sampleRateHz?: number;
  blockSamples?: number;
  /** File name for error messages. */
  source?: string;
}

export interface CsvCaptureReader extends CaptureReader {
  /** How the file is read, once its first lines have been seen (null before). */
  layout(): CsvLayout | null;
}

/** Bytes looked at before the layout is decided: enough for a long header block and a few thousand rows. */
export const csvSniffBytes = 256 << 10;
const sniffLineLimit = 2000;

export function rowPlanOf(layout: CsvLayout): CsvRowPlan {
  return {
    separator: layout.dialect.separator.charCodeAt(0),
    decimalMark: layout.dialect.decimalMark.charCodeAt(0),
    columnCount: layout.columnCount,
    slots: layout.slots,
    factors: layout.factors,
    columnLabels: layout.columnLabels,
  };
}

/** The complete lines of the first bytes of a file, as text, for the sniffer. */
export function sniffLinesOf(bytes: Uint8Array, complete: boolean): SniffLine[] {
  const lines: SniffLine[] = [];
  let start = startsWithByteOrderMark(bytes, 0, bytes.length) ? 3 : 0;
  while (lines.length < sniffLineLimit) {
    let newline = bytes.indexOf(0x0a, start);
    if (newline < 0) {
      if (!complete || start >= bytes.length) break;
      newline = bytes.length;
    }
    let end = newline;
    if (end > start && bytes[end - 1] === 0x0d) end--;
    lines.push({ number: lines.length + 1, text: decodeUtf8(bytes, start, end) });
    start = newline + 1;
  }
  return lines;
}

/** The layout of a CSV capture from its first bytes (`complete` when they are the whole file). */
export function layoutFromStart(bytes: Uint8Array, complete: boolean, options: CsvLayoutOptions, source: string): CsvLayout {
  return layoutCsv(sniffCsvDialect(sniffLinesOf(bytes, complete), options, source), options, source);
}

function joinBytes(first: Uint8Array, second: Uint8Array): Uint8Array {
  const joined = new Uint8Array(first.length + second.length);
  joined.set(first);
  joined.set(second, first.length);
  return joined;
}

/**
 * Streaming reader for CSV captures: ours (`t,sync,ramp,gate[,control]`, seconds and volts, comma) and the
 * dialects instruments and spreadsheets write (app/formats/README.md): the first 256 KiB are sniffed for the
 * separator, decimal mark, header block, names, units and time (csvSniff.ts), the channel map says which column
 * is which role (csvLayout.ts), then rows stream through with memory of one block plus one line.
 */
export function createCsvReader(options: CsvReaderOptions = {}): CsvCaptureReader {
  const source = options.source ?? 'CSV capture';
  const blockSamples = options.blockSamples ?? defaultBlockSamples;
  if (options.sampleRateHz !== undefined && !(options.sampleRateHz > 0 && Number.isFinite(options.sampleRateHz))) {
    throw new InputError(`the sample rate must be a positive number of hertz, not ${options.sampleRateHz}`, source);
  }
  let sniffBuffer: Uint8Array | null = new Uint8Array(0);
  let layout: CsvLayout | null = null;
  let plan: CsvRowPlan | null = null;
  let builder: SampleBlockBuilder | null = null;
  let firstDataLine = 1;
  let currentLine = 0;
  let sawAnyByte = false;
  const row = new Float64Array(5);
  let out: SampleBlock[] = [];

  const where = (): string => `${source}, line ${currentLine}`;

  const splitter = new LineSplitter((bytes, start, end, lineNumber) => {
    if (lineNumber < firstDataLine || plan === null || builder === null) return;
    currentLine = lineNumber;
    if (lineNumber === 1 && startsWithByteOrderMark(bytes, start, end)) start += 3;
    if (isEmptyRow(bytes, start, end, plan.separator)) return;
    parseCsvRow(bytes, start, end, plan, row, where);
    builder.append(row[0], row[1], row[2], row[3], row[4], out);
  }, source);

  const decide = (complete: boolean): void => {
    const bytes = sniffBuffer as Uint8Array;
    // A first line longer than the window: wait for its end (the line splitter bounds it).
    if (!complete && bytes.indexOf(0x0a) < 0) return;
    layout = layoutFromStart(bytes, complete, options, source);
    plan = rowPlanOf(layout);
    firstDataLine = layout.dialect.firstDataLine;
    builder = new SampleBlockBuilder({ blockSamples, hasControl: layout.hasControl, fixedRateHz: layout.fixedRateHz, fallbackRateHz: options.sampleRateHz, where });
    sniffBuffer = null;
    splitter.push(bytes);
    if (pendingHighSurrogate !== '') splitter.push(pendingHighSurrogate);
    pendingHighSurrogate = '';
  };

  // A string chunk may end in the first half of a surrogate pair: held back until its partner comes.
  let pendingHighSurrogate = '';
  const toBytes = (chunk: Uint8Array | string): Uint8Array => {
    if (typeof chunk !== 'string') return chunk;
    let text = pendingHighSurrogate + chunk;
    pendingHighSurrogate = '';
    const last = text.charCodeAt(text.length - 1);
    if (last >= 0xd800 && last <= 0xdbff) {
      pendingHighSurrogate = text.slice(-1);
      text = text.slice(0, -1);
    }
    return encodeUtf8(text);
  };

  return {
    layout: () => layout,
    readAs: () => (layout as CsvLayout | null)?.readAs ?? null,
    push(chunk) {
      out = [];
      if (chunk.length > 0) sawAnyByte = true;
      if (sniffBuffer === null) {
        splitter.push(chunk);
        return out;
      }
      // Until the layout is known the start of the file is kept.
      sniffBuffer = joinBytes(sniffBuffer, toBytes(chunk));
      if (sniffBuffer.length >= csvSniffBytes) decide(false);
      return out;
    },
    finish() {
      out = [];
      if (sniffBuffer !== null) {
        if (pendingHighSurrogate !== '') sniffBuffer = joinBytes(sniffBuffer, encodeUtf8(pendingHighSurrogate));
        pendingHighSurrogate = '';
        if (!sawAnyByte || sniffBuffer.length === 0) throw new InputError('the file is empty', source);
        if (sniffLinesOf(sniffBuffer, true).every((line) => line.text.trim() === '')) throw new InputError('the file holds only blank lines: no header, no samples', source);
        decide(true);
      }
      splitter.finish();
      currentLine = splitter.linesSeen;
      const finalBuilder = builder as SampleBlockBuilder | null;
      if (finalBuilder === null) throw new InputError('the file has no header line', source);
      if (finalBuilder.totalSamples === 0) throw new InputError('the file has a header but no samples', source);
      finalBuilder.flush(out);
      return out;
    },
  };
}
