/**
 * The greeting line: `H RWLOG/1 id=<logger id> rate=<Hz> bits=<ADC bits> block=<samples per channel>
 * ch=<role>,<role>,... gain=<V per code>,... offset=<V>,...` (keys after the version in any order; unknown keys
 * are ignored so a later firmware can add some). PROTOCOL.md, "Greeting".
 */
import type { EdgeRole } from '../capture/samples';
import { channelRoles, edgeRoles, protocolName, protocolVersion, type ChannelRole, type ChannelScale, type LoggerGreeting } from './protocol';

export type GreetingParse =
  | { ok: true; greeting: LoggerGreeting }
  | { ok: false; unknownVersion: string | null; reason: string };

const loggerIdPattern = /^[A-Za-z0-9._-]{1,32}$/;
const decimalPattern = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function formatNumber(value: number): string {
  return String(value);
}

export function encodeGreetingBody(greeting: LoggerGreeting): string {
  const roles = greeting.channels.map((channel) => channel.role).join(',');
  const gains = greeting.channels.map((channel) => formatNumber(channel.gainV)).join(',');
  const offsets = greeting.channels.map((channel) => formatNumber(channel.offsetV)).join(',');
  const skew = greeting.scanSkew ? ` skew=${greeting.scanSkew.map(formatNumber).join(',')}` : '';
  const timing = greeting.edgeTiming ? ` edges=${greeting.edgeTiming.roles.join(',')} clock=${formatNumber(greeting.edgeTiming.clockHz)}` : '';
  return (
    `H ${protocolName}/${greeting.version} id=${greeting.loggerId} rate=${formatNumber(greeting.sampleRateHz)} ` +
    `bits=${greeting.adcBits} block=${greeting.blockSamples} ch=${roles} gain=${gains} offset=${offsets}${skew}${timing}`
  );
}

function parseDecimals(text: string | undefined): number[] | null {
  if (text === undefined) return null;
  const values = text.split(',').map((part) => (decimalPattern.test(part) ? Number(part) : Number.NaN));
  return values.every(Number.isFinite) ? values : null;
}

function parseInteger(text: string | undefined, min: number, max: number): number | null {
  if (text === undefined || !/^\d{1,9}$/.test(text)) return null;
  const value = Number(text);
  return value >= min && value <= max ? value : null;
}

/** Parses a greeting body (frame already checked). Never throws. */
export function parseGreetingBody(body: string): GreetingParse {
  const words = body.split(' ').filter((word) => word.length > 0);
  const versionWord = words[1] ?? '';
  const versionMatch = /^([A-Za-z]+)\/(\S+)$/.exec(versionWord);
  if (words[0] !== 'H' || !versionMatch || versionMatch[1] !== protocolName) {
    return { ok: false, unknownVersion: null, reason: `greeting does not start with "H ${protocolName}/<version>"` };
  }
  if (versionMatch[2] !== String(protocolVersion)) {
    return {
      ok: false,
      unknownVersion: versionMatch[2],
      reason: `the logger speaks protocol version ${versionMatch[2]}, Rampwright reads version ${protocolVersion}: update the logger firmware or Rampwright`,
    };
  }
  const fields = new Map<string, string>();
  for (const word of words.slice(2)) {
    const equals = word.indexOf('=');
    if (equals > 0) fields.set(word.slice(0, equals), word.slice(equals + 1));
  }
  const fail = (reason: string): GreetingParse => ({ ok: false, unknownVersion: null, reason: `greeting: ${reason}` });
  const loggerId = fields.get('id');
  if (loggerId === undefined || !loggerIdPattern.test(loggerId)) return fail('id= must be 1-32 letters, digits, dot, dash or underscore');
  const rate = parseDecimals(fields.get('rate'));
  if (!rate || rate.length !== 1 || !(rate[0] > 0) || rate[0] > 10_000_000) return fail('rate= must be a sample rate in Hz above 0');
  const adcBits = parseInteger(fields.get('bits'), 1, 16);
  if (adcBits === null) return fail('bits= must be the ADC resolution, 1 to 16 bits');
  const blockSamples = parseInteger(fields.get('block'), 1, 65_535);
  if (blockSamples === null) return fail('block= must be the samples per channel in a data line, 1 to 65535');
  const roles = (fields.get('ch') ?? '').split(',');
  if (!roles.every((role): role is ChannelRole => (channelRoles as readonly string[]).includes(role))) {
    return fail(`ch= lists channel roles from ${channelRoles.join(', ')}, got "${fields.get('ch') ?? ''}"`);
  }
  for (const role of ['sync', 'ramp', 'gate', 'control'] as const) {
    const count = roles.filter((each) => each === role).length;
    if (count > 1) return fail(`ch= names ${role} ${count} times`);
    if (count === 0 && role !== 'control') return fail(`ch= has no ${role} channel; sync, ramp and gate are required`);
  }
  const gains = parseDecimals(fields.get('gain'));
  const offsets = parseDecimals(fields.get('offset'));
  if (!gains || gains.length !== roles.length || gains.some((gain) => gain === 0)) {
    return fail(`gain= needs ${roles.length} non-zero volts-per-code values, one per channel`);
  }
  if (!offsets || offsets.length !== roles.length) return fail(`offset= needs ${roles.length} values in volts, one per channel`);
  const channels: ChannelScale[] = roles.map((role, index) => ({ role, gainV: gains[index], offsetV: offsets[index] }));
  const greeting: LoggerGreeting = { version: protocolVersion, loggerId, sampleRateHz: rate[0], adcBits, blockSamples, channels };
  if (fields.has('skew')) {
    const skew = parseDecimals(fields.get('skew'));
    if (!skew || skew.length !== roles.length || skew.some((fraction) => !(fraction >= 0 && fraction < 1))) {
      return fail(`skew= needs ${roles.length} fractions of the sample period from 0 to below 1, one per channel`);
    }
    greeting.scanSkew = skew;
  }
  const edges = fields.get('edges');
  const clock = fields.get('clock');
  if (edges !== undefined || clock !== undefined) {
    const timedRoles = (edges ?? '').split(',');
    if (!timedRoles.every((role): role is EdgeRole => (edgeRoles as readonly string[]).includes(role)) || new Set(timedRoles).size !== timedRoles.length) {
      return fail(`edges= lists the timed inputs, each once, from ${edgeRoles.join(', ')}; got "${edges ?? ''}"`);
    }
    const clockHz = parseInteger(clock, 1, 1_000_000_000);
    if (clockHz === null) return fail('clock= must be the edge timer\'s rate in Hz, a whole number from 1 to 1000000000, beside edges=');
    greeting.edgeTiming = { roles: timedRoles, clockHz };
  }
  return { ok: true, greeting };
}

export function sameGreeting(a: LoggerGreeting, b: LoggerGreeting): boolean {
  return (
    a.loggerId === b.loggerId &&
    a.sampleRateHz === b.sampleRateHz &&
    a.adcBits === b.adcBits &&
    a.blockSamples === b.blockSamples &&
    a.channels.length === b.channels.length &&
    a.channels.every((channel, index) => {
      const other = b.channels[index];
      return channel.role === other.role && channel.gainV === other.gainV && channel.offsetV === other.offsetV;
    }) &&
    a.scanSkew?.join(',') === b.scanSkew?.join(',') &&
    a.edgeTiming?.clockHz === b.edgeTiming?.clockHz &&
    a.edgeTiming?.roles.join(',') === b.edgeTiming?.roles.join(',')
  );
}
