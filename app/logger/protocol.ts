/**
 * The Rampwright logger protocol, version 1 (our own design; PROTOCOL.md beside this file is the reference a
 * firmware writer reads). Line-based ASCII: every line is `<body>*<CRC-32 of body as 8 hex digits>` and ends in
 * LF (a CR before it is ignored).
 */
import type { EdgeRole, SignalRole } from '../capture/samples';

/** Protocol name and version as the greeting writes them. */
export const protocolName = 'RWLOG';
export const protocolVersion = 1;

/** Longest line a host accepts (characters, terminator excluded); longer ones are counted and dropped. */
export const defaultMaxLineChars = 4096;

/** A channel's role on the board, or `unused` for an input the logger sends but the board does not wire. */
export type ChannelRole = SignalRole | 'unused';

export const channelRoles: readonly ChannelRole[] = ['sync', 'ramp', 'gate', 'control', 'unused'];

/** One logger input: its role and the scale from ADC code to volts at the test point: volts = offsetV + gainV * code. */
export interface ChannelScale {
  role: ChannelRole;
  gainV: number;
  offsetV: number;
}

/** What a logger says about itself when it starts, after `start`, after `rate`, and when asked to `identify`. */
export interface LoggerGreeting {
  version: number;
  loggerId: string;
  sampleRateHz: number;
  adcBits: number;
  /** Samples per channel in every data line. */
  blockSamples: number;
  /** In the order the samples are interleaved in a data line. */
  channels: ChannelScale[];
  /**
   * When each channel is sampled after the frame's first, as a fraction of the sample period (greeting `skew=`, one
   * per channel from 0 to below 1), for a logger that converts its channels one after another; absent when all are
   * sampled together.
   */
  scanSkew?: number[];
  /** The inputs the logger times with its timer (greeting `edges=`), with the timer's rate (`clock=`, Hz); absent when it times none. */
  edgeTiming?: { roles: EdgeRole[]; clockHz: number };
}

/** One timed edge as an edge line carries it: clock ticks since the first sample's instant, 32 bits, wrapping. */
export interface LoggerEdge {
  role: EdgeRole;
  direction: 'rising' | 'falling';
  ticks: number;
}

/** One data line: the block's sequence number and its ADC codes, interleaved (frame by frame, channel by channel). */
export interface LoggerBlock {
  sequence: number;
  codes: Int16Array;
}

/** Logger-side counters, sent about once a second. `overruns` counts blocks the logger itself had to discard since `start`. */
export interface LoggerStatus {
  /** Sequence number of the next data line the logger will send. */
  nextSequence: number;
  overruns: number;
  /** Timed edges the logger dropped since `start` because its edge queue was full (`edgeslost=`), when it says. */
  edgesLost?: number;
}

export type HostCommand =
  | { command: 'start' }
  | { command: 'stop' }
  | { command: 'identify' }
  | { command: 'rate'; sampleRateHz: number }
  | { command: 'edges'; on: boolean };

export type HostCommandName = HostCommand['command'];

export const hostCommandNames: readonly HostCommandName[] = ['start', 'stop', 'identify', 'rate', 'edges'];

/** Edge roles a greeting may list in `edges=`. */
export const edgeRoles: readonly EdgeRole[] = ['sync', 'gate'];

/** The logger's answer to a host command: `A` acknowledges, `E` refuses with a reason. */
export interface LoggerReply {
  ok: boolean;
  /** The command word the reply answers (`?` when the command could not be read). */
  command: string;
  /** Extra words: the rate set, or the reason for a refusal. */
  detail: string;
}

/** Sequence numbers are 32-bit and wrap. */
export const sequenceModulus = 2 ** 32;

export function bytesPerBlock(greeting: Pick<LoggerGreeting, 'channels' | 'blockSamples'>): number {
  return greeting.channels.length * greeting.blockSamples * 2;
}
