/**
 * The virtual logger's ADC: a range per channel that covers its signal with room to spare, a resolution of
 * `adcBits`, and quantisation to the nearest code with saturation at the ends, as a real converter does.
 */
import type { ChannelScale } from '../logger/protocol';

export interface AdcChannel extends ChannelScale {
  minCode: number;
  maxCode: number;
}

/** Codes 0 .. 2^bits - 1 (unipolar, as on most microcontrollers); 16 bits use the signed range so codes fit an int16. */
export function adcChannel(role: ChannelScale['role'], lowV: number, highV: number, adcBits: number): AdcChannel {
  const levels = 2 ** adcBits;
  const minCode = adcBits >= 16 ? -32768 : 0;
  const maxCode = minCode + levels - 1;
  const gainV = (highV - lowV) / (levels - 1);
  return { role, gainV, offsetV: lowV - gainV * minCode, minCode, maxCode };
}

export function voltsToCode(channel: AdcChannel, volts: number): number {
  const code = Math.round((volts - channel.offsetV) / channel.gainV);
  return code < channel.minCode ? channel.minCode : code > channel.maxCode ? channel.maxCode : code;
}

export function quantiseVolts(channel: AdcChannel, volts: number): number {
  return channel.offsetV + channel.gainV * voltsToCode(channel, volts);
}

/** Ranges of our own choosing: sync +-1.5 x its amplitude, ramp and control -0.5 V to supply + 0.5 V, gate -0.5 V to 1.25 x its high level. */
export function simChannels(options: { syncAmplitudeV: number; supplyV: number; gateHighV: number; adcBits: number }): AdcChannel[] {
  return [
    adcChannel('sync', -1.5 * options.syncAmplitudeV, 1.5 * options.syncAmplitudeV, options.adcBits),
    adcChannel('ramp', -0.5, options.supplyV + 0.5, options.adcBits),
    adcChannel('gate', -0.5, 1.25 * options.gateHighV, options.adcBits),
    adcChannel('control', -0.5, options.supplyV + 0.5, options.adcBits),
  ];
}
