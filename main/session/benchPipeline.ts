/**
 * Logger lines to everything the bench shows, in one synchronous, transport-free object:
 * lines -> decoder (app/logger) -> blocks -> session analyzer (app/bench, per-cycle readings for the logbook)
 *                                        -> window analyzer (restarted every `windowS`, readings for the steps)
 *                                        -> sample ring -> folded recent cycles (min-max decimated)
 * plus the transfer points and the alpha extremes since the last restart (a trim, a cleared curve).
 * Memory is bounded: the ring holds seconds, the analyzers keep constant-size statistics.
 */
import { controlRangeOf, controlWithinRange, type ControlRange, type SweepExtent } from '../../app/board/controlRange';
import type { BoardDesign } from '../../app/board/design';
import { createCaptureAnalyzer, type CaptureAnalyzer } from '../../app/bench/captureAnalyzer';
import type { CaptureReadings, CycleReading } from '../../app/bench/readings';
import type { SampleBlock } from '../../app/capture/samples';
import type { FoldCycle, TransferPoint } from '../../app/contract';
import { createLoggerDecoder, type LinkHealth as DecoderHealth, type LinkProblem, type LoggerDecoder, type LoggerGreeting } from '../../app/logger';
import { TransferCurveAccumulator, type TransferFitReading } from '../../app/signal/transferCurve';
import { createFoldKeeper, foldCycleFromRing } from './fold';
import { createSampleRing, type SampleRing } from './sampleRing';

export interface BenchPipelineOptions {
  /** Seconds of signal per step-readings window (default 1: 50 cycles at 50 Hz after a 0.2 s warm-up). */
  windowS?: number;
  /** Cycles in the fold (default 20). */
  foldCycles?: number;
  /** Min-max buckets per folded cycle (default 240: 1.5 degrees each, about one per pixel pair of a plot). */
  foldBuckets?: number;
  /** Raw samples kept for the fold and "keep capture" (s, default 10). */
  ringS?: number;
  /** Most transfer points kept for drawing (older ones are thinned; the fit keeps them all). Default 4000. */
  maxTransferPoints?: number;
}

export interface PipelineStep {
  blocks: SampleBlock[];
  cycles: CycleReading[];
  problems: LinkProblem[];
  /** Readings of a window that closed during this push (newest only). */
  window: CaptureReadings | null;
  greeting: LoggerGreeting | null;
}

/**
 * What the control sweep has covered since the last restart: the control voltage's extremes over every cycle, and
 * alpha's extremes over the cycles fired inside the control range the design allows (app/board/controlRange.ts;
 * every cycle when there is no control channel). Cycles fired below that range are counted, not judged.
 */
export interface AlphaExtremes extends SweepExtent {
  cycles: number;
  cyclesBelowRange: number;
}

export const noExtremes: AlphaExtremes = { alphaMinDeg: null, alphaMaxDeg: null, controlMinV: null, controlMaxV: null, cycles: 0, cyclesBelowRange: 0 };

export interface BenchPipeline {
  pushLines(lines: readonly string[]): PipelineStep;
  /** Blocks from a capture file, measured as the decoder's would be. */
  pushBlocks(blocks: readonly SampleBlock[]): PipelineStep;
  fold(): FoldCycle[];
  /** Readings of the last complete window, null before the first. */
  lastWindow(): CaptureReadings | null;
  decoderHealth(): DecoderHealth;
  greeting(): LoggerGreeting | null;
  transferPoints(): TransferPoint[];
  transferFit(): TransferFitReading | null;
  alphaExtremes(): AlphaExtremes;
  /** Newest raw samples, for keeping a capture. */
  lastSeconds(seconds: number): SampleBlock[];
  /** Forget step readings, transfer points and extremes (after a trim is fitted, or to start a curve again). */
  restartReadings(options?: { keepTransfer?: boolean }): void;
  /** Stream time of the newest sample (s). */
  newestS(): number;
  /** Measure against another design from now on (a session opened for it): analysis restarts, the link stays. */
  retarget(design: BoardDesign): void;
}

interface PendingFold {
  index: number;
  startS: number;
  endS: number;
  firingS: number[];
  zeroCrossingsS: number[];
}

