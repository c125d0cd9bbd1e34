import { InputError } from '../errors';
import { signalRoles, type SampleBlock } from '../capture/samples';
import type { ComtradeConfig } from './comtradeConfig';
import type { ComtradeChannelSources } from './comtradeChannelMap';
import type { SampleBlockBuilder } from './sampleBlockBuilder';

/**
 * Missing-value markers (REFERENCES.md, from memory): ASCII 99999 or an empty field, BINARY 0x8000,
 * BINARY32 0x80000000; FLOAT32 marks a gap with a NaN pattern already. A missing analog sample becomes NaN
 * in the block, so analysis sees it; a missing timestamp (0xFFFFFFFF, or an empty ASCII field) is only
 * allowed when the configuration gives a sample rate.
 */
export const asciiMissing = 99999;
export const int16Missing = -0x8000;
export const int32Missing = -0x80000000;
export const timestampMissing = 0xffffffff;

/**
 * How times are known: from the sample rates (one, or several that change part-way: each up to its endsamp), or
 * from the timestamps (nrates 0, or a single rate of 0). A rate line of 0 among others is refused: the record
 * would be half timed by rate and half by timestamp.
 */
export function ratePlanOf(config: ComtradeConfig, where: string): { rateHz: number; endSample: number }[] | undefined {
  const rates = config.sampleRates;
  if (rates.length === 0 || rates.every((rate) => rate.rateHz === 0)) return undefined;
  if (rates.some((rate) => !(rate.rateHz > 0))) {
    throw new InputError(`the record mixes sample rates with samp = 0 (${rates.map((rate) => `${rate.rateHz} Hz`).join(', ')}): give each rate, or all 0 for timestamps`, where);
  }
  for (let index = 1; index < rates.length; index++) {
    if (rates[index].endSample <= rates[index - 1].endSample) {
      throw new InputError(`endsamp of rate ${index + 1} (${rates[index].endSample}) is not after that of rate ${index} (${rates[index - 1].endSample})`, where);
    }
  }
  return rates.map((rate) => ({ rateHz: rate.rateHz, endSample: rate.endSample }));
}

/** Slot layout shared by both encodings: slot 1..4 = sync, ramp, gate, control (0 is time). */
export interface SlotPlan {
  kinds: Int8Array; // 0 none, 1 analog, 2 digital
  channelIndex: Int32Array;
  voltsPerCount: Float64Array;
  offsetV: Float64Array;
}

export function planSlots(sources: ComtradeChannelSources): SlotPlan {
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
    plan.kinds[slot] = source.kind === 'analog' ? 1 : 2;
    plan.voltsPerCount[slot] = source.voltsPerCount;
    plan.offsetV[slot] = source.offsetV;
  });
  return plan;
}

/** What the ASCII and binary record readers share: the record's layout, the timing, and where they are. */
export interface ComtradeRecordContext {
  config: ComtradeConfig;
  sources: ComtradeChannelSources;
  plan: SlotPlan;
  /** The first sample rate, undefined when times come from the timestamps. */
  fixedRateHz: number | undefined;
  /** Seconds per timestamp unit: timemult x the time base. */
  secondsPerTick: number;
  builder: SampleBlockBuilder;
  source: string;
  /** Line (ASCII) or record (binary) being read, for messages. */
  cursor: { record: number };
  where: () => string;
}

/** A timestamp may be missing only when a sample rate gives the times. */
export function checkComtradeTime(context: ComtradeRecordContext, timeS: number): void {
  if (context.fixedRateHz === undefined && timeS !== timeS) {
    throw new InputError('the timestamp is missing and the configuration gives no sample rate (nrates 0)', context.where());
  }
}

/** The number of samples the configuration says the record holds: the last endsamp, or 0 when it does not say. */
export function declaredSampleCount(config: ComtradeConfig): number {
  const rates = config.sampleRates;
  return rates.length > 0 ? rates[rates.length - 1].endSample : (config.endSampleWithoutRate ?? 0);
}

/** Seconds the samples after `fromSample` up to `toSample` (sample numbers from 1) span under the rate plan. */
function secondsBetweenSamples(config: ComtradeConfig, fromSample: number, toSample: number): number | null {
  let seconds = 0;
  let previousEnd = 0;
  for (const rate of config.sampleRates) {
    if (!(rate.rateHz > 0)) return null;
    const first = Math.max(fromSample, previousEnd);
    const last = Math.min(toSample, rate.endSample);
    if (last > first) seconds += (last - first) / rate.rateHz;
    previousEnd = rate.endSample;
  }
  return seconds;
}

/**
 * The end of the data: it must hold the samples the configuration's endsamp announces. A .dat cut at a record
 * boundary otherwise reads as a shorter capture with nothing said (half the file gave a 0.25 s capture).
 */
export function finishComtradeRecords(context: ComtradeRecordContext, out: SampleBlock[]): void {
  const read = context.builder.totalSamples;
  if (read === 0) throw new InputError('the data file holds no samples', context.source);
  const declared = declaredSampleCount(context.config);
  if (read < declared) {
    const missing = declared - read;
    const seconds = secondsBetweenSamples(context.config, read, declared);
    const span = seconds === null ? '' : ` (${Number(seconds.toPrecision(3))} s of signal)`;
    throw new InputError(
      `the data ends after sample ${read}, but the configuration's last sample (endsamp) is ${declared}: ${missing} samples${span} are missing. ` +
        'The file was cut short; copy it again from the recorder (or check that the .cfg is the one for this .dat)',
      context.source,
    );
  }
  context.builder.flush(out);
}

/** Role name and channel id of a slot, for messages. */
export function describeSlot(context: ComtradeRecordContext, slot: number): string {
  const role = signalRoles[slot - 1];
  return `channel ${context.sources[role]?.id} (${role})`;
}
