/**
 * Boards of our own (invented names) and small hand-written measurements for checking the virtual board from the
 * outside: sync zero crossings by linear interpolation, gate edges at the 50 % level (IEEE 181 mesial crossing,
 * REFERENCES.md), per-half-cycle ramp peaks.
 */
import { boardDesignSchema, type BoardDesign } from '../../../app/board/design';
import type { SampleBlock } from '../../../app/capture/samples';

export function halfWaveBoard(overrides: Record<string, unknown> = {}): BoardDesign {
  return boardDesignSchema.parse({
    name: 'Tern HW-50 test charger board',
    mainsHz: 50,
    rectifier: 'half-wave',
    supplyV: 15,
    rampTargetV: 5.5,
    alphaMaxDeg: 165,
    parts: { rEmitter: { ohm: 7500 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 } },
    ...overrides,
  });
}

export function fullWaveBoard(overrides: Record<string, unknown> = {}): BoardDesign {
  return boardDesignSchema.parse({
    name: 'Heron FW-60 test heater board',
    mainsHz: 60,
    rectifier: 'full-wave',
    supplyV: 12,
    rampTargetV: 6,
    alphaMaxDeg: 160,
    syncPhaseDeg: 8,
    gatePulseUs: 300,
    parts: { rEmitter: { ohm: 6200 }, rBiasTop: { ohm: 15000 }, rBiasBottom: { ohm: 68000 }, cRamp: { farad: 2.2e-7 } },
    ...overrides,
  });
}

export interface Joined {
  sampleRateHz: number;
  sync: Float64Array;
  ramp: Float64Array;
  gate: Float64Array;
  control: Float64Array;
}

export function join(blocks: Iterable<SampleBlock>): Joined {
  const list = [...blocks];
  const total = list.reduce((sum, block) => sum + block.sync.length, 0);
  const joined: Joined = {
    sampleRateHz: list[0].sampleRateHz,
    sync: new Float64Array(total),
    ramp: new Float64Array(total),
    gate: new Float64Array(total),
    control: new Float64Array(total),
  };
  let at = 0;
  for (const block of list) {
    joined.sync.set(block.sync, at);
    joined.ramp.set(block.ramp, at);
    joined.gate.set(block.gate, at);
    joined.control.set(block.control ?? new Float64Array(block.sync.length), at);
    at += block.sync.length;
  }
  return joined;
}

/** Rising zero crossings of the sync, in samples (fractional), by linear interpolation between the bracketing samples. */
export function risingCrossings(values: Float64Array, hysteresisV = 0.5): number[] {
  const crossings: number[] = [];
  let armed = false;
  for (let index = 1; index < values.length; index++) {
    if (values[index] < -hysteresisV) armed = true;
    if (armed && values[index - 1] < 0 && values[index] >= 0) {
      crossings.push(index - 1 + values[index - 1] / (values[index - 1] - values[index]));
      armed = false;
    }
  }
  return crossings;
}

export function fallingCrossings(values: Float64Array, hysteresisV = 0.5): number[] {
  return risingCrossings(values.map((value) => -value), hysteresisV);
}

/** Rising edges of the gate at half its high level: index of the first sample at or above it. */
export function gateEdges(gate: Float64Array, highV: number): number[] {
  const edges: number[] = [];
  for (let index = 1; index < gate.length; index++) if (gate[index] >= highV / 2 && gate[index - 1] < highV / 2) edges.push(index);
  return edges;
}

export function gateHighCounts(gate: Float64Array, highV: number): number[] {
  const counts: number[] = [];
  let run = 0;
  for (const value of gate) {
    if (value >= highV / 2) run++;
    else if (run > 0) {
      counts.push(run);
      run = 0;
    }
  }
  return counts;
}

/** Largest ramp value between consecutive crossings (sample indices). */
export function peaksBetween(ramp: Float64Array, crossings: number[]): number[] {
  const peaks: number[] = [];
  for (let index = 0; index + 1 < crossings.length; index++) {
    let peak = -Infinity;
    for (let sample = Math.ceil(crossings[index]); sample < crossings[index + 1]; sample++) peak = Math.max(peak, ramp[sample]);
    peaks.push(peak);
  }
  return peaks;
}

export function mean(values: number[]): number {
  return values.reduce((sum, value) => sum + value, 0) / values.length;
}

export function standardDeviation(values: number[]): number {
  const average = mean(values);
  return Math.sqrt(values.reduce((sum, value) => sum + (value - average) ** 2, 0) / (values.length - 1));
}
