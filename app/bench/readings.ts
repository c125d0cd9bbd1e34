/**
 * What the analysis engine reports: one reading per firing interval as it completes (the live bench screen and the
 * logbook consume them), and the summary of a whole capture (`rampwright analyze --json` prints it).
 * A firing interval is the stretch one gate pulse belongs to: a half-cycle on a full-wave board (from each zero
 * crossing), a whole cycle on a half-wave board (from the rising zero crossing).
 * Angles are electrical degrees from the mains zero crossing: the sync crossing corrected by the design's sync phase.
 */
import type { TransferFitReading } from '../signal/transferCurve';
import type { HalfCycleBalanceReading } from './halfCycleBalance';

export type Rectifier = 'half-wave' | 'full-wave';

export interface CycleReading {
  /** Start of the firing interval: its starting sync zero crossing, seconds from the start of the capture. */
  t: number;
  /** Direction of the starting crossing: positive half-cycle starts on a rising crossing. */
  halfCycle: 'positive' | 'negative';
  periodS: number;
  /** Firing angle of the first pulse in the right half-cycle, null when none fired. */
  alphaDeg: number | null;
  /** Control voltage at that firing instant, null without a control channel or pulse. */
  controlV: number | null;
  /** Gate pulses in the half-cycle that should fire. */
  pulses: number;
  /** Pulses where none belong (the other half-cycle of a half-wave board). */
  wrongHalfCyclePulses: number;
  rampPeakV: number | null;
  rampFloorV: number | null;
  slopeVPerMs: number | null;
  startDelayDeg: number | null;
  nonlinearityPct: number | null;
  clipped: boolean | null;
  /** Time the ramp spent in reset before this interval's charging (end of last charge to start of this one). */
  resetUs: number | null;
}

export interface RampSummary {
  /** Mean floor (start level). */
  floorV: number | null;
  /** Median of the per-interval peaks. */
  peakV: number | null;
  /** Mean least-squares slope over the linear part. */
  slopeVPerMs: number | null;
  /** Median per-interval max deviation from the line, % of peak. */
  nonlinearityPct: number | null;
  /** True when at least half the charging intervals clip. */
  clipped: boolean;
  clippedIntervals: number;
  chargingIntervals: number;
  /** Mean start delay after the zero crossing. */
  startDelayDeg: number | null;
  resetUs: number | null;
  peakMinV: number | null;
  peakMaxV: number | null;
}

export interface PulseSummary {
  /** Gate pulses found in the firing intervals analysed (right and wrong half-cycles). */
  count: number;
  alphaDeg: number | null;
  /** Standard deviation of alpha: firing jitter. */
  alphaStdDeg: number | null;
  alphaMinDeg: number | null;
  alphaMaxDeg: number | null;
  widthUs: number | null;
  amplitudeV: number | null;
  wrongHalfCycle: number;
  /** Firing intervals without a pulse in the half-cycle that should fire. */
  missing: number;
  /** Firing intervals with more than one pulse in that half-cycle. */
  multiplePulses: number;
  gateLowV: number | null;
  gateHighV: number | null;
  /** Mean control voltage at the firing instants, null without a control channel. */
  controlV: number | null;
}

/** The transfer curve's least-squares fit as a capture reports it (app/signal/transferCurve). */
export type TransferSummary = TransferFitReading;

export interface CaptureReadings {
  frequencyHz: number | null;
  /** Complete mains cycles measured (rising crossing to rising crossing, never across a gap). */
  cycles: number;
  ramp: RampSummary;
  pulse: PulseSummary;
  transfer: TransferSummary | null;
  perCycle: Array<{ t: number; alphaDeg: number | null; rampPeakV: number | null; controlV: number | null }>;
  rectifier: Rectifier;
  syncPhaseDeg: number;
  sampleRateHz: number | null;
  durationS: number;
  firingIntervals: number;
  frequencyDriftHz: number | null;
  frequencyDriftHzPerS: number | null;
  periodJitterUs: number | null;
  syncOffsetV: number | null;
  syncAmplitudeV: number | null;
  /** Gaps in the samples (lost logger blocks, breaks in a file); analysis restarted after each. */
  gaps: number;
  /** Samples that were not finite numbers (or beyond +-1 MV): treated as lost, analysis restarted after them. */
  invalidSamples: number;
  /** Positive minus negative half-cycle (full-wave boards; null for half-wave): app/bench/halfCycleBalance.ts. */
  balance: HalfCycleBalanceReading | null;
  /**
   * Firing intervals whose alpha and period came from the logger's timed edges (PROTOCOL.md "Timed edges") rather
   * than the samples; absent when the source timed none.
   */
  timedIntervals?: number;
}
