import { InputError } from '../errors';
import type { SampleBlock } from '../capture/samples';

/**
 * Collects samples one at a time into uniform-rate `SampleBlock`s, for every file reader.
 *
 * Two ways to know time:
 * - a fixed rate (a CSV without `t` given a rate, a COMTRADE file with a sample rate line): sample k of the
 *   file sits at origin + k / rate, the origin being the first sample's own time when it has one;
 * - a time per sample (`t` column, COMTRADE timestamps when nrates is 0): the rate of a stretch is
 *   (n - 1) / (t_last - t_first) over the stretch so far, which averages out small jitter in printed times,
 *   and an interval longer than 1.5 sample periods is a gap: the stretch ends, the next block has
 *   `afterGap` set (1.5 is half a period of slack either way around a single missing sample, common practice).
 */
export interface SampleBlockBuilderOptions {
  blockSamples: number;
  hasControl: boolean;
  /** Fixed sample rate; without it every sample must come with its time. */
  fixedRateHz?: number;
  /**
   * Rates that change part-way (COMTRADE nrates > 1): each up to its last sample number (1-based, inclusive);
   * the last one goes on to the end. Replaces `fixedRateHz`. A new rate starts a new block, timed from its first
   * sample's own time when the file gives one later than the last, else one new period after the last sample.
   */
  ratePlan?: readonly { rateHz: number; endSample: number }[];
  /** Rate for a stretch of a single timed sample, where no interval exists to measure. */
  fallbackRateHz?: number;
  /** Says where the reader is (file and line or record) for error messages. */
  where: () => string;
}

const gapPeriods = 1.5;

export class SampleBlockBuilder {
  private readonly blockSamples: number;
  private readonly hasControl: boolean;
  private fixedRateHz: number | undefined;
  private readonly ratePlan: readonly { rateHz: number; endSample: number }[];
  private segmentIndex = 0;
  private segmentOriginS = 0;
  private segmentStartSample = 0;
  private readonly fallbackRateHz: number | undefined;
  private readonly where: () => string;

  private sync: Float64Array;
  private ramp: Float64Array;
  private gate: Float64Array;
  private control: Float64Array | null;
  private count = 0;
  private blockStartS = 0;
  private blockAfterGap = false;

  /** Samples taken so far (fixed rate) and the time origin of the file. */
  private samplesSeen = 0;
  private originS = 0;

  /** The current gap-free stretch (timed mode). */
  private stretchFirstS = 0;
  private stretchLastS = 0;
  private stretchSamples = 0;
  private previousPeriodS: number | undefined;
  private pending: SampleBlock | null = null;

  constructor(options: SampleBlockBuilderOptions) {
    this.blockSamples = Math.max(1, Math.floor(options.blockSamples));
    this.hasControl = options.hasControl;
    this.ratePlan = options.ratePlan ?? [];
    this.fixedRateHz = this.ratePlan.length > 0 ? this.ratePlan[0].rateHz : options.fixedRateHz;
    this.fallbackRateHz = options.fallbackRateHz;
    this.where = options.where;
    this.sync = new Float64Array(this.blockSamples);
    this.ramp = new Float64Array(this.blockSamples);
    this.gate = new Float64Array(this.blockSamples);
    this.control = this.hasControl ? new Float64Array(this.blockSamples) : null;
  }

  get totalSamples(): number {
    return this.samplesSeen;
  }

  /**
   * Adds one sample. `timeS` is the sample's time in seconds (NaN when the file has none for it).
   * Completed blocks are pushed onto `out`.
   */
  append(timeS: number, sync: number, ramp: number, gate: number, control: number, out: SampleBlock[]): void {
    if (this.fixedRateHz !== undefined) {
      this.startFixedRate(timeS, out);
    } else {
      if (!Number.isFinite(timeS)) throw new InputError('the sample has no time', this.where());
      if (this.stretchSamples === 0) {
        this.startStretch(timeS);
      } else {
        const intervalS = timeS - this.stretchLastS;
        if (!(intervalS > 0)) {
          const hint = intervalS === 0 ? ': the same time twice; are the times printed with too few decimals for the sample rate?' : '';
          throw new InputError(`time does not increase (${timeS} s after ${this.stretchLastS} s)${hint}`, this.where());
        }
        const periodS = this.stretchSamples > 1 ? (this.stretchLastS - this.stretchFirstS) / (this.stretchSamples - 1) : this.previousPeriodS;
        if (periodS !== undefined && intervalS > gapPeriods * periodS) {
          if (this.count > 0) this.emit(this.takeBlock(), out);
          if (this.stretchSamples > 1) this.previousPeriodS = periodS;
          this.startStretch(timeS);
          this.blockAfterGap = true;
        } else {
          this.stretchLastS = timeS;
          this.stretchSamples++;
          if (this.pending !== null) {
            // The stretch now has an interval: the held block gets its rate and goes out first.
            this.pending.sampleRateHz = this.currentRateHz();
            out.push(this.pending);
            this.pending = null;
          }
        }
      }
      if (this.count === 0) this.blockStartS = timeS;
    }
    const index = this.count;
    this.sync[index] = sync;
    this.ramp[index] = ramp;
    this.gate[index] = gate;
    if (this.control !== null) this.control[index] = control;
    this.count = index + 1;
    this.samplesSeen++;
    if (this.count === this.blockSamples) this.emit(this.takeBlock(), out);
  }

