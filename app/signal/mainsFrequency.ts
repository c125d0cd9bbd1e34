/**
 * Mains frequency, drift and period jitter from zero-crossing instants, in constant memory.
 * - Frequency: least-squares line through the crossing instants against their count (both directions, each a half
 *   period apart) per gap-free stretch; this uses every crossing rather than only the first and last, and an offset
 *   left in the sync that makes alternate half-cycles unequal averages out.
 * - Drift: least-squares slope of each period's frequency against time (Hz/s), and that slope times the duration.
 * - Period jitter: cycle-to-cycle, the RMS of successive period differences divided by sqrt 2 (common practice: it
 *   equals the period's standard deviation for random jitter and ignores slow drift).
 */
import { LineAccumulator } from './leastSquares';
import type { CrossingDirection } from './zeroCrossings';

export interface MainsFrequencyReading {
  frequencyHz: number | null;
  /** Complete cycles measured (rising crossing to rising crossing, never across a gap). */
  cycles: number;
  frequencyDriftHzPerS: number | null;
  /** Frequency change over the capture from the drift fit. */
  frequencyDriftHz: number | null;
  periodJitterUs: number | null;
  periodMinUs: number | null;
  periodMaxUs: number | null;
}

export class MainsFrequencyTracker {
  private stretch = new LineAccumulator();
  private stretchCrossings = 0;
  private lastDirection: CrossingDirection | null = null;
  private halfPeriodsTotal = 0;
  private fittedSecondsTotal = 0;
  private lastRisingS = Number.NaN;
  private lastPeriodS = Number.NaN;
  private readonly drift = new LineAccumulator();
  private firstPeriodMidS = Number.NaN;
  private lastPeriodMidS = Number.NaN;
  private periodDifferenceSquares = 0;
  private periodDifferences = 0;
  private periodMinS = Number.POSITIVE_INFINITY;
  private periodMaxS = Number.NEGATIVE_INFINITY;
  cycles = 0;

  add(timeS: number, direction: CrossingDirection): void {
    // The tracker alternates directions; a repeated direction means a crossing was lost, so count two half periods.
    this.stretchCrossings += this.lastDirection === direction ? 2 : this.lastDirection === null ? 0 : 1;
    this.lastDirection = direction;
    this.stretch.add(this.stretchCrossings, timeS);
    if (direction !== 'rising') return;
    if (Number.isFinite(this.lastRisingS)) {
      const periodS = timeS - this.lastRisingS;
      this.cycles += 1;
      const midS = (timeS + this.lastRisingS) / 2;
      if (!Number.isFinite(this.firstPeriodMidS)) this.firstPeriodMidS = midS;
      this.lastPeriodMidS = midS;
      this.drift.add(midS, 1 / periodS);
      if (periodS < this.periodMinS) this.periodMinS = periodS;
      if (periodS > this.periodMaxS) this.periodMaxS = periodS;
      if (Number.isFinite(this.lastPeriodS)) {
        const differenceS = periodS - this.lastPeriodS;
        this.periodDifferenceSquares += differenceS * differenceS;
        this.periodDifferences += 1;
      }
      this.lastPeriodS = periodS;
    }
    this.lastRisingS = timeS;
  }

  /** The last complete period (s), or NaN before the first. */
  get lastPeriod(): number {
    return this.lastPeriodS;
  }

  /** Closes the gap-free stretch: the next crossing starts a new one. */
  restart(): void {
    this.closeStretch();
    this.lastDirection = null;
    this.lastRisingS = Number.NaN;
    this.lastPeriodS = Number.NaN;
  }

  private closeStretch(): void {
    const fit = this.stretch.fit();
    if (fit && this.stretchCrossings > 0) {
      this.halfPeriodsTotal += this.stretchCrossings;
      this.fittedSecondsTotal += fit.slope * this.stretchCrossings;
    }
    this.stretch = new LineAccumulator();
    this.stretchCrossings = 0;
  }

  reading(): MainsFrequencyReading {
    // Include the open stretch without closing it.
    let halfPeriods = this.halfPeriodsTotal;
    let fittedSeconds = this.fittedSecondsTotal;
    const fit = this.stretch.fit();
    if (fit && this.stretchCrossings > 0) {
      halfPeriods += this.stretchCrossings;
      fittedSeconds += fit.slope * this.stretchCrossings;
    }
    const driftFit = this.drift.fit();
    const durationS = this.lastPeriodMidS - this.firstPeriodMidS;
    return {
      // At least one complete cycle: two crossings of a few samples give a number, not a mains frequency.
      frequencyHz: fittedSeconds > 0 && this.cycles > 0 ? halfPeriods / (2 * fittedSeconds) : null,
      cycles: this.cycles,
      frequencyDriftHzPerS: driftFit ? driftFit.slope : null,
      frequencyDriftHz: driftFit ? driftFit.slope * durationS : null,
      periodJitterUs: this.periodDifferences > 0 ? (Math.sqrt(this.periodDifferenceSquares / this.periodDifferences) / Math.SQRT2) * 1e6 : null,
      periodMinUs: this.cycles > 0 ? this.periodMinS * 1e6 : null,
      periodMaxUs: this.cycles > 0 ? this.periodMaxS * 1e6 : null,
    };
  }
}
