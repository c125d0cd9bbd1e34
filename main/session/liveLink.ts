/**
 * One open link: its source (virtual board or serial logger), the pipeline that measures what arrives, and the
 * link health the screens show. Lines from the source go through `receive`, which hands the measured results to
 * the session service; nothing here knows about transports or the logbook.
 */
import type { BoardDesign } from '../../app/board/design';
import type { LinkHealth, LinkSource, LinkState } from '../../app/contract';
import type { LinkEventKind } from '../store/logbookTypes';
import type { SampleBlock } from '../../app/capture/samples';
import { createBenchPipeline, type BenchPipeline, type BenchPipelineOptions, type PipelineStep } from './benchPipeline';

/** Where a source delivers: lines (or, from a capture file, blocks), link events (opened, unplugged, reopened...) and its end. */
export interface LineSink {
  lines(lines: string[]): void;
  /** Sample blocks straight from a capture file (no logger protocol in between). */
  blocks?(blocks: SampleBlock[]): void;
  /** A lost link (a fault). */
  ended(reason: string): void;
  /** A source that has an end reached it (a capture file read to its last sample). */
  finished?(detail: string): void;
  event?(kind: LinkEventKind, detail: string, state: LinkState | null): void;
}

/** What a source of logger lines offers, whichever kind it is. */
export interface LineSource {
  readonly description: LinkSource;
  start(sink: LineSink): void;
  stop(): void | Promise<void>;
}

export interface LiveLink {
  readonly source: LineSource;
  readonly pipeline: BenchPipeline;
  health(): LinkHealth;
  setState(state: LinkState, message?: string | null): void;
  /** Measures lines; returns what they produced. */
  receive(lines: readonly string[]): PipelineStep;
  /** Measures blocks from a capture file; returns what they produced. */
  receiveBlocks(blocks: readonly SampleBlock[]): PipelineStep;
}

export function createLiveLink(source: LineSource, design: BoardDesign, options: { pipeline?: BenchPipelineOptions; now?: () => number } = {}): LiveLink {
  const now = options.now ?? Date.now;
  const pipeline = createBenchPipeline(design, options.pipeline);
  let state: LinkState = 'connecting';
  let message: string | null = null;
  let lastDataMs: number | null = null;
  /** Samples per channel arrived in the current and the previous one-second bucket (wall clock). */
  let bucketStartMs = now();
  let bucketSamples = 0;
  let previousRate = 0;
  /** The rate of the newest block and the blocks taken, for a source without a greeting (a capture file). */
  let blockRateHz = 0;
  let fileBlocks = 0;

  const link: LiveLink = {
    source,
    pipeline,
    health() {
      const decoder = pipeline.decoderHealth();
      const nowMs = now();
      if (nowMs - bucketStartMs >= 2000) previousRate = 0;
      return {
        state,
        source: source.description,
        sampleRateHz: pipeline.greeting()?.sampleRateHz ?? blockRateHz,
        arrivingSamplesPerS: previousRate,
        blocks: decoder.blocks + fileBlocks,
        droppedBlocks: decoder.blocksLost + decoder.loggerOverruns,
        droppedSamples: decoder.samplesLost,
        crcErrors: decoder.crcFailures,
        badLines: decoder.garbageLines + decoder.oversizeLines + decoder.badDataLines + decoder.badGreetings + decoder.unknownVersions + decoder.dataBeforeGreeting + decoder.badEdgeLines,
        lastDataAgoMs: lastDataMs === null ? null : Math.max(0, nowMs - lastDataMs),
        message: message ?? decoder.lastProblem?.message ?? null,
      };
    },
    setState(next, nextMessage = null) {
      state = next;
      message = nextMessage;
    },
    receive(lines) {
      return arrived(pipeline.pushLines(lines));
    },
    receiveBlocks(blocks) {
      fileBlocks += blocks.length;
      return arrived(pipeline.pushBlocks(blocks));
    },
  };
  return link;

  function arrived(step: PipelineStep): PipelineStep {
    const nowMs = now();
    if (step.blocks.length > 0) {
      lastDataMs = nowMs;
      if (state === 'connecting' || state === 'stalled') state = 'streaming';
    }
    for (const block of step.blocks) {
      bucketSamples += block.sync.length;
      blockRateHz = block.sampleRateHz;
    }
    if (nowMs - bucketStartMs >= 1000) {
      previousRate = (bucketSamples * 1000) / (nowMs - bucketStartMs);
      bucketStartMs = nowMs;
      bucketSamples = 0;
    }
    return step;
  }
}

export function disconnectedHealth(): LinkHealth {
  return { state: 'disconnected', source: null, sampleRateHz: 0, arrivingSamplesPerS: 0, blocks: 0, droppedBlocks: 0, droppedSamples: 0, crcErrors: 0, badLines: 0, lastDataAgoMs: null, message: null };
}