  /**
   * Adds rows 0 .. count - 1 of column arrays, exactly as `append` would one by one; `atRow(row)` is told which row
   * is being added before any row that may raise a fault, so the caller's `where` can name its line. The usual row
   * of a timed stretch (time increasing, no gap, room in the block) is taken inline, without a call per row.
   */
  appendRows(
    time: Float64Array,
    sync: Float64Array,
    ramp: Float64Array,
    gate: Float64Array,
    control: Float64Array,
    count: number,
    out: SampleBlock[],
    atRow: (row: number) => void,
  ): void {
    let row = 0;
    while (row < count) {
      if (this.fixedRateHz !== undefined || this.stretchSamples < 2 || this.pending !== null || this.count === 0) {
        atRow(row);
        this.append(time[row], sync[row], ramp[row], gate[row], control[row], out);
        row++;
        continue;
      }
      // Timed stretch of two or more samples, a block begun: the common case, as in append().
      let stretchLastS = this.stretchLastS;
      let stretchSamples = this.stretchSamples;
      const stretchFirstS = this.stretchFirstS;
      let index = this.count;
      const limit = this.blockSamples;
      const blockSync = this.sync;
      const blockRamp = this.ramp;
      const blockGate = this.gate;
      const blockControl = this.control;
      while (row < count && index < limit) {
        const timeS = time[row];
        const intervalS = timeS - stretchLastS;
        const periodS = (stretchLastS - stretchFirstS) / (stretchSamples - 1);
        if (!(intervalS > 0) || intervalS > gapPeriods * periodS) break;
        stretchLastS = timeS;
        stretchSamples++;
        blockSync[index] = sync[row];
        blockRamp[index] = ramp[row];
        blockGate[index] = gate[row];
        if (blockControl !== null) blockControl[index] = control[row];
        index++;
        row++;
      }
      this.samplesSeen += index - this.count;
      this.count = index;
      this.stretchLastS = stretchLastS;
      this.stretchSamples = stretchSamples;
      if (this.count === this.blockSamples) this.emit(this.takeBlock(), out);
      else if (row < count) {
        // A fault, a gap or a time that is no number: the one-by-one path says what it is.
        atRow(row);
        this.append(time[row], sync[row], ramp[row], gate[row], control[row], out);
        row++;
      }
    }
  }

  /**
   * Fixed-rate fast path for binary readers: write up to `roomInBlock` samples straight into `buffers()`
   * from index `writeIndex`, then commit them here. `firstTimeS` is the time of the first committed sample
   * (only the file's first sample sets the origin; NaN when it has none).
   */
  get roomInBlock(): number {
    return Math.min(this.blockSamples - this.count, this.samplesLeftInRate());
  }

  /** Before a fixed-rate run: moves to the next rate when the current one has ended (its partial block goes out). */
  nextRateIfDue(out: SampleBlock[]): void {
    while (this.segmentIndex < this.ratePlan.length - 1 && this.samplesSeen >= this.ratePlan[this.segmentIndex].endSample) {
      if (this.count > 0) this.emit(this.takeBlock(), out);
      this.segmentOriginS += (this.samplesSeen - this.segmentStartSample) / (this.fixedRateHz as number);
      this.segmentStartSample = this.samplesSeen;
      this.segmentIndex++;
      this.fixedRateHz = this.ratePlan[this.segmentIndex].rateHz;
      this.segmentOriginS += 1 / this.fixedRateHz - 1 / this.ratePlan[this.segmentIndex - 1].rateHz;
      this.rateJustChanged = true;
    }
  }

