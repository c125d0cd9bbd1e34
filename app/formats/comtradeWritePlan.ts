import { InputError } from '../errors';
import type { SampleBlock, SignalRole } from '../capture/samples';
import type { ComtradeAnalogChannel, ComtradeConfig, ComtradeFileType, ComtradeRevision } from './comtradeConfig';

/**
 * Stored-code limits per file type. ASCII: -99999..99998 with 99999 the missing marker (REFERENCES.md, from
 * memory); we keep to +-99998. BINARY and BINARY32 keep off their most negative code, the missing marker.
 */
export const comtradeCodeLimits: Record<Exclude<ComtradeFileType, 'FLOAT32'>, number> = {
  ASCII: 99998,
  BINARY: 32767,
  BINARY32: 2147483647,
};

export interface ComtradeScaling {
  /** a and b of value = a * x + b. */
  multiplier: number;
  offset: number;
  /** min and max of the stored codes (the data's own range for FLOAT32). */
  minimum: number;
  maximum: number;
}

/**
 * Chooses a and b so the data's range [minV, maxV] fills the integer codes -L..L: b is the middle of the range,
 * a = (maxV - minV) / (2 L). Rounding to the nearest code then errs by at most a / 2 (plus the double-precision
 * rounding of a * x + b, about |value| * 2^-52). FLOAT32 stores volts directly (a = 1, b = 0), erring by at most
 * half a float32 unit in the last place, |value| * 2^-24.
 */
export function chooseComtradeScaling(minV: number, maxV: number, fileType: ComtradeFileType): ComtradeScaling {
  const finite = Number.isFinite(minV) && Number.isFinite(maxV) && maxV >= minV;
  const low = finite ? minV : 0;
  const high = finite ? maxV : 0;
  if (fileType === 'FLOAT32') return { multiplier: 1, offset: 0, minimum: low, maximum: high };
  const limit = comtradeCodeLimits[fileType];
  const offset = (high + low) / 2;
  // A flat (or nanovolt-wide) channel still needs a usable a (a = 0 is no signal); 1 nV steps are far below any logger's.
  const halfSpan = Math.max((high - low) / 2, 1e-9);
  return { multiplier: halfSpan / limit, offset, minimum: -limit, maximum: limit };
}

/** What a first pass over the blocks learns before the .cfg and the scaling can be fixed. */
export interface ComtradeCaptureStats {
  samples: number;
  hasControl: boolean;
  firstStartS: number;
  lastSampleS: number;
  /** Last block's rate when all blocks share one rate (within 1e-6) and no block follows a gap; else undefined. */
  uniformRateHz: number | undefined;
  /** Highest rate seen: sets the timestamp resolution when the record must carry times. */
  maxRateHz: number;
  minimumV: Record<SignalRole, number>;
  maximumV: Record<SignalRole, number>;
}

export class ComtradeStatsCollector {
  private stats: ComtradeCaptureStats | null = null;
  private rateConsistent = true;

  observe(block: SampleBlock): void {
    const length = block.sync.length;
    if (length === 0) return;
    if (!(block.sampleRateHz > 0 && Number.isFinite(block.sampleRateHz))) {
      throw new InputError(`a block at ${block.startS} s has sample rate ${block.sampleRateHz} Hz`);
    }
    let stats = this.stats;
    if (stats === null) {
      stats = this.stats = {
        samples: 0,
        hasControl: block.control !== null,
        firstStartS: block.startS,
        lastSampleS: block.startS,
        uniformRateHz: block.sampleRateHz,
        maxRateHz: block.sampleRateHz,
        minimumV: { sync: Infinity, ramp: Infinity, gate: Infinity, control: Infinity },
        maximumV: { sync: -Infinity, ramp: -Infinity, gate: -Infinity, control: -Infinity },
      };
    } else {
      if (stats.hasControl !== (block.control !== null)) {
        throw new InputError(`a block ${stats.hasControl ? 'lacks' : 'adds'} the control signal part way through the capture (at ${block.startS} s)`);
      }
      if (!(block.startS > stats.lastSampleS)) {
        throw new InputError(`blocks go back in time (${block.startS} s after ${stats.lastSampleS} s)`);
      }
      const previous = stats.uniformRateHz;
      if (block.afterGap || previous === undefined || Math.abs(block.sampleRateHz - previous) > 1e-6 * previous) this.rateConsistent = false;
      stats.uniformRateHz = this.rateConsistent ? block.sampleRateHz : undefined;
      stats.maxRateHz = Math.max(stats.maxRateHz, block.sampleRateHz);
    }
    stats.samples += length;
    stats.lastSampleS = block.startS + (length - 1) / block.sampleRateHz;
    const roles: SignalRole[] = block.control !== null ? ['sync', 'ramp', 'gate', 'control'] : ['sync', 'ramp', 'gate'];
    for (const role of roles) {
      const values = block[role] as Float64Array;
      let low = stats.minimumV[role];
      let high = stats.maximumV[role];
      for (let index = 0; index < length; index++) {
        const value = values[index];
        if (value < low) low = value;
        if (value > high) high = value;
      }
      stats.minimumV[role] = low;
      stats.maximumV[role] = high;
    }
  }

