import type { ChannelMap } from '../capture/channelMap';
import { resolveChannelRoles, type FileChannel, type ResolvedRoles } from '../capture/resolveChannels';
import { signalRoles, type SignalRole } from '../capture/samples';
import type { ComtradeAnalogChannel, ComtradeConfig } from './comtradeConfig';

/** Where a role's samples come from in a record, and how to turn the stored number into volts. */
export type ComtradeChannelSource =
  /**
   * `skewUs` is the channel's sampling skew from the .cfg. It is passed on, not applied: the blocks keep one
   * time base for all roles, and a caller that cares (a few microseconds is a fraction of a degree at 50 Hz)
   * can shift its own readings.
   */
  | { kind: 'analog'; index: number; id: string; voltsPerCount: number; offsetV: number; skewUs: number }
  /** A digital channel's 0/1 becomes bit x voltsPerCount + offsetV (scale and invert of the channel map). */
  | { kind: 'digital'; index: number; id: string; voltsPerCount: number; offsetV: number };

export type ComtradeChannelSources = Record<SignalRole, ComtradeChannelSource | null>;

/** Volts per unit named in `uu`; other units are taken as volts already (our own files write V). */
const unitToVolts: Record<string, number> = { v: 1, mv: 1e-3, uv: 1e-6, µv: 1e-6, kv: 1e3 };

/**
 * Scaling of one analog channel to test-point volts:
 * 1. value = a * x + b (IEEE C37.111), in the unit `uu`; mV, uV and kV are converted to V;
 * 2. the board's test points are the measured (secondary) side, so when PS says the values are primary and
 *    the channel gives a usable ratio, the value is multiplied by secondary / primary; a zero or missing
 *    ratio leaves the value as written.
 * The two factors are folded into one multiply-add per sample.
 */
export function analogScaling(channel: ComtradeAnalogChannel): { voltsPerCount: number; offsetV: number } {
  const unitFactor = unitToVolts[channel.unit.trim().toLowerCase()] ?? 1;
  const ratioUsable = channel.primary > 0 && channel.secondary > 0 && Number.isFinite(channel.primary) && Number.isFinite(channel.secondary);
  const sideFactor = channel.scaling === 'P' && ratioUsable ? channel.secondary / channel.primary : 1;
  const factor = unitFactor * sideFactor;
  return { voltsPerCount: channel.multiplier * factor, offsetV: channel.offset * factor };
}

interface ComtradeFileChannel extends FileChannel {
  kind: 'analog' | 'digital';
  index: number;
  id: string;
}

/** The record's channels as a channel map names them: analog by id, by number or as An; digital by id or as Dn. */
export function comtradeFileChannels(config: ComtradeConfig): ComtradeFileChannel[] {
  const analog = config.analogChannels.map((channel, index): ComtradeFileChannel => ({
    kind: 'analog',
    index,
    id: channel.id.trim(),
    number: index + 1,
    names: [`A${index + 1}`, channel.id],
    label: `analog ${index + 1} "${channel.id.trim()}"`,
  }));
  const digital = config.digitalChannels.map((channel, index): ComtradeFileChannel => ({
    kind: 'digital',
    index,
    id: channel.id.trim(),
    number: null,
    names: [`D${index + 1}`, channel.id],
    label: `digital ${index + 1} "${channel.id.trim()}"`,
  }));
  return [...analog, ...digital];
}

/**
 * Finds each role's channel: by the channel map (channel id, analog channel number, An or Dn, with scale and
 * invert), else by the ids sync, ramp, gate and control (any letter case, spaces trimmed). The gate may be a digital
 * (0/1) channel; inverting a digital channel swaps 0 and 1. A design's stored map (`defaultMap`) applies when it
 * fits the record; otherwise channels named after the roles are used. Sync, ramp and gate are required.
 */
export function mapComtradeChannels(
  config: ComtradeConfig,
  channelMap?: ChannelMap,
  where = 'COMTRADE configuration',
  defaultMap?: ChannelMap,
): ComtradeChannelSources {
  const channels = comtradeFileChannels(config);
  const resolve = (map: ChannelMap | undefined) => resolveChannelRoles(channels, map, where, 'the record has');
  let resolved: ResolvedRoles<ComtradeFileChannel>;
  if (channelMap !== undefined || defaultMap === undefined) resolved = resolve(channelMap);
  else {
    try {
      resolved = resolve(defaultMap);
    } catch (designError) {
      try {
        resolved = resolve(undefined);
      } catch {
        throw designError;
      }
    }
  }
  const sources = {} as ComtradeChannelSources;
  for (const role of signalRoles) {
    const entry = resolved[role];
    if (entry === null) {
      sources[role] = null;
      continue;
    }
    const { channel, pick } = entry;
    const factor = pick.invert ? -pick.scale : pick.scale;
    if (channel.kind === 'analog') {
      const scaling = analogScaling(config.analogChannels[channel.index]);
      sources[role] = {
        kind: 'analog',
        index: channel.index,
        id: channel.id,
        voltsPerCount: scaling.voltsPerCount * factor,
        offsetV: scaling.offsetV * factor,
        skewUs: config.analogChannels[channel.index].skewUs,
      };
    } else {
      sources[role] = { kind: 'digital', index: channel.index, id: channel.id, voltsPerCount: factor, offsetV: pick.invert ? pick.scale : 0 };
    }
  }
  return sources;
}

/** `sync=analog 1 "VA", ...` for the "read as" line. */
export function describeComtradeSources(sources: ComtradeChannelSources): string {
  return signalRoles
    .flatMap((role) => {
      const source = sources[role];
      return source === null ? [] : [`${role}=${source.kind} ${source.index + 1} "${source.id}"`];
    })
    .join(', ');
}
