import type { SignalRole } from '../capture/samples';
import { defaultBlockSamples, type CaptureReader } from './captureReader';
import type { ComtradeConfig } from './comtradeConfig';
import { mapComtradeChannels } from './comtradeChannelMap';
import { SampleBlockBuilder } from './sampleBlockBuilder';
import { fixedRateOf, planSlots, type ComtradeRecordContext } from './comtradeRecordPlan';
import { createComtradeAsciiRecords } from './comtradeAsciiRecords';
import { createComtradeBinaryRecords } from './comtradeBinaryRecords';

export interface ComtradeDataReaderOptions {
  /** Channel id per role when the record does not use the ids sync, ramp, gate, control. */
  channelMap?: Partial<Record<SignalRole, string>>;
  blockSamples?: number;
  /** Data file name for error messages. */
  source?: string;
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
  const cursor = { record: 0 };
  const where = (): string => (config.fileType === 'ASCII' ? `${source}, line ${cursor.record}` : `${source}, record ${cursor.record}`);
  const builder = new SampleBlockBuilder({
    blockSamples: options.blockSamples ?? defaultBlockSamples,
    hasControl: sources.control !== null,
    fixedRateHz,
    where,
  });
  const context: ComtradeRecordContext = { config, sources, plan, fixedRateHz, secondsPerTick, builder, source, cursor, where };
  return config.fileType === 'ASCII' ? createComtradeAsciiRecords(context) : createComtradeBinaryRecords(context);
}
