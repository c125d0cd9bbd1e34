/**
 * The record's cycle fold from a stored capture: the last few whole mains cycles (rising sync crossing to rising
 * sync crossing, app/signal/zeroCrossings.ts), each folded onto 0-360 electrical degrees by the session service's
 * min-max fold (main/session/fold.ts), with its zero crossings and the gate pulses' 50 % rising crossings
 * (app/signal/gatePulses.ts, IEEE 181) marked. Degrees here are from the sync crossing, as the Bench screen draws them.
 */
import type { SampleBlock } from '../../app/capture/samples';
import type { FoldCycle } from '../../app/contract';
import { GatePulseTracker } from '../../app/signal/gatePulses';
import { estimateSyncLevels, ZeroCrossingTracker } from '../../app/signal/zeroCrossings';
import { foldTraceMinMax } from '../session/fold';

export function foldCapture(block: SampleBlock, options: { cycles?: number; buckets?: number } = {}): FoldCycle[] {
  const keep = options.cycles ?? 8;
  const buckets = options.buckets ?? 360;
  const levels = estimateSyncLevels(block.sync);
  if (!levels) return [];
  const crossings = new ZeroCrossingTracker(levels).push(block.sync, 0);
  let gateLowV = Number.POSITIVE_INFINITY;
  let gateHighV = Number.NEGATIVE_INFINITY;
  for (const value of block.gate) {
    if (value < gateLowV) gateLowV = value;
    if (value > gateHighV) gateHighV = value;
  }
  const pulses = new GatePulseTracker({ lowV: gateLowV, highV: gateHighV }).push(block.gate, null, 0).started;
  const timeOf = (index: number) => block.startS + index / block.sampleRateHz;
  const rising = crossings.filter((crossing) => crossing.direction === 'rising');
  const cycles: FoldCycle[] = [];
  for (let index = Math.max(0, rising.length - 1 - keep); index < rising.length - 1; index++) {
    const startS = timeOf(rising[index].index);
    const endS = timeOf(rising[index + 1].index);
    const sync = foldTraceMinMax([block], 'sync', startS, endS, buckets);
    const ramp = foldTraceMinMax([block], 'ramp', startS, endS, buckets);
    const gate = foldTraceMinMax([block], 'gate', startS, endS, buckets);
    if (!sync || !ramp || !gate) continue;
    const control = block.control ? foldTraceMinMax([block], 'control', startS, endS, buckets) : null;
    const toDeg = (timeS: number) => (360 * (timeS - startS)) / (endS - startS);
    cycles.push({
      index,
      startS,
      periodMs: (endS - startS) * 1000,
      sync, ramp, gate, control,
      zeroCrossingsDeg: crossings.map((crossing) => toDeg(timeOf(crossing.index))).filter((deg) => deg >= -1e-9 && deg <= 360 + 1e-9),
      firingDeg: pulses.map((pulse) => toDeg(timeOf(pulse.riseIndex))).filter((deg) => deg >= 0 && deg < 360),
    });
  }
  return cycles;
}
