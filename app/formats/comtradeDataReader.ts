import { InputError } from '../errors';
import { signalRoles, type SampleBlock, type SignalRole } from '../capture/samples';
import { defaultBlockSamples, type CaptureReader } from './captureReader';
import { fieldTextForMessage, isBlankText, parseAsciiNumber } from './asciiNumber';
import { comtradeRecordBytes, type ComtradeConfig } from './comtradeConfig';
import { mapComtradeChannels, type ComtradeChannelSources } from './comtradeChannelMap';
import { LineSplitter } from './lineSplitter';
import { SampleBlockBuilder } from './sampleBlockBuilder';

export interface ComtradeDataReaderOptions {
  /** Channel id per role when the record does not use the ids sync, ramp, gate, control. */
  channelMap?: Partial<Record<SignalRole, string>>;
  blockSamples?: number;
  /** Data file name for error messages. */
  source?: string;
}

/**
 * Missing-value markers (REFERENCES.md, from memory): ASCII 99999 or an empty field, BINARY 0x8000,
 * BINARY32 0x80000000; FLOAT32 marks a gap with a NaN pattern already. A missing analog sample becomes NaN
 * in the block, so analysis sees it; a missing timestamp (0xFFFFFFFF, or an empty ASCII field) is only
 * allowed when the configuration gives a sample rate.
 */
const asciiMissing = 99999;
const int16Missing = -0x8000;
const int32Missing = -0x80000000;
const timestampMissing = 0xffffffff;

/** How times are known: from a single sample rate, or from the timestamps. */
function fixedRateOf(config: ComtradeConfig, where: string): number | undefined {
  const rates = config.sampleRates.filter((rate) => rate.rateHz > 0);
  if (rates.length === 0) return undefined;
  const first = rates[0].rateHz;
  if (rates.some((rate) => Math.abs(rate.rateHz - first) > 1e-9 * first)) {
    const listed = rates.map((rate) => `${rate.rateHz} Hz`).join(', ');
    throw new InputError(`the record changes sample rate (${listed}); only single-rate records are read`, where);
  }
  if (rates.length !== config.sampleRates.length) {
    throw new InputError('the record mixes a sample rate line with samp = 0; only single-rate records are read', where);
  }
  return first;
}

/** Slot layout shared by both encodings: slot 1..4 = sync, ramp, gate, control (0 is time). */
interface SlotPlan {
  kinds: Int8Array; // 0 none, 1 analog, 2 digital
  channelIndex: Int32Array;
  voltsPerCount: Float64Array;
  offsetV: Float64Array;
}

function planSlots(sources: ComtradeChannelSources): SlotPlan {
  const plan: SlotPlan = {
    kinds: new Int8Array(5),
    channelIndex: new Int32Array(5),
    voltsPerCount: new Float64Array(5),
    offsetV: new Float64Array(5),
  };
  signalRoles.forEach((role, roleIndex) => {
    const slot = roleIndex + 1;
    const source = sources[role];
    if (source === null) return;
    plan.channelIndex[slot] = source.index;
    if (source.kind === 'analog') {
      plan.kinds[slot] = 1;
      plan.voltsPerCount[slot] = source.voltsPerCount;
      plan.offsetV[slot] = source.offsetV;
    } else {
      plan.kinds[slot] = 2;
    }
  });
  return plan;
}

/**
 * Streaming reader for a COMTRADE .dat (IEEE C37.111; ASCII, BINARY, BINARY32 or FLOAT32 as its .cfg says).
 * Binary records are little-endian: 4-byte sample number, 4-byte timestamp, the analog values, then the
 * digitals packed 16 to a 2-byte word, first channel in the lowest bit (REFERENCES.md).
 * Timing: one sample rate from the nrates lines (times = first timestamp + k / rate); with nrates = 0 the
 * timestamps times timemult (microseconds, or nanoseconds when the .cfg dates carry nine decimals) give each
 * sample's time, and a jump of more than 1.5 periods is a gap. The sample number field is not used.
 */
