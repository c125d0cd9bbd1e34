/**
 * Samples as every reader, the logger decoder and the virtual board deliver them:
 * uniform-rate blocks holding the board's test points by role, in volts.
 */
export type SignalRole = 'sync' | 'ramp' | 'gate' | 'control';

export const signalRoles: readonly SignalRole[] = ['sync', 'ramp', 'gate', 'control'];

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
}

export function sampleBlockLength(block: SampleBlock): number {
  return block.sync.length;
}
