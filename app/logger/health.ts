/**
 * What the decoder tells a technician about the link: counters that only grow, and the last problem in words.
 */
export type LinkProblemCode =
  | 'crc'
  | 'garbage'
  | 'oversize'
  | 'unknown-version'
  | 'bad-greeting'
  | 'bad-data'
  | 'data-before-greeting'
  | 'sequence-gap'
  | 'sequence-restart'
  | 'duplicate'
  | 'logger-overrun'
  | 'logger-refused'
  | 'bad-edges'
  | 'logger-edges-lost';

export interface LinkProblem {
  code: LinkProblemCode;
  /** One sentence a technician understands: what happened and what it means for the readings. */
  message: string;
  /** 1-based count of lines the decoder has been given, so a recorded link log can be matched up. */
  lineNumber: number;
}

export interface LinkHealth {
  lines: number;
  blocks: number;
  /** Samples per channel delivered in blocks. */
  samples: number;
  crcFailures: number;
  garbageLines: number;
  oversizeLines: number;
  unknownVersions: number;
  badGreetings: number;
  badDataLines: number;
  dataBeforeGreeting: number;
  /** Places where one or more data lines never arrived (sequence jumped forward). */
  sequenceGaps: number;
  blocksLost: number;
  /** Samples per channel lost in sequence gaps (not counting lines discarded for a bad CRC before a gap is seen: those show up here too, once the next good line arrives). */
  samplesLost: number;
  sequenceRestarts: number;
  duplicateBlocks: number;
  /** Blocks the logger itself reports discarding (status lines). */
  loggerOverruns: number;
  loggerRefusals: number;
  /** Timed edges received in edge lines (PROTOCOL.md "Timed edges"). */
  edges: number;
  /** Edge lines that could not be read, or came from a logger whose greeting announced no timed edges. */
  badEdgeLines: number;
  /** Timed edges the logger reports dropping (status lines, `edgeslost=`). */
  loggerEdgesLost: number;
  lastProblem: LinkProblem | null;
}

export function emptyLinkHealth(): LinkHealth {
  return {
    lines: 0,
    blocks: 0,
    samples: 0,
    crcFailures: 0,
    garbageLines: 0,
    oversizeLines: 0,
    unknownVersions: 0,
    badGreetings: 0,
    badDataLines: 0,
    dataBeforeGreeting: 0,
    sequenceGaps: 0,
    blocksLost: 0,
    samplesLost: 0,
    sequenceRestarts: 0,
    duplicateBlocks: 0,
    loggerOverruns: 0,
    loggerRefusals: 0,
    edges: 0,
    badEdgeLines: 0,
    loggerEdgesLost: 0,
    lastProblem: null,
  };
}

/** Total of the counters that mean something went wrong on the link (for a one-number summary such as `linkErrors`). */
export function linkErrorCount(health: LinkHealth): number {
  return (
    health.crcFailures +
    health.garbageLines +
    health.oversizeLines +
    health.unknownVersions +
    health.badGreetings +
    health.badDataLines +
    health.sequenceGaps +
    health.sequenceRestarts +
    health.duplicateBlocks +
    health.loggerOverruns +
    health.badEdgeLines +
    health.loggerEdgesLost
  );
}
