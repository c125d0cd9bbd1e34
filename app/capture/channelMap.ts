/**
 * A channel map says which channel of a capture file holds each test point, for files that do not name their
 * columns sync, ramp, gate, control: an instrument's CH1..CH4, a recorder's channel ids. Each role names its
 * channel by name (any letter case; a CSV header's unit may be left off) or by 1-based number, and may carry a
 * scale (a 10:1 probe left at 1:1 on the instrument shows a tenth of the voltage: x10) and an inversion.
 * Written on the command line as `--map sync=CH1,ramp=CH2:x10,gate=3:invert[,control=CH4][,time=none]`, and in a
 * board design as `channelMap` (a bench that always wires the same way states it once).
 */
import { z } from 'zod';
import { InputError } from '../errors';
import { signalRoles, type SignalRole } from './samples';

/** A channel by name or by 1-based number (CSV: the column's position; COMTRADE: the analog channel's number). */
export type ChannelRef = string | number;

export interface ChannelPick {
  channel: ChannelRef;
  /** Volts are multiplied by this (a 10:1 probe shown at 1:1: 10). */
  scale: number;
  /** The value is negated (a digital channel's 0 and 1 swap). */
  invert: boolean;
}

export interface ChannelMap {
  sync?: ChannelPick;
  ramp?: ChannelPick;
  gate?: ChannelPick;
  control?: ChannelPick;
  /** CSV only: the time column by name or number, or null for a file whose columns hold no time. */
  time?: ChannelRef | null;
}

const channelRefSchema = z.union([z.string().trim().min(1, 'a channel name must not be empty'), z.number().int().positive('a channel number counts from 1')]);

const pickSchema = z
  .union([
    channelRefSchema,
    z
      .object({
        channel: channelRefSchema,
        scale: z.number().finite().positive('a channel scale must be above 0 (use invert for a negative sign)').max(1e6).default(1),
        invert: z.boolean().default(false),
      })
      .strict(),
  ])
  .transform((value): ChannelPick => (typeof value === 'object' ? value : { channel: value, scale: 1, invert: false }));

/** The design file's form: a role names its channel alone (`"sync": "CH1"`) or with scale and invert. */
export const channelMapSchema = z
  .object({
    sync: pickSchema.optional(),
    ramp: pickSchema.optional(),
    gate: pickSchema.optional(),
    control: pickSchema.optional(),
    time: z.union([channelRefSchema, z.null()]).optional(),
  })
  .strict();

/** The option the map is given with, for messages that tell the technician what to change. */
export const channelMapOption = '--map';

const mapKeys = [...signalRoles, 'time'] as const;
type MapKey = (typeof mapKeys)[number];

/** Splits `text` at commas outside double quotes. */
function splitOutsideQuotes(text: string): string[] {
  const parts: string[] = [];
  let current = '';
  let quoted = false;
  for (const character of text) {
    if (character === '"') quoted = !quoted;
    if (character === ',' && !quoted) {
      parts.push(current);
      current = '';
    } else {
      current += character;
    }
  }
  parts.push(current);
  return parts;
}

function parseRef(text: string, where: string, entry: string): ChannelRef {
  const trimmed = text.trim();
  if (trimmed.startsWith('"')) {
    if (!trimmed.endsWith('"') || trimmed.length < 3) throw new InputError(`"${entry}": a quoted channel name needs its closing quote`, where);
    return trimmed.slice(1, -1);
  }
  if (trimmed === '') throw new InputError(`"${entry}" names no channel`, where);
  if (/^\d+$/.test(trimmed)) {
    const number = Number(trimmed);
    if (number < 1) throw new InputError(`"${entry}": channel numbers count from 1`, where);
    return number;
  }
  return trimmed;
}

/**
 * Reads the command-line form: `role=channel[:xSCALE][:invert]` entries separated by commas, roles sync, ramp,
 * gate, control and time (`time=none` for a CSV without a time column). A bare number is a 1-based column (or
 * channel) number; a name in double quotes is always a name, even when it is a number or holds a comma or colon.
 */
export function parseChannelMap(text: string, where = channelMapOption): ChannelMap {
  const map: ChannelMap = {};
  const seen = new Set<MapKey>();
  for (const rawEntry of splitOutsideQuotes(text)) {
    const entry = rawEntry.trim();
    if (entry === '') continue;
    const equals = entry.indexOf('=');
    if (equals < 0) throw new InputError(`"${entry}" is not role=channel (e.g. sync=CH1)`, where);
    const key = entry.slice(0, equals).trim().toLowerCase();
    if (!(mapKeys as readonly string[]).includes(key)) {
      throw new InputError(`"${entry.slice(0, equals).trim()}" is not a role: use sync, ramp, gate, control or time`, where);
    }
    const role = key as MapKey;
    if (seen.has(role)) throw new InputError(`${role} is given twice`, where);
    seen.add(role);
    let rest = entry.slice(equals + 1).trim();
    if (role === 'time') {
      map.time = rest.toLowerCase() === 'none' ? null : parseRef(rest, where, entry);
      continue;
    }
    let scale = 1;
    let invert = false;
    // Suffixes from the right, outside a quoted name: :x10, :invert.
    for (;;) {
      const colon = rest.lastIndexOf(':');
      if (colon < 0 || (rest.startsWith('"') && colon < rest.lastIndexOf('"'))) break;
      const suffix = rest.slice(colon + 1).trim().toLowerCase();
      if (suffix === 'invert' || suffix === 'inv') invert = true;
      else if (/^x/.test(suffix)) {
        const value = Number(suffix.slice(1));
        if (!(value > 0) || !Number.isFinite(value)) throw new InputError(`"${entry}": the scale ${suffix} must be x followed by a number above 0 (x10 for a 10:1 probe left at 1:1)`, where);
        scale *= value;
      } else {
        throw new InputError(`"${entry}": ":${suffix}" is not a scale (x10) or invert`, where);
      }
      rest = rest.slice(0, colon);
    }
    map[role] = { channel: parseRef(rest, where, entry), scale, invert };
  }
  if (seen.size === 0) throw new InputError('the channel map is empty: give role=channel entries, e.g. sync=CH1,ramp=CH2,gate=CH3', where);
  return map;
}

/** The map back in the command-line form (for messages and the "read as" line). */
export function formatChannelPick(pick: ChannelPick): string {
  const channel = typeof pick.channel === 'number' ? String(pick.channel) : /^\d+$|[,:"]/.test(pick.channel) ? `"${pick.channel}"` : pick.channel;
  return `${channel}${pick.scale !== 1 ? `:x${pick.scale}` : ''}${pick.invert ? ':invert' : ''}`;
}

export function formatChannelMap(map: ChannelMap): string {
  const entries: string[] = [];
  for (const role of signalRoles) {
    const pick = map[role];
    if (pick) entries.push(`${role}=${formatChannelPick(pick)}`);
  }
  if (map.time !== undefined) entries.push(`time=${map.time === null ? 'none' : formatChannelPick({ channel: map.time, scale: 1, invert: false })}`);
  return entries.join(',');
}

/** Roles the map names (time aside). */
export function mappedRoles(map: ChannelMap | undefined): SignalRole[] {
  return map === undefined ? [] : signalRoles.filter((role) => map[role] !== undefined);
}

/** Factor a pick applies to volts: scale, negated when inverted. */
export function pickFactor(pick: ChannelPick | undefined): number {
  if (pick === undefined) return 1;
  return pick.invert ? -pick.scale : pick.scale;
}
