import { InputError } from '../errors';
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
  | { kind: 'digital'; index: number; id: string };

export type ComtradeChannelSources = Record<SignalRole, ComtradeChannelSource | null>;

const requiredRoles: readonly SignalRole[] = ['sync', 'ramp', 'gate'];

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

/**
 * Finds each role's channel by channel id: by default the ids sync, ramp, gate and control (any letter case,
 * spaces trimmed); `channelMap` names other ids per role. Analog channels are searched first, then digital
 * ones, so the gate may be a digital (0/1) channel. Sync, ramp and gate are required; control is optional.
 */
export function mapComtradeChannels(
  config: ComtradeConfig,
  channelMap: Partial<Record<SignalRole, string>> = {},
  where = 'COMTRADE configuration',
): ComtradeChannelSources {
  const normalise = (id: string) => id.trim().toLowerCase();
  const sources = {} as ComtradeChannelSources;
  const missing: string[] = [];
  for (const role of signalRoles) {
    const wanted = normalise(channelMap[role] ?? role);
    const analogIndex = config.analogChannels.findIndex((channel) => normalise(channel.id) === wanted);
    const digitalIndex = config.digitalChannels.findIndex((channel) => normalise(channel.id) === wanted);
    if (analogIndex >= 0) {
      const channel = config.analogChannels[analogIndex];
      sources[role] = { kind: 'analog', index: analogIndex, id: channel.id, ...analogScaling(channel), skewUs: channel.skewUs };
    } else if (digitalIndex >= 0) {
      sources[role] = { kind: 'digital', index: digitalIndex, id: config.digitalChannels[digitalIndex].id };
    } else {
      sources[role] = null;
      if (requiredRoles.includes(role)) missing.push(channelMap[role] === undefined ? `${role}` : `${role} (channel id "${channelMap[role]}")`);
    }
  }
  if (missing.length > 0) {
    const available = [...config.analogChannels, ...config.digitalChannels].map((channel) => channel.id);
    const shown = available.slice(0, 12).join(', ') + (available.length > 12 ? ', ...' : '');
    throw new InputError(
      `no channel for ${missing.join(', ')}; the record has ${available.length === 0 ? 'no channels' : `channels ${shown}`} ` +
        '(name the channel for each role in the channel map)',
      where,
    );
  }
  return sources;
}
