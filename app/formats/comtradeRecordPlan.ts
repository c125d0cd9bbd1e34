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

/** How times are known: from a single sample rate, or from the timestamps. */
export function fixedRateOf(config: ComtradeConfig, where: string): number | undefined {
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

/** What the ASCII and binary record readers share: the record's layout, the timing, and where they are. */
export interface ComtradeRecordContext {
  config: ComtradeConfig;
  sources: ComtradeChannelSources;
  plan: SlotPlan;
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

export function finishComtradeRecords(context: ComtradeRecordContext, out: SampleBlock[]): void {
  if (context.builder.totalSamples === 0) throw new InputError('the data file holds no samples', context.source);
  context.builder.flush(out);
}

/** Role name and channel id of a slot, for messages. */
export function describeSlot(context: ComtradeRecordContext, slot: number): string {
  const role = signalRoles[slot - 1];
  return `channel ${context.sources[role]?.id} (${role})`;
}
