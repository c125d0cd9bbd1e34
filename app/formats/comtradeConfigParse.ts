import { InputError } from '../errors';
import {
  comtradeFileTypes,
  type ComtradeAnalogChannel,
  type ComtradeConfig,
  type ComtradeDateTime,
  type ComtradeDigitalChannel,
  type ComtradeFileType,
  type ComtradeRevision,
  type ComtradeSampleRate,
} from './comtradeConfig';

/** A .cfg has a few dozen lines; more than this many channels is not a file we can use. */
const maxChannels = 10000;

class ConfigLines {
  private index = 0;
  constructor(
    private readonly lines: string[],
    private readonly source: string,
  ) {}

  get lineNumber(): number {
    return this.index;
  }

  get atEnd(): boolean {
    return this.index >= this.lines.length;
  }

  peek(): string | undefined {
    return this.lines[this.index];
  }

  next(what: string): string[] {
    if (this.index >= this.lines.length) {
      throw new InputError(`the configuration ends early: expected ${what} on line ${this.index + 1}`, this.source);
    }
    return this.lines[this.index++].split(',').map((field) => field.trim());
  }

  fail(message: string): never {
    throw new InputError(message, `${this.source}, line ${this.index}`);
  }

  number(text: string | undefined, field: string, options: { integer?: boolean; minimum?: number; emptyAs?: number } = {}): number {
    if ((text === undefined || text === '') && options.emptyAs !== undefined) return options.emptyAs;
    const value = text === undefined || text === '' ? Number.NaN : Number(text);
    if (!Number.isFinite(value)) this.fail(`${field} is "${text ?? ''}", not a number`);
    if (options.integer && !Number.isInteger(value)) this.fail(`${field} is "${text}", not a whole number`);
    if (options.minimum !== undefined && value < options.minimum) this.fail(`${field} is ${value}, less than ${options.minimum}`);
    return value;
  }
}

/**
 * rev_year: 1991, 1999 or 2013. Recorders also write other years (a firmware's own date, e.g. 2001): such a file is
 * read with the layout of the revision before it, which the fields that follow then confirm or refuse.
 */
function parseRevision(text: string | undefined, lines: ConfigLines): ComtradeRevision {
  if (text === undefined || text === '') return 1991;
  if (/^\d{4}$/.test(text)) {
    const year = Number(text);
    if (year >= 2013) return 2013;
    if (year >= 1999) return 1999;
    if (year >= 1991) return 1991;
  }
  return lines.fail(`rev_year is "${text}"; the revisions read are 1991, 1999 and 2013`);
}

function parseChannelCount(text: string | undefined, letter: 'A' | 'D', lines: ConfigLines): number {
  const trimmed = (text ?? '').trim();
  const last = trimmed.slice(-1).toUpperCase();
  if (last !== letter) lines.fail(`the ${letter === 'A' ? 'analog' : 'digital'} channel count is "${trimmed}", expected a number followed by ${letter}`);
  return lines.number(trimmed.slice(0, -1), `##${letter}`, { integer: true, minimum: 0 });
}

function parseAnalog(fields: string[], revision: ComtradeRevision, lines: ConfigLines): ComtradeAnalogChannel {
  if (fields.length < 10) lines.fail(`an analog channel line needs at least 10 fields (An,ch_id,ph,ccbm,uu,a,b,skew,min,max), it has ${fields.length}`);
  if (revision !== 1991 && fields.length < 13) {
    lines.fail(`an analog channel line of the ${revision} revision has 13 fields (…,primary,secondary,PS), this one has ${fields.length}`);
  }
  const multiplier = lines.number(fields[5], 'a (channel multiplier)');
  if (multiplier === 0) lines.fail('a (channel multiplier) is 0, so the channel holds no signal');
  const scalingText = (fields[12] ?? 'P').toUpperCase();
  if (scalingText !== 'P' && scalingText !== 'S' && scalingText !== '') lines.fail(`PS is "${fields[12]}", expected P or S`);
  return {
    number: lines.number(fields[0], 'An', { integer: true, minimum: 1 }),
    id: fields[1],
    phase: fields[2],
    circuit: fields[3],
    unit: fields[4],
    multiplier,
    offset: lines.number(fields[6], 'b (channel offset)', { emptyAs: 0 }),
    skewUs: lines.number(fields[7], 'skew', { emptyAs: 0 }),
    minimum: lines.number(fields[8], 'min', { emptyAs: Number.NEGATIVE_INFINITY }),
    maximum: lines.number(fields[9], 'max', { emptyAs: Number.POSITIVE_INFINITY }),
    primary: lines.number(fields[10], 'primary', { emptyAs: 1 }),
    secondary: lines.number(fields[11], 'secondary', { emptyAs: 1 }),
    scaling: scalingText === 'S' ? 'S' : 'P',
  };
}

