/**
 * IPC channel names, in one place: one invoke channel per contract call, one channel for events.
 * The preload and the main side both derive them from the contract's call list, so they cannot drift apart.
 */
import { benchCallNames as callNames, isBenchCallName as isCallName, type BenchCallName as CallName } from '../../app/contract/names';

export const callChannelPrefix = 'rampwright:call:';
export const eventChannel = 'rampwright:event';
/** Name of the bridge object in the page (`window.rampwright`). */
export const bridgeName = 'rampwright';

export function callChannel(call: CallName): string {
  return `${callChannelPrefix}${call}`;
}

export const callChannels: readonly string[] = callNames.map(callChannel);

/** The call a channel carries, or null for a channel that is not ours. */
export function callOfChannel(channel: string): CallName | null {
  if (!channel.startsWith(callChannelPrefix)) return null;
  const name = channel.slice(callChannelPrefix.length);
  return isCallName(name) ? name : null;
}
