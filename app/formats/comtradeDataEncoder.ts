import { InputError } from '../errors';
import { signalRoles, type SampleBlock, type SignalRole } from '../capture/samples';
import { comtradeRecordBytes, type ComtradeConfig } from './comtradeConfig';
import { analogScaling } from './comtradeChannelMap';
import { comtradeCodeLimits, maxComtradeTimestamp } from './comtradeWritePlan';
import { encodeUtf8 } from './utf8';

export interface ComtradeDataEncoder {
  /** The .dat bytes for one block, records numbered on from the previous block. */
  encode(block: SampleBlock): Uint8Array;
  readonly samplesWritten: number;
}

export interface ComtradeEncoderOptions {
  /** Time that timestamp 0 stands for; blocks before it cannot be written (timestamps are unsigned). Default 0 s. */
  timeOriginS?: number;
}

/**
 * Encodes blocks as .dat records for `config` (IEEE C37.111, REFERENCES.md): the analog channel with id
 * sync/ramp/gate/control (any case) takes that role's samples; stored code x = round((v - b) / a), clamped to
 * the type's code range; NaN is written as the missing marker (ASCII 99999, BINARY 0x8000, BINARY32
 * 0x80000000, FLOAT32 NaN). Timestamps are the sample's time in units of timemult microseconds.
 */
export function createComtradeDataEncoder(config: ComtradeConfig, options: ComtradeEncoderOptions = {}): ComtradeDataEncoder {
  if (config.digitalChannels.length > 0) throw new InputError('this encoder writes analog channels only');
  const fileType = config.fileType;
  const analogCount = config.analogChannels.length;
  const roleOfChannel: (SignalRole | null)[] = config.analogChannels.map((channel) => {
    const id = channel.id.trim().toLowerCase();
    return (signalRoles as readonly string[]).includes(id) ? (id as SignalRole) : null;
  });
  // Encode with the same volts-per-count a reader will use, so write-then-read is exact up to code rounding.
  const scalings = config.analogChannels.map((channel) => analogScaling(channel));
  const limit = fileType === 'FLOAT32' ? Infinity : comtradeCodeLimits[fileType];
  const secondsPerTick = config.timeMultiplier * config.timeBaseS;
  const timeOriginS = options.timeOriginS ?? 0;
  const recordBytes = comtradeRecordBytes(config);
  let samplesWritten = 0;

  const codeOf = (value: number, channel: number): number => {
    if (value !== value) return Number.NaN;
    const scaling = scalings[channel];
    const code = (value - scaling.offsetV) / scaling.voltsPerCount;
    if (fileType === 'FLOAT32') return code;
    const rounded = Math.round(code);
    return rounded > limit ? limit : rounded < -limit ? -limit : rounded;
  };

  const ticksOf = (timeS: number): number => {
    const ticks = Math.round((timeS - timeOriginS) / secondsPerTick);
    if (ticks < 0) throw new InputError(`a sample at ${timeS} s comes before the record's time origin ${timeOriginS} s`);
    if (ticks > maxComtradeTimestamp) {
      if (config.sampleRates.length > 0) return 0xffffffff; // times come from the rate; the timestamp may be left missing
      throw new InputError(`a sample at ${timeS} s is past the last timestamp timemult ${config.timeMultiplier} allows`);
    }
    return ticks;
  };

  return {
    get samplesWritten() {
      return samplesWritten;
    },
    encode(block) {
      const length = block.sync.length;
      const columns = roleOfChannel.map((role) => {
        const values = role === null ? null : block[role];
        if (role !== null && values === null) throw new InputError(`the record has a ${role} channel but a block at ${block.startS} s has no ${role} samples`);
        return values;
      });
      if (fileType === 'ASCII') {
        const lines: string[] = [];
        for (let index = 0; index < length; index++) {
          let line = `${samplesWritten + index + 1},${ticksOf(block.startS + index / block.sampleRateHz)}`;
          for (let channel = 0; channel < analogCount; channel++) {
            const values = columns[channel];
            const code = values === null ? 0 : codeOf(values[index], channel);
            line += code !== code ? ',99999' : `,${code}`;
          }
          lines.push(line + '\r\n');
        }
        samplesWritten += length;
        return encodeUtf8(lines.join(''));
      }
      const bytes = new Uint8Array(recordBytes * length);
      const view = new DataView(bytes.buffer);
      for (let index = 0; index < length; index++) {
        const offset = index * recordBytes;
        view.setUint32(offset, (samplesWritten + index + 1) >>> 0, true);
        view.setUint32(offset + 4, ticksOf(block.startS + index / block.sampleRateHz), true);
        for (let channel = 0; channel < analogCount; channel++) {
          const values = columns[channel];
          const code = values === null ? 0 : codeOf(values[index], channel);
          if (fileType === 'BINARY') view.setInt16(offset + 8 + 2 * channel, code !== code ? -0x8000 : code, true);
          else if (fileType === 'BINARY32') view.setInt32(offset + 8 + 4 * channel, code !== code ? -0x80000000 : code, true);
          else view.setFloat32(offset + 8 + 4 * channel, code, true);
        }
      }
      samplesWritten += length;
      return bytes;
    },
  };
}