function parseDigital(fields: string[], lines: ConfigLines): ComtradeDigitalChannel {
  // 1999 and 2013: Dn,ch_id,ph,ccbm,y. 1991: Dn,ch_id,y.
  const long = fields.length >= 5;
  if (!long && fields.length !== 3) lines.fail(`a digital channel line has 5 fields (Dn,ch_id,ph,ccbm,y), this one has ${fields.length}`);
  const stateText = long ? fields[4] : fields[2];
  const state = lines.number(stateText, 'y (normal state)', { integer: true, emptyAs: 0 });
  if (state !== 0 && state !== 1) lines.fail(`y (normal state) is ${state}, expected 0 or 1`);
  return {
    number: lines.number(fields[0], 'Dn', { integer: true, minimum: 1 }),
    id: fields[1],
    phase: long ? fields[2] : '',
    circuit: long ? fields[3] : '',
    normalState: state as 0 | 1,
  };
}

function parseDateTime(fields: string[], revision: ComtradeRevision, what: string, lines: ConfigLines): { time: ComtradeDateTime; fractionDigits: number } {
  const text = fields.join(',');
  // Some recorders leave the times empty (","): the record is read without a wall-clock time.
  if (fields.length <= 2 && fields.every((field) => field.trim() === '')) {
    return { time: { text: '', year: 0, month: 0, day: 0, hour: 0, minute: 0, second: 0 }, fractionDigits: 0 };
  }
  const dateParts = (fields[0] ?? '').split('/');
  const timeParts = (fields[1] ?? '').split(':');
  if (fields.length !== 2 || dateParts.length !== 3 || timeParts.length !== 3) {
    lines.fail(`the ${what} is "${text}", expected dd/mm/yyyy,hh:mm:ss.ssssss`);
  }
  // 1991 wrote mm/dd/yy; 1999 on write dd/mm/yyyy.
  const [first, second, yearText] = dateParts.map((part) => lines.number(part, `the ${what}'s date`, { integer: true, minimum: 0 }));
  const day = revision === 1991 ? second : first;
  const month = revision === 1991 ? first : second;
  const year = yearText < 100 ? (yearText < 70 ? 2000 + yearText : 1900 + yearText) : yearText;
  const hour = lines.number(timeParts[0], `the ${what}'s hour`, { integer: true, minimum: 0 });
  const minute = lines.number(timeParts[1], `the ${what}'s minute`, { integer: true, minimum: 0 });
  const second_ = lines.number(timeParts[2], `the ${what}'s seconds`, { minimum: 0 });
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 23 || minute > 59 || second_ >= 61) {
    lines.fail(`the ${what} "${text}" is not a valid date and time`);
  }
  const fraction = timeParts[2].split('.')[1] ?? '';
  return { time: { text, year, month, day, hour, minute, second: second_ }, fractionDigits: fraction.length };
}

/**
 * Parses a .cfg (IEEE C37.111, 1991, 1999 or 2013; REFERENCES.md). Lines may end in CRLF or LF.
 * Throws an `InputError` naming the line and field that is wrong.
 */
