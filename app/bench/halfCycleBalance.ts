/**
 * Half-cycle balance of a full-wave board: how much later the positive half-cycle fires than the negative one, and
 * how much taller its ramp is. Unequal firing puts a DC component into the supply transformer and makes the output
 * pulses uneven (common practice in phase-control commissioning); a DC offset on the sync winding is the usual
 * cause, because the board then resets its ramp early in one half-cycle and late in the other.
 *
 * Each estimate compares one half-cycle with the mean of its two neighbours of the other polarity, so a control
 * voltage swept linearly while measuring cancels (the neighbours straddle it): for three consecutive readings
 * a, b, c, the difference is b - (a + c)/2, signed positive minus negative. The summary is their mean.
 */
import { RunningStatistics } from '../signal/runningStatistics';
import type { CycleReading } from './readings';

export interface HalfCycleBalanceReading {
  /** Mean alpha of the positive half-cycles minus that of the negative ones (deg); null when not measured. */
  alphaDeg: number | null;
  /** Mean ramp peak of the positive half-cycles minus that of the negative ones (V). */
  rampPeakV: number | null;
  /** Estimates averaged (neighbouring triples of half-cycles with the figure measured). */
  alphaTriples: number;
  rampTriples: number;
}

type Figure = 'alphaDeg' | 'rampPeakV';

/** Consecutive when the next half-cycle starts half a period later, within a quarter of that (no gap, none missed). */
function follows(previous: CycleReading, next: CycleReading): boolean {
  const halfPeriodS = previous.periodS / 2;
  return next.halfCycle !== previous.halfCycle && Math.abs(next.t - previous.t - halfPeriodS) < 0.25 * halfPeriodS;
}

export class HalfCycleBalance {
  private readonly alpha = new RunningStatistics();
  private readonly peak = new RunningStatistics();
  private older: CycleReading | null = null;
  private newer: CycleReading | null = null;

  add(reading: CycleReading): void {
    const continues = this.newer !== null && follows(this.newer, reading);
    if (continues && this.older && this.newer) {
      this.addTriple(this.alpha, 'alphaDeg', this.older, this.newer, reading);
      this.addTriple(this.peak, 'rampPeakV', this.older, this.newer, reading);
    }
    this.older = continues ? this.newer : null;
    this.newer = reading;
  }

  reading(): HalfCycleBalanceReading {
    return { alphaDeg: this.alpha.mean, rampPeakV: this.peak.mean, alphaTriples: this.alpha.count, rampTriples: this.peak.count };
  }

  private addTriple(statistics: RunningStatistics, figure: Figure, first: CycleReading, middle: CycleReading, last: CycleReading): void {
    const a = first[figure];
    const b = middle[figure];
    const c = last[figure];
    if (a === null || b === null || c === null) return;
    const middleMinusOthers = b - (a + c) / 2;
    statistics.add(middle.halfCycle === 'positive' ? middleMinusOthers : -middleMinusOthers);
  }
}
