/**
 * Samples as every reader, the logger decoder and the virtual board deliver them:
 * uniform-rate blocks holding the board's test points by role, in volts.
 */
export type SignalRole = 'sync' | 'ramp' | 'gate' | 'control';

export const signalRoles: readonly SignalRole[] = ['sync', 'ramp', 'gate', 'control'];

/** The inputs a logger may time with its own timer hardware (PROTOCOL.md "Timed edges"). */
export type EdgeRole = 'sync' | 'gate';

/** A sync zero crossing or a gate pulse edge, timed by the logger to a microsecond or better. */
export interface TimedEdge {
  role: EdgeRole;
  direction: 'rising' | 'falling';
  /** Seconds on the same time axis as the blocks' samples. */
  timeS: number;
}

export interface SampleBlock {
  /** Time of the block's first sample, seconds from the start of the capture. */
  startS: number;
  sampleRateHz: number;
  sync: Float64Array;
  ramp: Float64Array;
  gate: Float64Array;
  /** Control voltage test point, when the logger has it wired. */
  control: Float64Array | null;
  /**
   * True when samples were lost just before this block (a dropped logger block, a gap in a file).
   * Analysis never joins two stretches across a gap: it restarts its cycle tracking.
   */
  afterGap: boolean;
  /**
   * Timed edges the logger sent with (just before) this block, in time order: those up to the block's end, and
   * perhaps a few just after it. Absent when the source has no timed edges.
   */
  edges?: readonly TimedEdge[];
}

export function sampleBlockLength(block: SampleBlock): number {
  return block.sync.length;
}
