import type { ChannelMap } from '../capture/channelMap';
import { defaultBlockSamples, type CaptureReader } from './captureReader';
import type { ComtradeConfig } from './comtradeConfig';
import { describeComtradeSources, mapComtradeChannels } from './comtradeChannelMap';
import { SampleBlockBuilder } from './sampleBlockBuilder';
import { planSlots, ratePlanOf, type ComtradeRecordContext } from './comtradeRecordPlan';
import { createComtradeAsciiRecords } from './comtradeAsciiRecords';
import { createComtradeBinaryRecords } from './comtradeBinaryRecords';

export interface ComtradeDataReaderOptions {
  /** Which channel is which role (by id, number, An or Dn, with scale and invert), when the ids are not sync, ramp, gate, control. */
  channelMap?: ChannelMap;
  /** A board design's stored map: used when it fits the record. */
  defaultMap?: ChannelMap;
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
  const sources = mapComtradeChannels(config, options.channelMap, source, options.defaultMap);
  const plan = planSlots(sources);
  const ratePlan = ratePlanOf(config, source);
  const fixedRateHz = ratePlan?.[0].rateHz;
  const secondsPerTick = config.timeMultiplier * config.timeBaseS;
  const cursor = { record: 0 };
  const where = (): string => (config.fileType === 'ASCII' ? `${source}, line ${cursor.record}` : `${source}, record ${cursor.record}`);
  const builder = new SampleBlockBuilder({
    blockSamples: options.blockSamples ?? defaultBlockSamples,
    hasControl: sources.control !== null,
    ratePlan,
    where,
  });
  const context: ComtradeRecordContext = { config, sources, plan, fixedRateHz, secondsPerTick, builder, source, cursor, where };
  const records = config.fileType === 'ASCII' ? createComtradeAsciiRecords(context) : createComtradeBinaryRecords(context);
  const readAs = describeComtradeRecord(config, ratePlan, sources);
  return { ...records, readAs: () => readAs };
}

function formatHz(rateHz: number): string {
  return rateHz >= 1000 ? `${+(rateHz / 1000).toPrecision(4)} kS/s` : `${+rateHz.toPrecision(4)} S/s`;
}

/** `COMTRADE 2013 BINARY, 4 analog + 4 digital channels, 1.2 kS/s, timemult 0.5; sync=analog 1 "IA", ...` */
export function describeComtradeRecord(config: ComtradeConfig, ratePlan: readonly { rateHz: number; endSample: number }[] | undefined, sources: Parameters<typeof describeComtradeSources>[0]): string {
  const timing =
    ratePlan === undefined
      ? 'times from the timestamps'
      : ratePlan.length === 1
        ? formatHz(ratePlan[0].rateHz)
        : `${ratePlan.length} rates (${ratePlan.map((rate, index) => `${formatHz(rate.rateHz)} ${index === ratePlan.length - 1 ? 'to the end' : `to sample ${rate.endSample}`}`).join(', ')})`;
  const multiplier = config.timeMultiplier !== 1 && ratePlan === undefined ? `, timemult ${config.timeMultiplier}` : '';
  return `COMTRADE ${config.revision} ${config.fileType}, ${config.analogChannels.length} analog + ${config.digitalChannels.length} digital channels, ${timing}${multiplier}; ${describeComtradeSources(sources)}`;
}
