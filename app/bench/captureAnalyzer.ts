/**
 * The analysis engine: sample blocks in, a reading per firing interval out as each completes, a capture summary at
 * the end. The same object serves a live logger stream and a file read block by block; memory stays at about one
 * mains cycle of samples plus constant-size statistics (per-interval readings are kept only if asked for).
 * After a gap (or a change of sample rate) cycle tracking restarts: nothing is joined across a gap.
 */
import type { SampleBlock } from '../capture/samples';
import { GatePulseTracker, type GatePulse } from '../signal/gatePulses';
import { MainsFrequencyTracker } from '../signal/mainsFrequency';
import { analyzeRampSegment } from '../signal/rampSegment';
import { SampleHistory } from '../signal/sampleHistory';
import { TimedEdgeBook } from '../signal/timedEdges';
import { estimateSyncLevels, ZeroCrossingTracker, type ZeroCrossing } from '../signal/zeroCrossings';
import { learnFirstLevels, type FirstLevels } from './firstLevels';
import type { CaptureReadings, CycleReading, Rectifier } from './readings';
import { ReadingsSummary } from './readingsSummary';
import { timedFiring, timedWidthUs } from './timedFiring';
import { splitValidRuns } from './validSamples';

export interface CaptureAnalyzerOptions {
  rectifier: Rectifier;
  /** Sync transformer/filter phase lag (deg, from the design): angles are referred back to the mains crossing. */
  syncPhaseDeg?: number;
  /** Keep every interval's reading for the summary's `perCycle` (default true; a long live stream passes false). */
  keepPerCycle?: boolean;
  /** Seconds of samples used to learn the first levels (default 0.2 s: ten cycles at 50 Hz). */
  warmupS?: number;
  /** A sync smaller than this is taken as absent (default 0.05 V). */
  minimumSyncAmplitudeV?: number;
}

export interface CaptureAnalyzer {
  push(block: SampleBlock): CycleReading[];
  finish(): CaptureReadings;
}

interface FiringWindow {
  startIndex: number;
  direction: ZeroCrossing['direction'];
  /** Crossing before the start (full-wave) for the period; NaN when unknown. */
  priorIndex: number;
  /** Falling crossing inside a half-wave window. */
  midIndex: number;
  endIndex: number;
}

