/**
 * Gate pulses, block by block in constant memory. Edges are the 50 % (mesial) crossings between the IEEE 181
 * state levels, found by linear interpolation between the bracketing samples; a pulse starts only when the signal
 * also passes 10 % of the span beyond the mesial level (hysteresis against noise), and ends likewise.
 * The control voltage is interpolated at each pulse's rising crossing: the firing instant.
 * A pulse that only one sample sees (as wide as the sample interval or less) has unresolved edges: that sample may
 * sit on the rising or the falling edge, so interpolating with it could misplace the edge by most of a sample.
 * Its edges are put mid-way between the sample and its neighbours, the position that is never more than half a
 * sample from a step edge (REFERENCES.md: a step-like edge allows +-half a sample).
 */
export interface GatePulse {
  /** Rising 50 % crossing (sub-sample position in the stream's numbering). */
  riseIndex: number;
  /** Falling 50 % crossing, null while the pulse lasts. */
  fallIndex: number | null;
  /** Mean of the samples above the mesial level, minus the low state level. */
  amplitudeV: number;
  /** Control voltage at the rising crossing, null without a control channel. */
  controlV: number | null;
}

export interface GateLevels {
  lowV: number;
  highV: number;
}

export interface GatePulseOptions {
  /** Hysteresis beyond the mesial level, fraction of the span (default 0.1). */
  hysteresisFraction?: number;
  /** Smallest low-to-high span that counts as pulses (default 0.5 V; a gate drive test point swings volts, common practice). */
  minimumSpanV?: number;
}

export class GatePulseTracker {
  private levels: GateLevels | null;
  private readonly hysteresisFraction: number;
  private readonly minimumSpanV: number;
  private high = false;
  private previousValue = Number.NaN;
  private previousControl = Number.NaN;
  private candidateIndex = Number.NaN;
  private candidateControl = Number.NaN;
  private open: GatePulse | null = null;
  private openSumV = 0;
  private openCount = 0;
  private openHighIndex = Number.NaN;
  private openControlBefore = Number.NaN;
  private openControlAtHigh = Number.NaN;
  // Running extremes, used only when the first record showed no pulses to learn levels from.
  private seenMinV = Number.POSITIVE_INFINITY;
  private seenMaxV = Number.NEGATIVE_INFINITY;

  constructor(levels: GateLevels | null, options: GatePulseOptions = {}) {
    this.hysteresisFraction = options.hysteresisFraction ?? 0.1;
    this.minimumSpanV = options.minimumSpanV ?? 0.5;
    this.levels = levels && levels.highV - levels.lowV >= this.minimumSpanV ? levels : null;
  }

  get gateLevels(): GateLevels | null {
    return this.levels;
  }

  /** Forgets an unfinished pulse (after a gap). */
  restart(): void {
    this.high = false;
    this.open = null;
    this.previousValue = Number.NaN;
    this.previousControl = Number.NaN;
    this.candidateIndex = Number.NaN;
  }

  /**
   * Feeds samples numbered from `firstIndex`. `started` lists pulses whose rising edge is in this block
   * (their `fallIndex` is filled in later, on the same object); `completed` lists pulses that ended in it.
   */
  push(gate: ArrayLike<number>, control: ArrayLike<number> | null, firstIndex: number): { started: GatePulse[]; completed: GatePulse[] } {
    const started: GatePulse[] = [];
    const completed: GatePulse[] = [];
    let levels = this.levels;
    let lowV = levels ? levels.lowV : 0;
    let spanV = levels ? levels.highV - levels.lowV : 0;
    let mesialV = lowV + spanV / 2;
    let hysteresisV = this.hysteresisFraction * spanV;
    // The per-sample state lives in locals for the loop (the hot path) and goes back to the fields after it.
    let high = this.high;
    let previous = this.previousValue;
    let previousControl = this.previousControl;
    for (let i = 0; i < gate.length; i++) {
      const value = gate[i];
      const controlValue = control ? control[i] : Number.NaN;
      const index = firstIndex + i;
      if (!levels) {
        this.learnLevels(value);
        levels = this.levels;
        if (levels) {
          lowV = levels.lowV;
          spanV = levels.highV - levels.lowV;
          mesialV = lowV + spanV / 2;
          hysteresisV = this.hysteresisFraction * spanV;
        }
      }
      if (levels) {
        // Remember the latest mesial crossing in each direction: the edge instant once hysteresis confirms it.
        if ((previous <= mesialV) !== (value <= mesialV) && Number.isFinite(previous)) {
          const fraction = (mesialV - previous) / (value - previous);
          this.candidateIndex = index - 1 + fraction;
          this.candidateControl = control ? previousControl + fraction * (controlValue - previousControl) : Number.NaN;
        }
        if (!high) {
          if (value > mesialV + hysteresisV) {
            high = true;
            const riseIndex = Number.isFinite(this.candidateIndex) ? this.candidateIndex : index;
            const controlV = control ? (Number.isFinite(this.candidateControl) ? this.candidateControl : controlValue) : null;
            this.open = { riseIndex, fallIndex: null, amplitudeV: 0, controlV };
            this.openSumV = 0;
            this.openCount = 0;
            this.openControlBefore = previousControl;
            started.push(this.open);
          }
        } else if (value < mesialV - hysteresisV) {
          high = false;
          if (this.open) {
            this.open.fallIndex = Number.isFinite(this.candidateIndex) ? this.candidateIndex : index;
            if (this.openCount === 1) {
              this.open.riseIndex = this.openHighIndex - 0.5;
              this.open.fallIndex = this.openHighIndex + 0.5;
              if (this.open.controlV !== null) this.open.controlV = (this.openControlBefore + this.openControlAtHigh) / 2;
            }
            this.open.amplitudeV = this.openCount > 0 ? this.openSumV / this.openCount - lowV : spanV;
            completed.push(this.open);
            this.open = null;
          }
        }
        if (high && value > mesialV && this.open) {
          this.openSumV += value;
          this.openCount += 1;
          if (this.openCount === 1) {
            this.openHighIndex = index;
            this.openControlAtHigh = controlValue;
          }
        }
      }
      previous = value;
      previousControl = controlValue;
    }
    this.high = high;
    this.previousValue = previous;
    this.previousControl = previousControl;
    return { started, completed };
  }

  private learnLevels(value: number): void {
    if (value < this.seenMinV) this.seenMinV = value;
    if (value > this.seenMaxV) this.seenMaxV = value;
    if (this.seenMaxV - this.seenMinV >= this.minimumSpanV) {
      this.levels = { lowV: this.seenMinV, highV: this.seenMaxV };
    }
  }
}
