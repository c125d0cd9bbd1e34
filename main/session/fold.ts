/**
 * The cycle fold as the service sends it: each recent cycle's samples mapped onto electrical degrees 0-360 of
 * that cycle (its own period, so a drifting mains does not smear the fold) and min-max decimated into a fixed
 * number of buckets per cycle. Each bucket keeps its lowest and highest sample in time order, so gate pulses and
 * ramp peaks narrower than a bucket survive (common practice for drawing long records on a raster display).
 */
import type { FoldCycle, FoldTrace } from '../../app/contract';
import type { SampleBlock, SignalRole } from '../../app/capture/samples';
import type { SampleRing } from './sampleRing';

/** Degree-indexed min-max decimation of one signal over [startS, endS). */
export function foldTraceMinMax(blocks: readonly SampleBlock[], role: SignalRole, startS: number, endS: number, buckets: number): FoldTrace | null {
  const periodS = endS - startS;
  if (!(periodS > 0) || buckets < 1) return null;
  const minV = new Float64Array(buckets).fill(Number.POSITIVE_INFINITY);
  const maxV = new Float64Array(buckets).fill(Number.NEGATIVE_INFINITY);
  const minDeg = new Float64Array(buckets);
  const maxDeg = new Float64Array(buckets);
  let any = false;
  for (const block of blocks) {
    const values = block[role];
    if (!values) return null;
    const stepS = 1 / block.sampleRateHz;
    // Sample positions are exact multiples of the step; the tolerance keeps rounding from taking a sample twice.
    const first = Math.max(0, Math.ceil((startS - block.startS) / stepS - 1e-6));
    const last = Math.min(values.length, Math.ceil((endS - block.startS) / stepS - 1e-6));
    for (let index = first; index < last; index++) {
      const deg = (360 * (block.startS + index * stepS - startS)) / periodS;
      const bucket = Math.min(buckets - 1, Math.max(0, Math.floor((deg / 360) * buckets)));
      const value = values[index];
      if (!Number.isFinite(value)) continue;
      any = true;
      if (value < minV[bucket]) {
        minV[bucket] = value;
        minDeg[bucket] = deg;
      }
      if (value > maxV[bucket]) {
        maxV[bucket] = value;
        maxDeg[bucket] = deg;
      }
    }
  }
  if (!any) return null;
  const deg: number[] = [];
  const v: number[] = [];
  for (let bucket = 0; bucket < buckets; bucket++) {
    if (minV[bucket] === Number.POSITIVE_INFINITY) continue;
    const minFirst = minDeg[bucket] <= maxDeg[bucket];
    const pairs: Array<[number, number]> = minFirst
      ? [[minDeg[bucket], minV[bucket]], [maxDeg[bucket], maxV[bucket]]]
      : [[maxDeg[bucket], maxV[bucket]], [minDeg[bucket], minV[bucket]]];
    for (const [pointDeg, pointV] of pairs) {
      if (deg.length > 0 && deg[deg.length - 1] === pointDeg && v[v.length - 1] === pointV) continue;
      deg.push(pointDeg);
      v.push(pointV);
    }
  }
  return { deg, v };
}

export interface FoldCycleInput {
  index: number;
  startS: number;
  endS: number;
  /** Zero crossing and firing instants inside the cycle (s). */
  zeroCrossingsS: readonly number[];
  firingS: readonly number[];
}

export function foldCycleFromRing(ring: SampleRing, cycle: FoldCycleInput, buckets: number): FoldCycle | null {
  const blocks = ring.blocksBetween(cycle.startS, cycle.endS);
  if (blocks.length === 0) return null;
  const sync = foldTraceMinMax(blocks, 'sync', cycle.startS, cycle.endS, buckets);
  const ramp = foldTraceMinMax(blocks, 'ramp', cycle.startS, cycle.endS, buckets);
  const gate = foldTraceMinMax(blocks, 'gate', cycle.startS, cycle.endS, buckets);
  if (!sync || !ramp || !gate) return null;
  const control = blocks.every((block) => block.control !== null) ? foldTraceMinMax(blocks, 'control', cycle.startS, cycle.endS, buckets) : null;
  const periodS = cycle.endS - cycle.startS;
  const toDeg = (timeS: number) => (360 * (timeS - cycle.startS)) / periodS;
  return {
    index: cycle.index,
    startS: cycle.startS,
    periodMs: periodS * 1000,
    sync,
    ramp,
    gate,
    control,
    zeroCrossingsDeg: cycle.zeroCrossingsS.map(toDeg).filter((deg) => deg >= -1e-9 && deg <= 360 + 1e-9),
    firingDeg: cycle.firingS.map(toDeg).filter((deg) => deg >= 0 && deg <= 360),
  };
}

/** The last `keep` folded cycles. */
export function createFoldKeeper(keep: number): { add(cycle: FoldCycle): void; cycles(): FoldCycle[]; clear(): void } {
  let kept: FoldCycle[] = [];
  return {
    add(cycle) {
      kept.push(cycle);
      if (kept.length > keep) kept = kept.slice(kept.length - keep);
    },
    cycles: () => [...kept],
    clear() {
      kept = [];
    },
  };
}