export function createCaptureAnalyzer(options: CaptureAnalyzerOptions): CaptureAnalyzer {
  const rectifier = options.rectifier;
  const syncPhaseDeg = options.syncPhaseDeg ?? 0;
  const warmupS = options.warmupS ?? 0.2;
  const minimumSyncAmplitudeV = options.minimumSyncAmplitudeV ?? 0.05;
  const summary = new ReadingsSummary({ keepPerCycle: options.keepPerCycle ?? true });
  const frequency = new MainsFrequencyTracker();
  const history = new SampleHistory();
  const assigned = new WeakSet<GatePulse>();
  let warmupBlocks: SampleBlock[] | null = [];
  let warmupSeconds = 0;
  let levels: FirstLevels | null = null;
  let crossingTracker: ZeroCrossingTracker | null = null;
  let pulseTracker: GatePulseTracker | null = null;
  let sampleRateHz = Number.NaN;
  let segmentStartS = 0;
  let nextIndex = 0;
  let segments = 0;
  let firstStartS = Number.NaN;
  let lastEndS = Number.NaN;
  let openWindow: FiringWindow | null = null;
  let previousCrossingIndex = Number.NaN;
  const pending: FiringWindow[] = [];
  let pulses: GatePulse[] = [];
  let lastChargeEndIndex = Number.NaN;
  let invalidSamples = 0;
  // A sync that was dead while the first levels were learned (board powered after the capture started, probe
  // clipped on late) is looked for again in whole windows of warmupS, counted in samples so the result does not
  // depend on how the samples arrive in blocks.
  let lateSync: Float64Array | null = null;
  let lateSyncFill = 0;
  // The logger's timed edges, when it sends them: they refine the crossings and pulse edges found in the samples.
  const timedEdges = new TimedEdgeBook();
  let timedIntervals = 0;
  const edgeToleranceS = (): number => 2 / sampleRateHz;

  const timeOf = (index: number): number => segmentStartS + index / sampleRateHz;

  function startSegment(block: SampleBlock): void {
    flushSegment();
    segments += 1;
    sampleRateHz = block.sampleRateHz;
    segmentStartS = block.startS;
    nextIndex = 0;
    history.reset(0);
    crossingTracker?.restart();
    pulseTracker?.restart();
    frequency.restart();
    openWindow = null;
    previousCrossingIndex = Number.NaN;
    pulses = [];
    lastChargeEndIndex = Number.NaN;
    lateSyncFill = 0;
  }

  /** Closes a stretch: windows whose end is known are analysed with whatever margin exists. */
  function flushSegment(): CycleReading[] {
    const readings: CycleReading[] = [];
    while (pending.length > 0) readings.push(analyzeWindow(pending.shift() as FiringWindow));
    return readings;
  }

  function widthUs(riseIndex: number, fallIndex: number): number {
    const timed = timedEdges.size > 0 ? timedWidthUs(timedEdges, timeOf(riseIndex), timeOf(fallIndex), edgeToleranceS()) : null;
    return timed ?? ((fallIndex - riseIndex) / sampleRateHz) * 1e6;
  }

  function onCrossing(crossing: ZeroCrossing): void {
    const sampledS = timeOf(crossing.index);
    const timed = timedEdges.size > 0 ? timedEdges.nearest('sync', crossing.direction, sampledS, edgeToleranceS()) : null;
    frequency.add(timed ? timed.timeS : sampledS, crossing.direction);
    const isBoundary = rectifier === 'full-wave' || crossing.direction === 'rising';
    if (isBoundary) {
      if (openWindow) {
        openWindow.endIndex = crossing.index;
        pending.push(openWindow);
      }
      openWindow = { startIndex: crossing.index, direction: crossing.direction, priorIndex: previousCrossingIndex, midIndex: Number.NaN, endIndex: Number.NaN };
    } else if (openWindow) {
      openWindow.midIndex = crossing.index;
    }
    previousCrossingIndex = crossing.index;
  }

  function windowPeriodSamples(window: FiringWindow): number {
    if (rectifier === 'half-wave') return window.endIndex - window.startIndex;
    return Number.isFinite(window.priorIndex) ? window.endIndex - window.priorIndex : 2 * (window.endIndex - window.startIndex);
  }

  /** Samples from the window's start as an angle of the mains period, referred back to the mains crossing. */
  function degreesOf(samples: number, periodSamples: number): number {
    return (samples / periodSamples) * 360 + syncPhaseDeg;
  }

  function analyzeWindow(window: FiringWindow): CycleReading {
    const periodSamples = windowPeriodSamples(window);
    const marginSamples = Math.max(2, Math.ceil(0.05 * periodSamples));
    // The ramp charges in the half-cycle that fires: the whole window full-wave, up to the falling crossing half-wave.
    const chargeEndIndex = rectifier === 'half-wave' && Number.isFinite(window.midIndex) ? window.midIndex : window.endIndex;
    const cut = history.window(window.startIndex - marginSamples, chargeEndIndex + marginSamples + 1);
    const minimumSpanV = Math.max(0.05, 0.2 * (levels?.rampSpreadV ?? 0));
    const segment = analyzeRampSegment(cut.values, {
      windowStartIndex: window.startIndex - cut.firstIndex,
      windowEndIndex: chargeEndIndex - cut.firstIndex,
      chargeEndCrossingIndex: chargeEndIndex - cut.firstIndex,
      minimumSpanV,
    });
    let resetUs: number | null = null;
    if (segment) {
      const startIndex = segment.startIndex + cut.firstIndex;
      if (Number.isFinite(lastChargeEndIndex)) resetUs = ((startIndex - lastChargeEndIndex) / sampleRateHz) * 1e6;
      lastChargeEndIndex = segment.endIndex + cut.firstIndex;
    }
    // Pulses: those rising inside the window; the right half-cycle is the whole window (full-wave) or its first half.
    let firstPulse: GatePulse | null = null;
    let rightHalf = 0;
    let wrongHalf = 0;
    const remaining: GatePulse[] = [];
    for (const pulse of pulses) {
      if (pulse.riseIndex >= window.endIndex) {
        remaining.push(pulse);
        continue;
      }
      if (pulse.riseIndex < window.startIndex) continue;
      const inRightHalf = rectifier === 'full-wave' || !Number.isFinite(window.midIndex) || pulse.riseIndex < window.midIndex;
      if (!inRightHalf) {
        wrongHalf += 1;
      } else {
        rightHalf += 1;
        if (!firstPulse) firstPulse = pulse;
      }
      if (pulse.fallIndex !== null) summary.addPulseShape(widthUs(pulse.riseIndex, pulse.fallIndex), pulse.amplitudeV);
      else assigned.add(pulse);
    }
    pulses = remaining;
    history.discardBefore(window.endIndex - marginSamples - 1);
    const timed =
      timedEdges.size > 0
        ? timedFiring(timedEdges, {
            rectifier, direction: window.direction, startS: timeOf(window.startIndex), endS: timeOf(window.endIndex),
            priorS: Number.isFinite(window.priorIndex) ? timeOf(window.priorIndex) : Number.NaN,
            riseS: firstPulse ? timeOf(firstPulse.riseIndex) : null, syncPhaseDeg, toleranceS: edgeToleranceS(),
          })
        : null;
    if (timed?.alphaDeg != null) timedIntervals += 1;
    const reading: CycleReading = {
      t: timeOf(window.startIndex),
      halfCycle: window.direction === 'rising' ? 'positive' : 'negative',
      periodS: timed ? timed.periodS : periodSamples / sampleRateHz,
      alphaDeg: timed?.alphaDeg ?? (firstPulse ? degreesOf(firstPulse.riseIndex - window.startIndex, periodSamples) : null),
      controlV: firstPulse ? firstPulse.controlV : null,
      pulses: rightHalf,
      wrongHalfCyclePulses: wrongHalf,
      rampPeakV: segment ? segment.peakV : null,
      rampFloorV: segment ? segment.floorV : null,
      slopeVPerMs: segment ? (segment.slopeVPerSample * sampleRateHz) / 1000 : null,
      startDelayDeg: segment ? degreesOf(segment.startIndex + cut.firstIndex - window.startIndex, periodSamples) : null,
      nonlinearityPct: segment ? segment.nonlinearityPct : null,
      clipped: segment ? segment.clipped : null,
      resetUs,
    };
    summary.addInterval(reading);
    return reading;
  }

  function processBlock(block: SampleBlock): CycleReading[] {
    const length = block.sync.length;
    if (length === 0) return [];
    const readings: CycleReading[] = [];
    const expectedStartS = segmentStartS + nextIndex / sampleRateHz;
    // A reader that derives the rate from a file's time column may differ in the last digits from block to block:
    // a part per million is the same rate; the start time must follow on within half a sample.
    const sameRate = Math.abs(block.sampleRateHz - sampleRateHz) <= 1e-6 * sampleRateHz;
    const contiguous = segments > 0 && !block.afterGap && sameRate && Math.abs(block.startS - expectedStartS) <= 0.5 / sampleRateHz;
    if (!contiguous) {
      readings.push(...flushSegment());
      startSegment(block);
    }
    if (!Number.isFinite(firstStartS)) firstStartS = block.startS;
    if (block.edges) timedEdges.add(block.edges);
    const firstIndex = nextIndex;
    history.append(block.ramp);
    if (!crossingTracker) lookForLateSync(block.sync, firstIndex);
    else for (const crossing of crossingTracker.push(block.sync, firstIndex)) onCrossing(crossing);
    if (pulseTracker) {
      const found = pulseTracker.push(block.gate, block.control, firstIndex);
      pulses.push(...found.started);
      for (const pulse of found.completed) {
        if (assigned.has(pulse) && pulse.fallIndex !== null) summary.addPulseShape(widthUs(pulse.riseIndex, pulse.fallIndex), pulse.amplitudeV);
      }
    }
    nextIndex += length;
    lastEndS = timeOf(nextIndex);
    const lastIndex = nextIndex - 1;
    while (pending.length > 0) {
      const window = pending[0];
      if (window.endIndex + Math.max(2, Math.ceil(0.05 * windowPeriodSamples(window))) > lastIndex) break;
      readings.push(analyzeWindow(pending.shift() as FiringWindow));
    }
    // Bound memory when no cycle is being tracked (dead sync): keep about two slow mains cycles.
    const holdSamples = Math.ceil((2 / 45) * sampleRateHz);
    const oldestNeeded = pending.length > 0 ? pending[0].startIndex : openWindow ? openWindow.startIndex : lastIndex;
    const keepFrom = Math.min(oldestNeeded, lastIndex) - Math.ceil(0.1 * holdSamples);
    history.discardBefore(Math.max(keepFrom, lastIndex - 2 * holdSamples));
    if (!openWindow && pending.length === 0) pulses = pulses.filter((pulse) => pulse.riseIndex > lastIndex - holdSamples);
    return readings;
  }

  /** Fills the window; when full, learns sync levels from it and, when they hold, tracks from the next sample on. */
  function lookForLateSync(sync: Float64Array, firstIndex: number): void {
    const windowSamples = Math.max(1, Math.round(warmupS * sampleRateHz));
    if (lateSync === null || lateSync.length !== windowSamples) {
      lateSync = new Float64Array(windowSamples);
      lateSyncFill = 0;
    }
    let offset = 0;
    while (offset < sync.length && !crossingTracker) {
      const take = Math.min(sync.length - offset, windowSamples - lateSyncFill);
      lateSync.set(sync.subarray(offset, offset + take), lateSyncFill);
      lateSyncFill += take;
      offset += take;
      if (lateSyncFill < windowSamples) break;
      const found = estimateSyncLevels(lateSync);
      lateSyncFill = 0;
      if (found && found.amplitudeV >= minimumSyncAmplitudeV) {
        crossingTracker = new ZeroCrossingTracker(found);
        for (const crossing of crossingTracker.push(sync.subarray(offset), firstIndex + offset)) onCrossing(crossing);
      }
    }
  }

  function endWarmup(): CycleReading[] {
    const blocks = warmupBlocks ?? [];
    warmupBlocks = null;
    const maxSamples = blocks.length > 0 ? Math.round(warmupS * blocks[0].sampleRateHz) : 0;
    levels = learnFirstLevels(blocks, { minimumSyncAmplitudeV, maxSamples });
    crossingTracker = levels.sync ? new ZeroCrossingTracker(levels.sync) : null;
    pulseTracker = new GatePulseTracker(levels.gate);
    const readings: CycleReading[] = [];
    for (const block of blocks) readings.push(...processBlock(block));
    return readings;
  }

  return {
    push(block: SampleBlock): CycleReading[] {
      const { runs, invalid } = splitValidRuns(block);
      invalidSamples += invalid;
      const readings: CycleReading[] = [];
      for (const run of runs) {
        if (warmupBlocks) {
          warmupBlocks.push(run);
          warmupSeconds += run.sync.length / run.sampleRateHz;
          if (warmupSeconds >= warmupS) readings.push(...endWarmup());
        } else {
          readings.push(...processBlock(run));
        }
      }
      return readings;
    },
    finish(): CaptureReadings {
      if (warmupBlocks) endWarmup();
      flushSegment();
      const gateLevels = pulseTracker?.gateLevels ?? null;
      const syncLevels = crossingTracker?.levels ?? null;
      const readings = summary.build({
        rectifier,
        syncPhaseDeg,
        sampleRateHz: Number.isFinite(sampleRateHz) ? sampleRateHz : null,
        durationS: Number.isFinite(firstStartS) ? lastEndS - firstStartS : 0,
        gaps: Math.max(0, segments - 1),
        mains: frequency.reading(),
        syncOffsetV: syncLevels ? syncLevels.offsetV : null,
        syncAmplitudeV: syncLevels ? syncLevels.amplitudeV : null,
        gateLowV: gateLevels ? gateLevels.lowV : null,
        gateHighV: gateLevels ? gateLevels.highV : null,
        invalidSamples,
      });
      if (timedIntervals > 0) readings.timedIntervals = timedIntervals;
      return readings;
    },
  };
}
