/**
 * Finds each role's channel in a capture file from a channel map (or, for roles the map leaves out, from a
 * channel named after the role). Never guesses between two readings: a name that fits two channels, or a number
 * that is one channel's position and another's name, is refused with the option that settles it.
 */
import { InputError } from '../errors';
import { channelMapOption, formatChannelPick, type ChannelMap, type ChannelPick, type ChannelRef } from './channelMap';
import { signalRoles, type SignalRole } from './samples';

/** One channel of a file as the map can name it. */
export interface FileChannel {
  /** What a bare number in the map means: the CSV column's position, the COMTRADE analog channel's number; null when no number reaches it. */
  number: number | null;
  /** Names that match it (compared without letter case and extra spaces): the header text, the name without its unit, the channel id; the last is the one examples show. */
  names: string[];
  /** How the technician sees it in messages: `CH2 (V)`, `analog 3 "IC"`. */
  label: string;
}

export interface ResolvedRole<Channel extends FileChannel> {
  channel: Channel;
  pick: ChannelPick;
  /** True when the map named it; false when found by the role's own name. */
  fromMap: boolean;
}

export type ResolvedRoles<Channel extends FileChannel> = Record<SignalRole, ResolvedRole<Channel> | null>;

export const requiredRoles: readonly SignalRole[] = ['sync', 'ramp', 'gate'];

export function normaliseChannelName(name: string): string {
  return name.trim().replace(/\s+/g, ' ').toLowerCase();
}

function describeRef(ref: ChannelRef): string {
  return typeof ref === 'number' ? `number ${ref}` : `"${ref}"`;
}

/** The channel a reference names, or null; throws when two channels fit. */
export function findChannel<Channel extends FileChannel>(channels: readonly Channel[], ref: ChannelRef, role: string, where: string): Channel | null {
  const byName = (name: string) => {
    const wanted = normaliseChannelName(name);
    return channels.filter((channel) => channel.names.some((candidate) => normaliseChannelName(candidate) === wanted));
  };
  if (typeof ref === 'number') {
    const byNumber = channels.filter((channel) => channel.number === ref);
    const named = byName(String(ref)).filter((channel) => !byNumber.includes(channel));
    if (byNumber.length > 0 && named.length > 0) {
      throw new InputError(
        `${role}=${ref} could mean ${byNumber[0].label} (number ${ref}) or ${named[0].label} (named "${ref}"): ` +
          `write ${role}="${ref}" in ${channelMapOption} for the name`,
        where,
      );
    }
    return byNumber[0] ?? named[0] ?? null;
  }
  const matches = byName(ref);
  if (matches.length > 1) {
    const numbers = matches.map((channel) => channel.label).join(' and ');
    throw new InputError(`${role}: ${describeRef(ref)} fits ${numbers}: name the one you mean by its number in ${channelMapOption}`, where);
  }
  return matches[0] ?? null;
}

function listChannels(channels: readonly FileChannel[]): string {
  const shown = channels.slice(0, 12).map((channel) => channel.label);
  return shown.join(', ') + (channels.length > 12 ? `, ... (${channels.length} in all)` : '');
}

/** An example map from the file's own channels, for the message that asks for one. */
function exampleMap(channels: readonly FileChannel[], notForExample: ReadonlySet<FileChannel>): string {
  const picks = channels.filter((channel) => !notForExample.has(channel)).slice(0, 4);
  return ['sync', 'ramp', 'gate', 'control']
    .slice(0, Math.max(3, Math.min(4, picks.length)))
    .map((role, index) => {
      const channel = picks[index];
      if (!channel) return `${role}=?`;
      const name = (channel.names[channel.names.length - 1] ?? '').trim();
      return `${role}=${/^[A-Za-z][\w.-]*$/.test(name) || channel.number === null ? name : channel.number}`;
    })
    .join(',');
}

/**
 * Resolves every role. `map` roles first (a missing channel is refused naming the map), then roles by their own
 * name. Sync, ramp and gate are required; a file without them is refused with its channel list and an example map
 * (leaving out `notForExample`, such as a time column).
 * One channel may serve one role only.
 */
export function resolveChannelRoles<Channel extends FileChannel>(
  channels: readonly Channel[],
  map: ChannelMap | undefined,
  where: string,
  what = 'the file has',
  notForExample: ReadonlySet<Channel> = new Set(),
): ResolvedRoles<Channel> {
  const resolved = {} as ResolvedRoles<Channel>;
  const missing: SignalRole[] = [];
  for (const role of signalRoles) {
    const pick = map?.[role];
    if (pick !== undefined) {
      const channel = findChannel(channels, pick.channel, role, where);
      if (channel === null) {
        throw new InputError(`no channel ${describeRef(pick.channel)} for ${role} (${channelMapOption} ${role}=${formatChannelPick(pick)}); ${what} ${listChannels(channels)}`, where);
      }
      resolved[role] = { channel, pick, fromMap: true };
      continue;
    }
    const byRole = findChannel(channels, role, role, where);
    resolved[role] = byRole === null ? null : { channel: byRole, pick: { channel: role, scale: 1, invert: false }, fromMap: false };
    if (byRole === null && requiredRoles.includes(role)) missing.push(role);
  }
  if (missing.length > 0) {
    throw new InputError(
      `no channel for ${missing.join(', ')}; ${what} ${channels.length === 0 ? 'no channels' : listChannels(channels)}: ` +
        `name the channel for each role with ${channelMapOption}, e.g. ${channelMapOption} ${exampleMap(channels, notForExample)}`,
      where,
    );
  }
  const owner = new Map<Channel, SignalRole>();
  for (const role of signalRoles) {
    const entry = resolved[role];
    if (entry === null) continue;
    const earlier = owner.get(entry.channel);
    if (earlier !== undefined) throw new InputError(`${entry.channel.label} is given for both ${earlier} and ${role}: one channel serves one role (${channelMapOption})`, where);
    owner.set(entry.channel, role);
  }
  return resolved;
}

/** `sync=CH1, ramp=CH2 x10, gate=CH3 inverted` for the "read as" line. */
export function describeResolvedRoles(resolved: ResolvedRoles<FileChannel>): string {
  return signalRoles
    .flatMap((role) => {
      const entry = resolved[role];
      if (entry === null) return [];
      const extras = `${entry.pick.scale !== 1 ? ` x${entry.pick.scale}` : ''}${entry.pick.invert ? ' inverted' : ''}`;
      return [`${role}=${entry.channel.label}${extras}`];
    })
    .join(', ');
}
