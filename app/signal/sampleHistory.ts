/**
 * The last stretch of one channel's samples, addressed by stream sample number. Windows of the recent past are cut
 * from it; older samples are discarded, so memory stays at about one mains cycle whatever the stream's length.
 */
export class SampleHistory {
  private buffer: Float64Array;
  /** Stream sample number of buffer[0]. */
  private firstIndex = 0;
  private count = 0;

  constructor(options: { initialCapacity?: number } = {}) {
    this.buffer = new Float64Array(Math.max(16, options.initialCapacity ?? 8192));
  }

  /** Stream number one past the newest sample. */
  get endIndex(): number {
    return this.firstIndex + this.count;
  }

  get startIndex(): number {
    return this.firstIndex;
  }

  /** Empties the history; the next sample appended will be number `nextIndex`. */
  reset(nextIndex: number): void {
    this.firstIndex = nextIndex;
    this.count = 0;
  }

  append(values: ArrayLike<number>): void {
    if (this.count + values.length > this.buffer.length) {
      const grown = new Float64Array(Math.max(this.buffer.length * 2, this.count + values.length));
      grown.set(this.buffer.subarray(0, this.count));
      this.buffer = grown;
    }
    if (values instanceof Float64Array) this.buffer.set(values, this.count);
    else for (let i = 0; i < values.length; i++) this.buffer[this.count + i] = values[i];
    this.count += values.length;
  }

  /** Drops samples numbered below `index`. */
  discardBefore(index: number): void {
    const drop = Math.min(this.count, Math.max(0, Math.floor(index) - this.firstIndex));
    if (drop <= 0) return;
    this.buffer.copyWithin(0, drop, this.count);
    this.count -= drop;
    this.firstIndex += drop;
  }

  /** A view of samples numbered [from, to), clipped to what is held; `firstIndex` tells where the view starts. */
  window(from: number, to: number): { values: Float64Array; firstIndex: number } {
    const start = Math.max(this.firstIndex, Math.floor(from));
    const end = Math.min(this.endIndex, Math.ceil(to));
    if (end <= start) return { values: new Float64Array(0), firstIndex: start };
    return { values: this.buffer.subarray(start - this.firstIndex, end - this.firstIndex), firstIndex: start };
  }
}