export function parseComtradeConfig(text: string, source = 'COMTRADE configuration'): ComtradeConfig {
  // A byte order mark before, an old end-of-file mark (0x1A) after.
  const allLines = text.replace(/^\uFEFF/, '').replace(/\x1a[\s\x1a]*$/, '').split(/\r\n|\n|\r/);
  while (allLines.length > 0 && allLines[allLines.length - 1].trim() === '') allLines.pop();
  if (allLines.length === 0) throw new InputError('the configuration file is empty', source);
  const lines = new ConfigLines(allLines, source);

  const identity = lines.next('station_name,rec_dev_id,rev_year');
  const revision = parseRevision(identity[2], lines);

  const counts = lines.next('TT,##A,##D');
  if (counts.length < 3) lines.fail(`expected TT,##A,##D (total, analog and digital channel counts), found "${counts.join(',')}"`);
  const total = lines.number(counts[0], 'TT (total channels)', { integer: true, minimum: 0 });
  const analogCount = parseChannelCount(counts[1], 'A', lines);
  const digitalCount = parseChannelCount(counts[2], 'D', lines);
  if (analogCount + digitalCount !== total) lines.fail(`TT is ${total} but ${analogCount}A + ${digitalCount}D make ${analogCount + digitalCount}`);
  if (total > maxChannels) lines.fail(`${total} channels is more than the ${maxChannels} this reader takes`);

  const analogChannels: ComtradeAnalogChannel[] = [];
  for (let index = 0; index < analogCount; index++) {
    analogChannels.push(parseAnalog(lines.next(`analog channel ${index + 1}`), revision, lines));
  }
  const digitalChannels: ComtradeDigitalChannel[] = [];
  for (let index = 0; index < digitalCount; index++) {
    digitalChannels.push(parseDigital(lines.next(`digital channel ${index + 1}`), lines));
  }

  const lineFrequencyHz = lines.number(lines.next('lf (line frequency)')[0], 'lf (line frequency)', { minimum: 0, emptyAs: 0 });
  const rateCount = lines.number(lines.next('nrates')[0], 'nrates', { integer: true, minimum: 0 });
  if (rateCount > maxChannels) lines.fail(`nrates is ${rateCount}, too many`);
  const sampleRates: ComtradeSampleRate[] = [];
  for (let index = 0; index < rateCount; index++) {
    const fields = lines.next(`samp,endsamp for rate ${index + 1}`);
    const rateHz = lines.number(fields[0], 'samp (sample rate)', { minimum: 0 });
    const endSample = lines.number(fields[1], 'endsamp', { integer: true, minimum: 0 });
    sampleRates.push({ rateHz, endSample });
  }
  let endSampleWithoutRate: number | undefined;
  // With nrates = 0 the standard still writes `0,endsamp`; some writers leave it out, so look before taking it.
  const following = lines.peek();
  if (rateCount === 0 && following !== undefined && !following.includes('/')) {
    const fields = lines.next('0,endsamp');
    endSampleWithoutRate = lines.number(fields[1], 'endsamp', { integer: true, minimum: 0, emptyAs: 0 });
  }

  const first = parseDateTime(lines.next('the first sample time'), revision, 'first sample time', lines);
  const trigger = parseDateTime(lines.next('the trigger time'), revision, 'trigger time', lines);

  const typeText = lines.next('the file type (ASCII, BINARY, BINARY32 or FLOAT32)')[0].toUpperCase();
  if (!(comtradeFileTypes as readonly string[]).includes(typeText)) {
    lines.fail(`the file type is "${typeText}", expected ASCII, BINARY, BINARY32 or FLOAT32`);
  }
  const fileType = typeText as ComtradeFileType;
  if (revision === 1991 && fileType !== 'ASCII' && fileType !== 'BINARY') lines.fail(`${fileType} data came with the 2013 revision, not 1991`);

  let timeMultiplier = 1;
  if (revision !== 1991 && !lines.atEnd) {
    timeMultiplier = lines.number(lines.next('timemult')[0], 'timemult', { emptyAs: 1 });
    if (!(timeMultiplier > 0)) lines.fail(`timemult is ${timeMultiplier}, it must be above 0`);
  }
  const config: ComtradeConfig = {
    stationName: identity[0] ?? '',
    recorderId: identity[1] ?? '',
    revision,
    analogChannels,
    digitalChannels,
    lineFrequencyHz,
    sampleRates,
    firstSampleTime: first.time,
    triggerTime: trigger.time,
    fileType,
    timeMultiplier,
    timeBaseS: Math.max(first.fractionDigits, trigger.fractionDigits) > 6 ? 1e-9 : 1e-6,
  };
  if (endSampleWithoutRate !== undefined) config.endSampleWithoutRate = endSampleWithoutRate;
  if (revision === 2013 && !lines.atEnd) {
    const codes = lines.next('time_code,local_code');
    config.timeCode = codes[0] ?? '';
    config.localCode = codes[1] ?? '';
    if (!lines.atEnd) {
      const quality = lines.next('tmq_code,leapsec');
      config.timeQualityCode = quality[0] ?? '';
      config.leapSecond = quality[1] ?? '';
    }
  }
  return config;
}