export function createComtradeDataReader(config: ComtradeConfig, options: ComtradeDataReaderOptions = {}): CaptureReader {
  const source = options.source ?? 'COMTRADE data';
  const sources = mapComtradeChannels(config, options.channelMap, source);
  const plan = planSlots(sources);
  const fixedRateHz = fixedRateOf(config, source);
  const secondsPerTick = config.timeMultiplier * config.timeBaseS;
  let recordNumber = 0;
  let out: SampleBlock[] = [];
  const where = (): string => (config.fileType === 'ASCII' ? `${source}, line ${recordNumber}` : `${source}, record ${recordNumber}`);
  const builder = new SampleBlockBuilder({
    blockSamples: options.blockSamples ?? defaultBlockSamples,
    hasControl: sources.control !== null,
    fixedRateHz,
    where,
  });
  const row = new Float64Array(5);
  const checkTime = (timeS: number): void => {
    if (fixedRateHz === undefined && timeS !== timeS) {
      throw new InputError('the timestamp is missing and the configuration gives no sample rate (nrates 0)', where());
    }
  };

  const finishCommon = (samplesSeen: number): void => {
    if (samplesSeen === 0) throw new InputError('the data file holds no samples', source);
    builder.flush(out);
  };

  if (config.fileType === 'ASCII') {
    const analogCount = config.analogChannels.length;
    const fieldCount = 2 + analogCount + config.digitalChannels.length;
    // Field index -> slot (0 = timestamp), or -1 when no role reads that field.
    const slotOfField = new Int8Array(fieldCount).fill(-1);
    slotOfField[1] = 0;
    for (let slot = 1; slot <= 4; slot++) {
      if (plan.kinds[slot] === 1) slotOfField[2 + plan.channelIndex[slot]] = slot;
      if (plan.kinds[slot] === 2) slotOfField[2 + analogCount + plan.channelIndex[slot]] = slot;
    }
    const splitter = new LineSplitter((bytes, start, end, lineNumber) => {
      recordNumber = lineNumber;
      if (isBlankText(bytes, start, end)) return;
      let field = 0;
      let fieldStart = start;
      for (;;) {
        let fieldEnd = fieldStart;
        while (fieldEnd < end && bytes[fieldEnd] !== 0x2c) fieldEnd++;
        const slot = field < fieldCount ? slotOfField[field] : -1;
        if (slot >= 0) {
          const blank = isBlankText(bytes, fieldStart, fieldEnd);
          const value = blank ? Number.NaN : parseAsciiNumber(bytes, fieldStart, fieldEnd);
          if (!blank && value !== value) {
            const name = slot === 0 ? 'the timestamp' : `channel ${sources[signalRoles[slot - 1]]?.id} (${signalRoles[slot - 1]})`;
            throw new InputError(`${name} holds "${fieldTextForMessage(bytes, fieldStart, fieldEnd)}", which is not a number`, where());
          }
          if (slot === 0) {
            row[0] = value * secondsPerTick;
          } else if (plan.kinds[slot] === 1) {
            row[slot] = value === asciiMissing ? Number.NaN : value * plan.voltsPerCount[slot] + plan.offsetV[slot];
          } else {
            if (value !== 0 && value !== 1) {
              throw new InputError(`digital channel ${sources[signalRoles[slot - 1]]?.id} holds "${fieldTextForMessage(bytes, fieldStart, fieldEnd)}", expected 0 or 1`, where());
            }
            row[slot] = value;
          }
        }
        field++;
        if (fieldEnd >= end) break;
        fieldStart = fieldEnd + 1;
      }
      if (field !== fieldCount) {
        throw new InputError(`the row has ${field} fields; n, timestamp, ${analogCount} analog and ${config.digitalChannels.length} digital make ${fieldCount}`, where());
      }
      checkTime(row[0]);
      builder.append(row[0], row[1], row[2], row[3], row[4], out);
    }, source);
    return {
      push(chunk) {
        out = [];
        splitter.push(chunk);
        return out;
      },
      finish() {
        out = [];
        splitter.finish();
        finishCommon(builder.totalSamples);
        return out;
      },
    };
  }

  const recordBytes = comtradeRecordBytes(config);
  const analogBytes = config.fileType === 'BINARY' ? 2 : 4;
  const digitalStart = 8 + config.analogChannels.length * analogBytes;
  const byteOffset = new Int32Array(5);
  const bitMask = new Int32Array(5);
  for (let slot = 1; slot <= 4; slot++) {
    if (plan.kinds[slot] === 1) byteOffset[slot] = 8 + plan.channelIndex[slot] * analogBytes;
    if (plan.kinds[slot] === 2) {
      byteOffset[slot] = digitalStart + 2 * (plan.channelIndex[slot] >> 4);
      bitMask[slot] = 1 << (plan.channelIndex[slot] & 15);
    }
  }
  const fileType = config.fileType;
  const carry = new Uint8Array(recordBytes);
  const carryView = new DataView(carry.buffer);
  let carryLength = 0;

  const valueType = fileType === 'BINARY' ? 0 : fileType === 'BINARY32' ? 1 : 2;
  const { kinds, voltsPerCount, offsetV } = plan;
  /** Volts (or 0/1) of one role's slot in the record at `offset`. */
  const slotValue = (view: DataView, offset: number, slot: number): number => {
    const kind = kinds[slot];
    if (kind === 1) {
      const at = offset + byteOffset[slot];
      let count: number;
      if (valueType === 0) {
        count = view.getInt16(at, true);
        if (count === int16Missing) return Number.NaN;
      } else if (valueType === 1) {
        count = view.getInt32(at, true);
        if (count === int32Missing) return Number.NaN;
      } else {
        count = view.getFloat32(at, true);
      }
      return count * voltsPerCount[slot] + offsetV[slot];
    }
    if (kind === 2) return (view.getUint16(offset + byteOffset[slot], true) & bitMask[slot]) === 0 ? 0 : 1;
    return 0;
  };
  const timeOf = (view: DataView, offset: number): number => {
    const ticks = view.getUint32(offset + 4, true);
    return ticks === timestampMissing ? Number.NaN : ticks * secondsPerTick;
  };

  const decode = (view: DataView, offset: number): void => {
    recordNumber++;
    row[0] = timeOf(view, offset);
    checkTime(row[0]);
    builder.append(row[0], slotValue(view, offset, 1), slotValue(view, offset, 2), slotValue(view, offset, 3), slotValue(view, offset, 4), out);
  };

  /**
   * With a fixed rate, whole runs of records go straight into the block's arrays: no per-sample call into the
   * builder (the timestamps are not needed beyond the first record's, which sets the time origin).
   */
  const decodeRun = (view: DataView, start: number, records: number): void => {
    let done = 0;
    while (done < records) {
      const run = Math.min(builder.roomInBlock, records - done);
      const { sync, ramp, gate, control } = builder.buffers();
      const base = builder.writeIndex;
      let offset = start + done * recordBytes;
      const firstTimeS = timeOf(view, offset);
      for (let index = 0; index < run; index++, offset += recordBytes) {
        sync[base + index] = slotValue(view, offset, 1);
        ramp[base + index] = slotValue(view, offset, 2);
        gate[base + index] = slotValue(view, offset, 3);
        if (control !== null) control[base + index] = slotValue(view, offset, 4);
      }
      recordNumber += run;
      builder.commitFixedRate(run, firstTimeS, out);
      done += run;
    }
  };

  return {
    push(chunk) {
      out = [];
      if (typeof chunk === 'string') throw new InputError(`${fileType} data is binary: pass bytes, not text`, source);
      let position = 0;
      if (carryLength > 0) {
        const taken = Math.min(recordBytes - carryLength, chunk.length);
        carry.set(chunk.subarray(0, taken), carryLength);
        carryLength += taken;
        position = taken;
        if (carryLength < recordBytes) return out;
        decode(carryView, 0);
        carryLength = 0;
      }
      const view = new DataView(chunk.buffer, chunk.byteOffset, chunk.byteLength);
      const wholeRecords = Math.floor((chunk.length - position) / recordBytes);
      if (fixedRateHz !== undefined) {
        decodeRun(view, position, wholeRecords);
        position += wholeRecords * recordBytes;
      } else {
        for (let index = 0; index < wholeRecords; index++) {
          decode(view, position);
          position += recordBytes;
        }
      }
      if (position < chunk.length) {
        carry.set(chunk.subarray(position), 0);
        carryLength = chunk.length - position;
      }
      return out;
    },
    finish() {
      out = [];
      if (carryLength > 0) {
        throw new InputError(
          `the data ends inside record ${recordNumber + 1}: ${carryLength} of its ${recordBytes} bytes ` +
            `(${config.analogChannels.length} analog, ${config.digitalChannels.length} digital, ${fileType}); is the .cfg the one for this .dat?`,
          source,
        );
      }
      finishCommon(builder.totalSamples);
      return out;
    },
  };
}