export function createBenchPipeline(initialDesign: BoardDesign, options: BenchPipelineOptions = {}): BenchPipeline {
  const windowS = options.windowS ?? 1;
  const foldBuckets = options.foldBuckets ?? 240;
  const maxTransferPoints = options.maxTransferPoints ?? 4000;
  let design = initialDesign;
  let analyzerOptions = { rectifier: design.rectifier, syncPhaseDeg: design.syncPhaseDeg, keepPerCycle: false };
  const decoder: LoggerDecoder = createLoggerDecoder();
  let sessionAnalyzer: CaptureAnalyzer = createCaptureAnalyzer(analyzerOptions);
  const ring: SampleRing = createSampleRing({ keepS: options.ringS ?? 10 });
  const folds = createFoldKeeper(options.foldCycles ?? 20);
  let windowAnalyzer: CaptureAnalyzer = createCaptureAnalyzer(analyzerOptions);
  let windowStartS: number | null = null;
  let lastWindow: CaptureReadings | null = null;
  let transfer = new TransferCurveAccumulator();
  let points: TransferPoint[] = [];
  let extremes: AlphaExtremes = noExtremes;
  let controlRange: ControlRange = controlRangeOf(design);
  let pendingFolds: PendingFold[] = [];
  let cycleIndex = 0;
  let newestS = 0;

  function foldOnArrival(cycle: CycleReading): void {
    const firingS = cycle.alphaDeg === null ? [] : [cycle.t + ((cycle.alphaDeg - design.syncPhaseDeg) / 360) * cycle.periodS];
    // A fold cycle runs from a rising sync crossing to the next; full-wave negative half-cycles add their firing to it.
    if (cycle.halfCycle === 'negative') {
      const owner = pendingFolds.find((pending) => cycle.t >= pending.startS - 1e-9 && cycle.t < pending.endS);
      if (owner) owner.firingS.push(...firingS);
      return;
    }
    const endS = cycle.t + cycle.periodS;
    pendingFolds.push({ index: cycleIndex++, startS: cycle.t, endS, firingS, zeroCrossingsS: [cycle.t, cycle.t + cycle.periodS / 2, endS] });
  }

  function foldWhatIsComplete(): void {
    const still: PendingFold[] = [];
    for (const pending of pendingFolds) {
      // Wait for the negative half's reading too (it arrives once the next crossing is seen).
      if (newestS < pending.endS + pending.endS - pending.startS) {
        still.push(pending);
        continue;
      }
      const folded = foldCycleFromRing(ring, pending, foldBuckets);
      if (folded) folds.add(folded);
    }
    pendingFolds = still.slice(-8);
  }

  function addToExtremes(alphaDeg: number, controlV: number | null): void {
    const lower = (was: number | null, value: number) => (was === null ? value : Math.min(was, value));
    const higher = (was: number | null, value: number) => (was === null ? value : Math.max(was, value));
    const counted = controlV === null || controlWithinRange(controlRange, controlV);
    extremes = {
      alphaMinDeg: counted ? lower(extremes.alphaMinDeg, alphaDeg) : extremes.alphaMinDeg,
      alphaMaxDeg: counted ? higher(extremes.alphaMaxDeg, alphaDeg) : extremes.alphaMaxDeg,
      controlMinV: controlV === null ? extremes.controlMinV : lower(extremes.controlMinV, controlV),
      controlMaxV: controlV === null ? extremes.controlMaxV : higher(extremes.controlMaxV, controlV),
      cycles: extremes.cycles + 1,
      cyclesBelowRange: extremes.cyclesBelowRange + (counted ? 0 : 1),
    };
  }

  function addTransferPoint(cycle: CycleReading): void {
    if (cycle.alphaDeg === null) return;
    addToExtremes(cycle.alphaDeg, cycle.controlV);
    if (cycle.controlV === null) return;
    transfer.add(cycle.controlV, cycle.alphaDeg);
    points.push({ t: cycle.t, controlV: cycle.controlV, alphaDeg: cycle.alphaDeg });
    // Thin the drawn points by keeping every second one when the list is full; the fit above keeps every point.
    if (points.length > maxTransferPoints) points = points.filter((_, index) => index % 2 === 0);
  }

  function pushBlock(block: SampleBlock, step: PipelineStep): void {
    ring.push(block);
    newestS = block.startS + block.sync.length / block.sampleRateHz;
    for (const cycle of sessionAnalyzer.push(block)) {
      step.cycles.push(cycle);
      foldOnArrival(cycle);
      addTransferPoint(cycle);
    }
    if (block.afterGap) pendingFolds = [];
    windowStartS ??= block.startS;
    windowAnalyzer.push(block);
    if (newestS - windowStartS >= windowS) {
      lastWindow = windowAnalyzer.finish();
      step.window = lastWindow;
      windowAnalyzer = createCaptureAnalyzer(analyzerOptions);
      windowStartS = null;
    }
    foldWhatIsComplete();
  }

  function restartReadings(restart: { keepTransfer?: boolean } = {}): void {
    windowAnalyzer = createCaptureAnalyzer(analyzerOptions);
    windowStartS = null;
    lastWindow = null;
    extremes = noExtremes;
    if (!restart.keepTransfer) {
      transfer = new TransferCurveAccumulator();
      points = [];
    }
    folds.clear();
    pendingFolds = [];
  }

  return {
    pushLines(lines) {
      const step: PipelineStep = { blocks: [], cycles: [], problems: [], window: null, greeting: null };
      for (const line of lines) {
        for (const event of decoder.pushLine(line)) {
          if (event.kind === 'block') {
            step.blocks.push(event.block);
            pushBlock(event.block, step);
          } else if (event.kind === 'problem') {
            step.problems.push(event.problem);
          } else if (event.kind === 'greeting') {
            step.greeting = event.greeting;
          }
        }
      }
      return step;
    },
    pushBlocks(blocks) {
      const step: PipelineStep = { blocks: [], cycles: [], problems: [], window: null, greeting: null };
      for (const block of blocks) {
        step.blocks.push(block);
        pushBlock(block, step);
      }
      return step;
    },
    fold: () => folds.cycles(),
    lastWindow: () => lastWindow,
    decoderHealth: () => decoder.health(),
    greeting: () => decoder.greeting(),
    transferPoints: () => [...points],
    transferFit: () => transfer.reading({ minimumRangeV: 0.2 }),
    alphaExtremes: () => ({ ...extremes }),
    lastSeconds: (seconds) => ring.lastSeconds(seconds),
    restartReadings,
    newestS: () => newestS,
    retarget(next) {
      design = next;
      controlRange = controlRangeOf(design);
      analyzerOptions = { rectifier: design.rectifier, syncPhaseDeg: design.syncPhaseDeg, keepPerCycle: false };
      sessionAnalyzer = createCaptureAnalyzer(analyzerOptions);
      restartReadings();
    },
  };
}