  private rateJustChanged = false;

  private samplesLeftInRate(): number {
    if (this.segmentIndex >= this.ratePlan.length - 1) return Number.POSITIVE_INFINITY;
    return Math.max(0, this.ratePlan[this.segmentIndex].endSample - this.samplesSeen);
  }

  /** Time bookkeeping of a fixed-rate sample (or the first of a run): origin, rate changes, block start. */
  private startFixedRate(timeS: number, out: SampleBlock[]): void {
    this.nextRateIfDue(out);
    const rateHz = this.fixedRateHz as number;
    if (this.samplesSeen === 0) {
      if (Number.isFinite(timeS)) this.originS = timeS;
      this.segmentOriginS = this.originS;
    } else if (this.rateJustChanged && Number.isFinite(timeS) && timeS > this.segmentOriginS - 1 / rateHz) {
      this.segmentOriginS = timeS;
    }
    this.rateJustChanged = false;
    if (this.count === 0) this.blockStartS = this.segmentOriginS + (this.samplesSeen - this.segmentStartSample) / rateHz;
  }

  get writeIndex(): number {
    return this.count;
  }

  buffers(): { sync: Float64Array; ramp: Float64Array; gate: Float64Array; control: Float64Array | null } {
    return { sync: this.sync, ramp: this.ramp, gate: this.gate, control: this.control };
  }

  commitFixedRate(samples: number, firstTimeS: number, out: SampleBlock[]): void {
    if (this.fixedRateHz === undefined || samples <= 0) return;
    this.startFixedRate(firstTimeS, out);
    this.count += samples;
    this.samplesSeen += samples;
    if (this.count === this.blockSamples) out.push(this.takeBlock());
  }

  /** Ends the stream: the partial block, if any. */
  flush(out: SampleBlock[]): void {
    if (this.count > 0) this.emit(this.takeBlock(), out);
    if (this.pending !== null) this.requireRate();
  }

  /**
   * A block whose stretch has a single timed sample so far (blocks of one sample) has no rate yet: hold it
   * until the next sample gives an interval. A gap or the end before that leaves the rate unknowable.
   */
  private emit(block: SampleBlock, out: SampleBlock[]): void {
    if (this.pending !== null) this.requireRate();
    if (Number.isNaN(block.sampleRateHz)) {
      if (this.stretchSamples > 1) block.sampleRateHz = this.currentRateHz();
      else {
        this.pending = block;
        return;
      }
    }
    out.push(block);
  }

  private requireRate(): never {
    throw new InputError('cannot tell the sample rate: a single timed sample and no rate given', this.where());
  }

  private startStretch(timeS: number): void {
    this.stretchFirstS = timeS;
    this.stretchLastS = timeS;
    this.stretchSamples = 1;
  }

  /** The rate for the current block; NaN while a first stretch has a single sample and no rate is given. */
  private currentRateHz(): number {
    if (this.fixedRateHz !== undefined) return this.fixedRateHz;
    if (this.stretchSamples > 1) return (this.stretchSamples - 1) / (this.stretchLastS - this.stretchFirstS);
    if (this.previousPeriodS !== undefined) return 1 / this.previousPeriodS;
    if (this.fallbackRateHz !== undefined) return this.fallbackRateHz;
    return Number.NaN;
  }

  private takeBlock(): SampleBlock {
    const length = this.count;
    const block: SampleBlock = {
      startS: this.blockStartS,
      sampleRateHz: this.currentRateHz(),
      sync: length === this.blockSamples ? this.sync : this.sync.slice(0, length),
      ramp: length === this.blockSamples ? this.ramp : this.ramp.slice(0, length),
      gate: length === this.blockSamples ? this.gate : this.gate.slice(0, length),
      control: this.control === null ? null : length === this.blockSamples ? this.control : this.control.slice(0, length),
      afterGap: this.blockAfterGap,
    };
    this.blockAfterGap = false;
    this.count = 0;
    if (length === this.blockSamples) {
      this.sync = new Float64Array(this.blockSamples);
      this.ramp = new Float64Array(this.blockSamples);
      this.gate = new Float64Array(this.blockSamples);
      this.control = this.hasControl ? new Float64Array(this.blockSamples) : null;
    }
    return block;
  }
}
