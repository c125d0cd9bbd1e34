/**
 * A first look at a capture file before its roles are known: every channel (a CSV column, a COMTRADE analog or
 * digital channel) with its name, unit and the first samples, for the screen where the technician says which is
 * which. Works on the start of the file only; the roles are checked afterwards with the same map the readers use.
 */
import { InputError } from '../errors';
import { comtradeFileChannels, analogScaling } from './comtradeChannelMap';
import type { ComtradeConfig } from './comtradeConfig';
import { comtradeRecordBytes } from './comtradeConfig';
import { sniffLinesOf } from './csvReader';
import { sniffCsvDialect, voltsFactorOf, type CsvDialect, type CsvDialectOptions } from './csvSniff';
import { isNotANumberWord, numberOfText, splitCsvLine, withoutTrailingEmpty } from './csvText';
import { decodeUtf8 } from './utf8';

export type PreviewChannelKind = 'column' | 'analog' | 'digital';

export interface PreviewChannel {
  /** What the channel map calls it: a CSV column's number, `A3` or `D1` for COMTRADE. */
  reference: string;
  /** Its name as the file writes it (the header, the channel id); '' when the file gives none. */
  name: string;
  label: string;
  unit: string;
  kind: PreviewChannelKind;
  /** The first samples (volts where the unit says so; 0/1 for digital channels), NaN where not a number. */
  values: Float64Array;
}

export interface CapturePreview {
  channels: PreviewChannel[];
  /** The CSV's dialect, when a CSV. */
  dialect: CsvDialect | null;
  /** Rows or records looked at. */
  samples: number;
}

/** Samples looked at per channel: a few mains cycles at the usual rates. */
export const previewSamples = 4000;

/** The first look at a CSV from its first bytes. */
export function previewCsv(head: Uint8Array, complete: boolean, options: CsvDialectOptions, source: string): CapturePreview {
  const lines = sniffLinesOf(head, complete);
  const dialect = sniffCsvDialect(lines, options, source);
  const rows: string[][] = [];
  for (const line of lines) {
    if (line.number < dialect.firstDataLine) continue;
    const fields = withoutTrailingEmpty(splitCsvLine(line.text, dialect.separator));
    if (fields.length === 0) continue;
    rows.push(fields);
    if (rows.length >= previewSamples) break;
  }
  const channels = dialect.columns.map((column): PreviewChannel => {
    const factor = voltsFactorOf(column.unit) ?? 1;
    const values = Float64Array.from(rows, (row) => {
      const text = row[column.number - 1] ?? '';
      return isNotANumberWord(text) ? Number.NaN : numberOfText(text, dialect.decimalMark) * factor;
    });
    return {
      reference: String(column.number),
      name: column.header === '' ? '' : column.name,
      label: column.header === '' ? `column ${column.number}` : column.header,
      unit: column.unit,
      kind: 'column',
      values,
    };
  });
  return { channels, dialect, samples: rows.length };
}

/** The first look at a COMTRADE record from its configuration and the first bytes of its data. */
export function previewComtrade(config: ComtradeConfig, data: Uint8Array, source: string): CapturePreview {
  const fileChannels = comtradeFileChannels(config);
  const analogCount = config.analogChannels.length;
  const digitalCount = config.digitalChannels.length;
  const columns: number[][] = fileChannels.map(() => []);
  const scaling = config.analogChannels.map(analogScaling);
  let samples = 0;
  if (config.fileType === 'ASCII') {
    let start = 0;
    while (samples < previewSamples && start < data.length) {
      const end = data.indexOf(0x0a, start);
      if (end < 0) break;
      const text = decodeUtf8(data, start, end).trim();
      start = end + 1;
      if (text === '' || /^\x1a+$/.test(text)) continue;
      const fields = text.split(',');
      for (let index = 0; index < analogCount; index++) {
        const value = Number(fields[2 + index]);
        columns[index].push(fields[2 + index]?.trim() === '' || value === 99999 || !Number.isFinite(value) ? Number.NaN : value * scaling[index].voltsPerCount + scaling[index].offsetV);
      }
      for (let index = 0; index < digitalCount; index++) columns[analogCount + index].push(Number(fields[2 + analogCount + index]));
      samples++;
    }
  } else {
    const recordBytes = comtradeRecordBytes(config);
    const view = new DataView(data.buffer, data.byteOffset, data.byteLength);
    const analogBytes = config.fileType === 'BINARY' ? 2 : 4;
    for (let offset = 0; offset + recordBytes <= data.length && samples < previewSamples; offset += recordBytes) {
      for (let index = 0; index < analogCount; index++) {
        const at = offset + 8 + index * analogBytes;
        const count = config.fileType === 'BINARY' ? view.getInt16(at, true) : config.fileType === 'BINARY32' ? view.getInt32(at, true) : view.getFloat32(at, true);
        const missing = (config.fileType === 'BINARY' && count === -0x8000) || (config.fileType === 'BINARY32' && count === -0x80000000);
        columns[index].push(missing ? Number.NaN : count * scaling[index].voltsPerCount + scaling[index].offsetV);
      }
      const digitalStart = offset + 8 + analogCount * analogBytes;
      for (let index = 0; index < digitalCount; index++) {
        const word = view.getUint16(digitalStart + 2 * (index >> 4), true);
        columns[analogCount + index].push((word >> (index & 15)) & 1);
      }
      samples++;
    }
  }
  if (samples === 0) throw new InputError('the data holds no complete record to look at', source);
  const channels = fileChannels.map((channel, index): PreviewChannel => ({
    reference: channel.kind === 'analog' ? `A${channel.index + 1}` : `D${channel.index + 1}`,
    name: channel.id,
    label: channel.label,
    unit: channel.kind === 'analog' ? config.analogChannels[channel.index].unit.trim() : '',
    kind: channel.kind,
    values: Float64Array.from(columns[index]),
  }));
  return { channels, dialect: null, samples };
}

/** `count` buckets of (min, max) of `values`, NaN left out: a trace a screen can draw in a few dozen pixels. */
export function minMaxTrace(values: ArrayLike<number>, count: number): { minV: number | null; maxV: number | null; points: number[] } {
  let minV = Number.POSITIVE_INFINITY;
  let maxV = Number.NEGATIVE_INFINITY;
  const points: number[] = [];
  const buckets = Math.max(1, Math.min(count, values.length));
  for (let bucket = 0; bucket < buckets; bucket++) {
    const from = Math.floor((bucket * values.length) / buckets);
    const to = Math.floor(((bucket + 1) * values.length) / buckets);
    let low = Number.POSITIVE_INFINITY;
    let high = Number.NEGATIVE_INFINITY;
    for (let index = from; index < to; index++) {
      const value = values[index];
      if (!(value === value)) continue;
      if (value < low) low = value;
      if (value > high) high = value;
    }
    if (low <= high) {
      points.push(low, high);
      if (low < minV) minV = low;
      if (high > maxV) maxV = high;
    }
  }
  return { minV: minV <= maxV ? minV : null, maxV: minV <= maxV ? maxV : null, points };
}
