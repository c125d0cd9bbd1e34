/** Shared helpers for the decoder tests: a greeting of our own invented logger and blocks of known codes. */
import { encodeBlock, encodeGreeting } from '../../../app/logger/encode';
import type { LoggerGreeting } from '../../../app/logger/protocol';

export function benchGreeting(overrides: Partial<LoggerGreeting> = {}): LoggerGreeting {
  return {
    version: 1,
    loggerId: 'TESTLOG-3',
    sampleRateHz: 20_000,
    adcBits: 12,
    blockSamples: 6,
    channels: [
      { role: 'sync', gainV: 0.01, offsetV: -20.48 },
      { role: 'ramp', gainV: 0.005, offsetV: -0.5 },
      { role: 'gate', gainV: 0.005, offsetV: -0.5 },
      { role: 'control', gainV: 0.005, offsetV: -0.5 },
    ],
    ...overrides,
  };
}

/** Codes that differ per block, channel and sample so a mixed-up block cannot pass for another. */
export function knownCodes(greeting: LoggerGreeting, sequence: number): Int16Array {
  const channels = greeting.channels.length;
  const codes = new Int16Array(channels * greeting.blockSamples);
  for (let sample = 0; sample < greeting.blockSamples; sample++) {
    for (let channel = 0; channel < channels; channel++) {
      codes[sample * channels + channel] = ((sequence * 131 + sample * 7 + channel * 1009) % 4096) - 0;
    }
  }
  return codes;
}

export function streamLines(greeting: LoggerGreeting, blockCount: number, firstSequence = 0): string[] {
  const lines = [encodeGreeting(greeting)];
  for (let index = 0; index < blockCount; index++) {
    const sequence = firstSequence + index;
    lines.push(encodeBlock({ sequence, codes: knownCodes(greeting, sequence) }));
  }
  return lines;
}

/** Volts a block must hold for `role`, computed from the codes and the greeting's scale (PROTOCOL.md: offset + gain x code). */
export function expectedVolts(greeting: LoggerGreeting, codes: Int16Array, role: string): number[] {
  const channel = greeting.channels.findIndex((each) => each.role === role);
  const scale = greeting.channels[channel];
  const values: number[] = [];
  for (let sample = 0; sample < greeting.blockSamples; sample++) {
    values.push(scale.offsetV + scale.gainV * codes[sample * greeting.channels.length + channel]);
  }
  return values;
}
