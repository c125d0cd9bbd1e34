import { InputError } from '../errors';
import type { SampleBlock } from '../capture/samples';
import type { CaptureReader } from './captureReader';
import { comtradeRecordBytes } from './comtradeConfig';
import { checkComtradeTime, finishComtradeRecords, int16Missing, int32Missing, timestampMissing, type ComtradeRecordContext } from './comtradeRecordPlan';

/**
 * Binary .dat records (IEEE C37.111, REFERENCES.md), little-endian: 4-byte sample number, 4-byte timestamp,
 * the analogs (int16 BINARY, int32 BINARY32, float32 FLOAT32), then the digitals packed 16 to a 2-byte word,
 * first channel in the lowest bit. A record cut by a chunk boundary is gathered in a small carry buffer.
 */
export function createComtradeBinaryRecords(context: ComtradeRecordContext): Omit<CaptureReader, 'readAs'> {
  const { config, plan, fixedRateHz, secondsPerTick, builder, source, cursor } = context;
  const row = new Float64Array(5);
  let out: SampleBlock[] = [];
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
    if (kind === 2) return ((view.getUint16(offset + byteOffset[slot], true) & bitMask[slot]) === 0 ? 0 : voltsPerCount[slot]) + offsetV[slot];
    return 0;
  };
  const timeOf = (view: DataView, offset: number): number => {
    const ticks = view.getUint32(offset + 4, true);
    return ticks === timestampMissing ? Number.NaN : ticks * secondsPerTick;
  };

  const decode = (view: DataView, offset: number): void => {
    cursor.record++;
    row[0] = timeOf(view, offset);
    checkComtradeTime(context, row[0]);
    builder.append(row[0], slotValue(view, offset, 1), slotValue(view, offset, 2), slotValue(view, offset, 3), slotValue(view, offset, 4), out);
  };

  /**
   * One role's values of `records` records from `offset` into `target` from `base`: slotValue's arithmetic, with its
   * choice of type made once per run instead of once per value (a column at a time, the loop does one thing).
   */
  const fillSlot = (view: DataView, offset: number, records: number, slot: number, target: Float64Array, base: number): void => {
    const kind = kinds[slot];
    const scale = voltsPerCount[slot];
    const shift = offsetV[slot];
    let at = offset + byteOffset[slot];
    const end = base + records;
    if (kind === 1 && valueType === 0) {
      for (let index = base; index < end; index++, at += recordBytes) {
        const count = view.getInt16(at, true);
        target[index] = count === int16Missing ? Number.NaN : count * scale + shift;
      }
    } else if (kind === 1 && valueType === 1) {
      for (let index = base; index < end; index++, at += recordBytes) {
        const count = view.getInt32(at, true);
        target[index] = count === int32Missing ? Number.NaN : count * scale + shift;
      }
    } else if (kind === 1) {
      for (let index = base; index < end; index++, at += recordBytes) target[index] = view.getFloat32(at, true) * scale + shift;
    } else if (kind === 2) {
      const mask = bitMask[slot];
      for (let index = base; index < end; index++, at += recordBytes) target[index] = ((view.getUint16(at, true) & mask) === 0 ? 0 : scale) + shift;
    } else {
      target.fill(0, base, end);
    }
  };

  /**
   * With a fixed rate, whole runs of records go straight into the block's arrays: no per-sample call into the
   * builder (the timestamps are not needed beyond the first record's, which sets the time origin).
   */
  const decodeRun = (view: DataView, start: number, records: number): void => {
    let done = 0;
    while (done < records) {
      builder.nextRateIfDue(out);
      const run = Math.min(builder.roomInBlock, records - done);
      const { sync, ramp, gate, control } = builder.buffers();
      const base = builder.writeIndex;
      const offset = start + done * recordBytes;
      const firstTimeS = timeOf(view, offset);
      fillSlot(view, offset, run, 1, sync, base);
      fillSlot(view, offset, run, 2, ramp, base);
      fillSlot(view, offset, run, 3, gate, base);
      if (control !== null) fillSlot(view, offset, run, 4, control, base);
      cursor.record += run;
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
          `the data ends inside record ${cursor.record + 1}: ${carryLength} of its ${recordBytes} bytes ` +
            `(${config.analogChannels.length} analog, ${config.digitalChannels.length} digital, ${fileType}); is the .cfg the one for this .dat?`,
          source,
        );
      }
      finishComtradeRecords(context, out);
      return out;
    },
  };
}
