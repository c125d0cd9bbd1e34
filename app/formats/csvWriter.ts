import { InputError } from '../errors';
import type { SampleBlock } from '../capture/samples';

export interface CsvWriterOptions {
  /**
   * Decimals for volts. Left out, each value is written in its shortest exact form (`String(value)`),
   * so reading the file back gives the very same numbers.
   */
  voltFractionDigits?: number;
  /** Decimals for t in seconds; 9 (one nanosecond) keeps even a 200 kS/s capture's times exact to 0.02 % of a period. */
  timeFractionDigits?: number;
  /** Line end; LF unless asked otherwise. */
  lineEnd?: '\n' | '\r\n';
}

export interface CsvWriter {
  /** Text for one block; the first call also yields the header. */
  write(block: SampleBlock): string;
}

/**
 * Writes our CSV capture: `t,sync,ramp,gate[,control]` (NAMING.md). The control column is written when the
 * first block has it; every later block must agree. A missing sample (NaN) is written as `NaN`.
 */
export function createCsvWriter(options: CsvWriterOptions = {}): CsvWriter {
  const lineEnd = options.lineEnd ?? '\n';
  const timeDigits = options.timeFractionDigits ?? 9;
  const voltDigits = options.voltFractionDigits;
  // String(-0) is "0"; keep the sign so the text reads back to the very same double.
  const formatVolts = voltDigits === undefined ? (value: number) => (value === 0 && 1 / value < 0 ? '-0' : String(value)) : (value: number) => (value === value ? value.toFixed(voltDigits) : 'NaN');
  let hasControl: boolean | undefined;
  return {
    write(block) {
      const parts: string[] = [];
      if (hasControl === undefined) {
        hasControl = block.control !== null;
        parts.push(hasControl ? `t,sync,ramp,gate,control${lineEnd}` : `t,sync,ramp,gate${lineEnd}`);
      } else if (hasControl !== (block.control !== null)) {
        throw new InputError(`a block ${hasControl ? 'lacks' : 'adds'} the control signal part way through the capture (at ${block.startS} s)`);
      }
      const { sync, ramp, gate, control, startS, sampleRateHz } = block;
      for (let index = 0; index < sync.length; index++) {
        const timeS = startS + index / sampleRateHz;
        let line = `${timeS.toFixed(timeDigits)},${formatVolts(sync[index])},${formatVolts(ramp[index])},${formatVolts(gate[index])}`;
        if (control !== null) line += `,${formatVolts(control[index])}`;
        parts.push(line + lineEnd);
      }
      return parts.join('');
    },
  };
}

/** All of a capture as CSV text chunks, one per block (the first with the header). */
export function* formatCsv(blocks: Iterable<SampleBlock>, options: CsvWriterOptions = {}): Generator<string> {
  const writer = createCsvWriter(options);
  for (const block of blocks) yield writer.write(block);
}
