/**
 * Running summary of the per-interval readings in constant memory (Welford statistics, a block-wise median, the
 * transfer accumulator), turned into the capture's readings at the end.
 */
import { RunningStatistics, StreamingMedian } from '../signal/runningStatistics';
import { TransferCurveAccumulator } from '../signal/transferCurve';
import type { MainsFrequencyReading } from '../signal/mainsFrequency';
import { HalfCycleBalance } from './halfCycleBalance';
import type { CaptureReadings, CycleReading, Rectifier } from './readings';

export interface SummaryContext {
  rectifier: Rectifier;
  syncPhaseDeg: number;
  sampleRateHz: number | null;
  durationS: number;
  gaps: number;
  mains: MainsFrequencyReading;
  syncOffsetV: number | null;
  syncAmplitudeV: number | null;
  gateLowV: number | null;
  gateHighV: number | null;
  invalidSamples: number;
}

export class ReadingsSummary {
  private readonly keepPerCycle: boolean;
  private readonly perCycle: CaptureReadings['perCycle'] = [];
  private readonly alpha = new RunningStatistics();
  private readonly peak = new StreamingMedian();
  private readonly peakRange = new RunningStatistics();
  private readonly floor = new RunningStatistics();
  private readonly slope = new RunningStatistics();
  private readonly startDelay = new RunningStatistics();
  private readonly reset = new RunningStatistics();
  private readonly nonlinearity = new StreamingMedian();
  private readonly width = new RunningStatistics();
  private readonly amplitude = new RunningStatistics();
  private readonly transfer = new TransferCurveAccumulator();
  private readonly control = new RunningStatistics();
  private readonly balance = new HalfCycleBalance();
  private intervals = 0;
  private chargingIntervals = 0;
  private clippedIntervals = 0;
  private pulses = 0;
  private wrongHalfCycle = 0;
  private missing = 0;
  private multiplePulses = 0;

  constructor(options: { keepPerCycle: boolean }) {
    this.keepPerCycle = options.keepPerCycle;
  }

  addInterval(reading: CycleReading): void {
    this.intervals += 1;
    this.balance.add(reading);
    if (this.keepPerCycle) {
      this.perCycle.push({ t: reading.t, alphaDeg: reading.alphaDeg, rampPeakV: reading.rampPeakV, controlV: reading.controlV });
    }
    this.pulses += reading.pulses + reading.wrongHalfCyclePulses;
    this.wrongHalfCycle += reading.wrongHalfCyclePulses;
    if (reading.pulses === 0) this.missing += 1;
    if (reading.pulses > 1) this.multiplePulses += 1;
    if (reading.alphaDeg !== null) {
      this.alpha.add(reading.alphaDeg);
      if (reading.controlV !== null) {
        this.transfer.add(reading.controlV, reading.alphaDeg);
        this.control.add(reading.controlV);
      }
    }
    if (reading.rampPeakV !== null) {
      this.chargingIntervals += 1;
      this.peak.add(reading.rampPeakV);
      this.peakRange.add(reading.rampPeakV);
      if (reading.clipped) this.clippedIntervals += 1;
    }
    if (reading.rampFloorV !== null) this.floor.add(reading.rampFloorV);
    if (reading.slopeVPerMs !== null) this.slope.add(reading.slopeVPerMs);
    if (reading.startDelayDeg !== null) this.startDelay.add(reading.startDelayDeg);
    if (reading.resetUs !== null) this.reset.add(reading.resetUs);
    if (reading.nonlinearityPct !== null) this.nonlinearity.add(reading.nonlinearityPct);
  }

  addPulseShape(widthUs: number, amplitudeV: number): void {
    this.width.add(widthUs);
    this.amplitude.add(amplitudeV);
  }

  build(context: SummaryContext): CaptureReadings {
    return {
      frequencyHz: context.mains.frequencyHz,
      cycles: context.mains.cycles,
      ramp: {
        floorV: this.floor.mean,
        peakV: this.peak.median,
        slopeVPerMs: this.slope.mean,
        nonlinearityPct: this.nonlinearity.median,
        clipped: this.chargingIntervals > 0 && this.clippedIntervals * 2 >= this.chargingIntervals,
        clippedIntervals: this.clippedIntervals,
        chargingIntervals: this.chargingIntervals,
        startDelayDeg: this.startDelay.mean,
        resetUs: this.reset.mean,
        peakMinV: this.peakRange.minimum,
        peakMaxV: this.peakRange.maximum,
      },
      pulse: {
        count: this.pulses,
        alphaDeg: this.alpha.mean,
        alphaStdDeg: this.alpha.standardDeviation,
        alphaMinDeg: this.alpha.minimum,
        alphaMaxDeg: this.alpha.maximum,
        widthUs: this.width.mean,
        amplitudeV: this.amplitude.mean,
        wrongHalfCycle: this.wrongHalfCycle,
        missing: this.missing,
        multiplePulses: this.multiplePulses,
        gateLowV: context.gateLowV,
        gateHighV: context.gateHighV,
        controlV: this.control.mean,
      },
      transfer: this.transfer.reading(),
      perCycle: this.perCycle,
      rectifier: context.rectifier,
      syncPhaseDeg: context.syncPhaseDeg,
      sampleRateHz: context.sampleRateHz,
      durationS: context.durationS,
      firingIntervals: this.intervals,
      frequencyDriftHz: context.mains.frequencyDriftHz,
      frequencyDriftHzPerS: context.mains.frequencyDriftHzPerS,
      periodJitterUs: context.mains.periodJitterUs,
      syncOffsetV: context.syncOffsetV,
      syncAmplitudeV: context.syncAmplitudeV,
      gaps: context.gaps,
      invalidSamples: context.invalidSamples,
      balance: context.rectifier === 'full-wave' ? this.balance.reading() : null,
    };
  }
}
