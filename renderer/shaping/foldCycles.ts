/**
 * The cycle fold: cut a stream of samples at the sync's rising zero crossings and map each cycle's time onto
 * electrical degrees 0-360 of that cycle, so every recent cycle can be drawn over the others.
 * Degrees are scaled per cycle (its own period), so a drifting mains frequency does not smear the fold.
 * Incremental: blocks and crossings arrive in any split; memory is bounded by one cycle plus one block.
 * DOM-free so it is unit-tested in Node.
 */
export interface FoldedCycle {
  /** Time of the rising zero crossing that starts the cycle (s). */
  startS: number;
  periodS: number;
  degrees: Float64Array;
  values: Float64Array;
}

/** Electrical degrees of instant `timeS` within a cycle that starts at `cycleStartS` and lasts `periodS`. */
export function timeToDegrees(timeS: number, cycleStartS: number, periodS: number): number {
  return (360 * (timeS - cycleStartS)) / periodS;
}

export interface CycleFolderOptions {
  sampleRateHz: number;
  /** Cycles kept for drawing; the oldest are dropped first (the fold shows about 20). */
  keepCycles: number;
  /** A gap between crossings longer than this many nominal periods is a gap, not a cycle. */
  maxPeriodS: number;
}

/** Streaming folder: a cycle is emitted once its closing crossing and every sample up to it have arrived. */
export class CycleFolder {
  private readonly options: CycleFolderOptions;
  private readonly cycles: FoldedCycle[] = [];
  private pendingCrossingsS: number[] = [];
  /** Sample times are originS + index / rate with integer indices, so long streams gather no rounding drift. */
  private originS = 0;
  private bufferStartIndex = 0;
  private buffer: number[] = [];

  constructor(options: CycleFolderOptions) {
    if (!(options.sampleRateHz > 0) || !(options.keepCycles >= 1)) throw new TypeError('CycleFolder needs sampleRateHz > 0 and keepCycles >= 1');
    this.options = options;
  }

  /** Forget the partial cycle: after a gap in the record no cycle may join two stretches of signal. */
  reset(): void {
    this.pendingCrossingsS = [];
    this.buffer = [];
  }

  /** Forget the partial cycle and the kept ones. */
  clear(): void {
    this.reset();
    this.cycles.length = 0;
  }

  /**
   * Consecutive samples (`startS` is the first one's time) with the rising crossings the analyser found in them.
   * A block that does not follow on from the last one starts the fold again (a gap is never bridged).
   */
  pushBlock(startS: number, values: ArrayLike<number>, crossingsS: readonly number[]): void {
    const rateHz = this.options.sampleRateHz;
    const expectedS = this.sampleTimeS(this.bufferStartIndex + this.buffer.length);
    if (this.buffer.length === 0 || Math.abs(startS - expectedS) > 0.5 / rateHz) {
      this.pendingCrossingsS = [];
      this.buffer = [];
      this.originS = startS;
      this.bufferStartIndex = 0;
    }
    for (let index = 0; index < values.length; index++) this.buffer.push(values[index]);
    for (const crossingS of crossingsS) {
      const last = this.pendingCrossingsS[this.pendingCrossingsS.length - 1];
      if (last === undefined || crossingS > last) this.pendingCrossingsS.push(crossingS);
    }
    this.drain();
  }

  /** The kept cycles, oldest first. */
  folded(): readonly FoldedCycle[] {
    return this.cycles;
  }

  private sampleTimeS(index: number): number {
    return this.originS + index / this.options.sampleRateHz;
  }

  /** First sample index at or after `timeS`. */
  private indexAtOrAfter(timeS: number): number {
    return Math.ceil((timeS - this.originS) * this.options.sampleRateHz - 1e-9);
  }

  private drain(): void {
    while (this.pendingCrossingsS.length >= 2) {
      const startS = this.pendingCrossingsS[0];
      const endS = this.pendingCrossingsS[1];
      const bufferEndIndex = this.bufferStartIndex + this.buffer.length;
      if (this.buffer.length === 0 || this.indexAtOrAfter(endS) > bufferEndIndex) break; // wait for the closing samples
      this.pendingCrossingsS.shift();
      const periodS = endS - startS;
      const firstIndex = this.indexAtOrAfter(startS);
      if (periodS > this.options.maxPeriodS || firstIndex < this.bufferStartIndex) continue;
      const count = Math.max(0, this.indexAtOrAfter(endS) - firstIndex);
      const degrees = new Float64Array(count);
      const values = new Float64Array(count);
      for (let k = 0; k < count; k++) {
        // A sample within rounding of the crossing counts as 0 degrees, not -1e-13.
        degrees[k] = Math.max(0, timeToDegrees(this.sampleTimeS(firstIndex + k), startS, periodS));
        values[k] = this.buffer[firstIndex + k - this.bufferStartIndex];
      }
      this.cycles.push({ startS, periodS, degrees, values });
      if (this.cycles.length > this.options.keepCycles) this.cycles.shift();
    }
    this.trimBuffer();
  }

  /** Drop samples no pending or future cycle can use (bounded memory). */
  private trimBuffer(): void {
    const bufferEndIndex = this.bufferStartIndex + this.buffer.length;
    const keepFromIndex =
      this.pendingCrossingsS.length > 0
        ? this.indexAtOrAfter(this.pendingCrossingsS[0]) - 1
        : bufferEndIndex - Math.ceil(this.options.maxPeriodS * this.options.sampleRateHz);
    const dropCount = Math.min(this.buffer.length, keepFromIndex - this.bufferStartIndex);
    if (dropCount > 0) {
      this.buffer.splice(0, dropCount);
      this.bufferStartIndex += dropCount;
    }
  }
}
