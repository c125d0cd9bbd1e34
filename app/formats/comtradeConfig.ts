/**
 * The configuration (.cfg) of a COMTRADE record, IEEE C37.111 (1991, 1999, 2013; IEC 60255-24),
 * field layout as in REFERENCES.md. Field names are the standard's, spelled out.
 */
export type ComtradeRevision = 1991 | 1999 | 2013;
export type ComtradeFileType = 'ASCII' | 'BINARY' | 'BINARY32' | 'FLOAT32';

export const comtradeFileTypes: readonly ComtradeFileType[] = ['ASCII', 'BINARY', 'BINARY32', 'FLOAT32'];

/** `An,ch_id,ph,ccbm,uu,a,b,skew,min,max,primary,secondary,PS`: value = a * x + b. */
export interface ComtradeAnalogChannel {
  /** An: the channel's number, from 1. */
  number: number;
  /** ch_id */
  id: string;
  /** ph */
  phase: string;
  /** ccbm: circuit component being monitored. */
  circuit: string;
  /** uu: unit of a * x + b, e.g. V, mV, kV. */
  unit: string;
  /** a */
  multiplier: number;
  /** b */
  offset: number;
  /** skew: time skew of the channel in microseconds. */
  skewUs: number;
  /** min, max: range of the stored integer (or float) values. */
  minimum: number;
  maximum: number;
  /** primary, secondary: transducer ratio. 1991 files lack them; taken as 1. */
  primary: number;
  secondary: number;
  /** PS: whether a * x + b gives the primary or the secondary value. */
  scaling: 'P' | 'S';
}

/** `Dn,ch_id,ph,ccbm,y` (1991: `Dn,ch_id,y`). */
export interface ComtradeDigitalChannel {
  number: number;
  id: string;
  phase: string;
  circuit: string;
  /** y: the channel's normal state, 0 or 1. */
  normalState: 0 | 1;
}

/** One `samp,endsamp` line: the rate in Hz and the number of the last sample taken at it. */
export interface ComtradeSampleRate {
  rateHz: number;
  endSample: number;
}

/** `dd/mm/yyyy,hh:mm:ss.ssssss` (1991: mm/dd/yy). `text` keeps the line as written. */
export interface ComtradeDateTime {
  text: string;
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

export interface ComtradeConfig {
  stationName: string;
  recorderId: string;
  revision: ComtradeRevision;
  analogChannels: ComtradeAnalogChannel[];
  digitalChannels: ComtradeDigitalChannel[];
  /** lf */
  lineFrequencyHz: number;
  /** nrates lines; empty when nrates is 0 (times then come from the timestamps). */
  sampleRates: ComtradeSampleRate[];
  /** endsamp of the `0,endsamp` line that follows nrates = 0, when present. */
  endSampleWithoutRate?: number;
  firstSampleTime: ComtradeDateTime;
  triggerTime: ComtradeDateTime;
  fileType: ComtradeFileType;
  /** timemult (1999 on; 1 for 1991). */
  timeMultiplier: number;
  /**
   * Seconds per timestamp unit before timemult: 1e-6 (microseconds), or 1e-9 when the date lines carry
   * nanoseconds (nine decimals, allowed by the 2013 revision).
   */
  timeBaseS: number;
  /** 2013: time_code, local_code (offsets from UTC as written, e.g. `-5h30`). */
  timeCode?: string;
  localCode?: string;
  /** 2013: tmq_code, leapsec. */
  timeQualityCode?: string;
  leapSecond?: string;
}

/** Bytes of one binary record: sample number, timestamp, the analogs, and the digitals packed 16 to a word. */
export function comtradeRecordBytes(config: Pick<ComtradeConfig, 'fileType' | 'analogChannels' | 'digitalChannels'>): number {
  const analogBytes = config.fileType === 'BINARY' ? 2 : 4;
  return 8 + config.analogChannels.length * analogBytes + 2 * Math.ceil(config.digitalChannels.length / 16);
}
