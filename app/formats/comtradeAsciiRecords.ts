import { InputError } from '../errors';
import type { SampleBlock } from '../capture/samples';
import type { CaptureReader } from './captureReader';
import { fieldTextForMessage, isBlankText, parseAsciiNumber } from './asciiNumber';
import { LineSplitter } from './lineSplitter';
import { asciiMissing, checkComtradeTime, describeSlot, finishComtradeRecords, type ComtradeRecordContext } from './comtradeRecordPlan';

/** A line holding only the old end-of-file mark 0x1A (some recorders end their files with it), spaces aside. */
function isEndOfFileMark(bytes: Uint8Array, start: number, end: number): boolean {
  let sawMark = false;
  for (let index = start; index < end; index++) {
    if (bytes[index] === 0x1a) sawMark = true;
    else if (bytes[index] !== 0x20 && bytes[index] !== 0x09) return false;
  }
  return sawMark;
}

/** ASCII .dat rows `n,timestamp,A1..Ak,D1..Dm` (IEEE C37.111, REFERENCES.md); only the fields a role needs are parsed. */
export function createComtradeAsciiRecords(context: ComtradeRecordContext): Omit<CaptureReader, 'readAs'> {
  const { config, plan, secondsPerTick, builder, source, cursor, where } = context;
  const row = new Float64Array(5);
  let out: SampleBlock[] = [];
  const analogCount = config.analogChannels.length;
  const fieldCount = 2 + analogCount + config.digitalChannels.length;
  // Field index -> slot (0 = timestamp), or -1 when no role reads that field.
  const slotOfField = new Int8Array(fieldCount).fill(-1);
  slotOfField[1] = 0;
  for (let slot = 1; slot <= 4; slot++) {
    if (plan.kinds[slot] === 1) slotOfField[2 + plan.channelIndex[slot]] = slot;
    if (plan.kinds[slot] === 2) slotOfField[2 + analogCount + plan.channelIndex[slot]] = slot;
  }
  // Set while the splitter hands over a last line that has no line end.
  let lastLineUnterminated = false;
  const splitter = new LineSplitter((bytes, start, end, lineNumber) => {
    cursor.record = lineNumber;
    if (isBlankText(bytes, start, end) || isEndOfFileMark(bytes, start, end)) return;
    if (lastLineUnterminated) {
      // Every line of a C37.111 data file ends with CR LF (from memory); a last row without one is where a copy
      // stopped, and its last number may be cut ("1.2" of "1.25"), so it is not taken as a sample.
      throw new InputError(
        `the last line has no line end: the file was cut short, perhaps in the middle of a number (the rows before it hold ${builder.totalSamples} samples); copy the .dat again from the recorder`,
        where(),
      );
    }
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
          const name = slot === 0 ? 'the timestamp' : describeSlot(context, slot);
          throw new InputError(`${name} holds "${fieldTextForMessage(bytes, fieldStart, fieldEnd)}", which is not a number`, where());
        }
        if (slot === 0) {
          row[0] = value * secondsPerTick;
        } else if (plan.kinds[slot] === 1) {
          row[slot] = value === asciiMissing ? Number.NaN : value * plan.voltsPerCount[slot] + plan.offsetV[slot];
        } else {
          if (value !== 0 && value !== 1) {
            throw new InputError(`digital ${describeSlot(context, slot)} holds "${fieldTextForMessage(bytes, fieldStart, fieldEnd)}", expected 0 or 1`, where());
          }
          row[slot] = value * plan.voltsPerCount[slot] + plan.offsetV[slot];
        }
      }
      field++;
      if (fieldEnd >= end) break;
      fieldStart = fieldEnd + 1;
    }
    if (field !== fieldCount) {
      throw new InputError(`the row has ${field} fields; n, timestamp, ${analogCount} analog and ${config.digitalChannels.length} digital make ${fieldCount}`, where());
    }
    checkComtradeTime(context, row[0]);
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
      lastLineUnterminated = true;
      splitter.finish();
      finishComtradeRecords(context, out);
      return out;
    },
  };
}