  result(): ComtradeCaptureStats {
    if (this.stats === null) throw new InputError('there are no samples to write');
    return this.stats;
  }
}

export interface ComtradePlanOptions {
  fileType: ComtradeFileType;
  revision?: Extract<ComtradeRevision, 1999 | 2013>;
  stationName?: string;
  recorderId?: string;
  /** Mains frequency of the board (lf). */
  lineFrequencyHz?: number;
  /** Wall-clock time of the first sample, written as the first-sample and trigger times (UTC). */
  recordedAt?: Date;
}

/** Time that timestamp 0 stands for: 0 s, or the first sample when the capture starts before 0 s (timestamps are unsigned). */
export function comtradeTimeOriginS(stats: ComtradeCaptureStats): number {
  return Math.min(0, stats.firstStartS);
}

/** Rounds up to 1, 2 or 5 times a power of ten: readable timemult values. */
function roundUpOneTwoFive(value: number): number {
  const decade = 10 ** Math.floor(Math.log10(value));
  for (const step of [1, 2, 5, 10]) if (step * decade >= value * (1 - 1e-12)) return step * decade;
  return 10 * decade;
}

/** Largest timestamp; 0xFFFFFFFF is the missing marker. */
export const maxComtradeTimestamp = 0xfffffffe;

/**
 * The .cfg for writing a capture: analog channels sync, ramp, gate[, control] in volts (PS = S, ratio 1:1).
 * A capture at one rate without gaps gets that rate (nrates 1); otherwise nrates is 0 and every timestamp
 * matters, with timemult fine enough for a thousandth of the shortest sample period and coarse enough that
 * the whole capture fits the 32-bit timestamp.
 */
export function planComtradeConfig(stats: ComtradeCaptureStats, options: ComtradePlanOptions): ComtradeConfig {
  const roles: SignalRole[] = stats.hasControl ? ['sync', 'ramp', 'gate', 'control'] : ['sync', 'ramp', 'gate'];
  const analogChannels: ComtradeAnalogChannel[] = roles.map((role, index) => {
    const scaling = chooseComtradeScaling(stats.minimumV[role], stats.maximumV[role], options.fileType);
    return {
      number: index + 1,
      id: role,
      phase: '',
      circuit: 'test point',
      unit: 'V',
      multiplier: scaling.multiplier,
      offset: scaling.offset,
      skewUs: 0,
      minimum: scaling.minimum,
      maximum: scaling.maximum,
      primary: 1,
      secondary: 1,
      scaling: 'S',
    };
  });
  const timeOriginS = comtradeTimeOriginS(stats);
  const spanS = Math.max(stats.lastSampleS - timeOriginS, 0);
  const timed = stats.uniformRateHz === undefined;
  const wantedTickS = timed ? 1 / stats.maxRateHz / 1000 : 1e-6;
  const tickS = Math.max(wantedTickS, spanS / maxComtradeTimestamp);
  const timeMultiplier = roundUpOneTwoFive(tickS / 1e-6);
  const recordedAt = options.recordedAt ?? new Date(0);
  const dateTime = {
    text: '',
    year: recordedAt.getUTCFullYear(),
    month: recordedAt.getUTCMonth() + 1,
    day: recordedAt.getUTCDate(),
    hour: recordedAt.getUTCHours(),
    minute: recordedAt.getUTCMinutes(),
    second: recordedAt.getUTCSeconds() + recordedAt.getUTCMilliseconds() / 1000,
  };
  const config: ComtradeConfig = {
    stationName: options.stationName ?? 'Rampwright bench',
    recorderId: options.recorderId ?? 'rampwright',
    revision: options.revision ?? 1999,
    analogChannels,
    digitalChannels: [],
    lineFrequencyHz: options.lineFrequencyHz ?? 50,
    sampleRates: timed ? [] : [{ rateHz: stats.uniformRateHz as number, endSample: stats.samples }],
    firstSampleTime: dateTime,
    triggerTime: dateTime,
    fileType: options.fileType,
    timeMultiplier,
    timeBaseS: 1e-6,
  };
  if (timed) config.endSampleWithoutRate = stats.samples;
  if (config.revision === 2013) {
    config.timeCode = '0';
    config.localCode = '0';
    // tmq_code F: the clock's quality is unknown (not locked to a time source), leapsec 0.
    config.timeQualityCode = 'F';
    config.leapSecond = '0';
  }
  return config;
}
