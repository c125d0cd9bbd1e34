/**
 * Boards of our own for the model-versus-ngspice checks, and a direct ramp measurement on ngspice traces that
 * does not use the analysis engine (so the board model is checked against the simulator alone).
 */
import { type BoardDesign, type BoardDesignInput, boardDesignSchema } from '../../app/board/design';
import type { FiringBoardTraces } from './firingBoardDeck';

function design(input: BoardDesignInput): BoardDesign {
  return boardDesignSchema.parse(input);
}

/** Scenarios of our own (invented names). */
export const referenceBoards: Record<string, BoardDesign> = {
  /** 50 Hz full-wave, 15 V, weak divider: the parts of issue 3's example, target set to what they give. */
  fullWave50: design({
    name: 'Test board A (50 Hz full-wave)', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 5.5, alphaMaxDeg: 165,
    // rDischarge pinned at 10 ohm (the default before it became 22 ohm) so the analysis suites keep their board.
    parts: { rEmitter: { ohm: 7500, ref: 'R7' }, rBiasTop: { ohm: 22000, ref: 'R5' }, rBiasBottom: { ohm: 100000, ref: 'R6' }, cRamp: { farad: 4.7e-7, ref: 'C3' }, rDischarge: { ohm: 10 } },
    transistor: { vebV: 0.65, beta: 150, earlyV: 60 },
  }),
  /** 60 Hz half-wave, 12 V, stiffer divider, shorter Early voltage. */
  halfWave60: design({
    name: 'Test board B (60 Hz half-wave)', mainsHz: 60, rectifier: 'half-wave', supplyV: 12, rampTargetV: 5.4, alphaMaxDeg: 160, syncResetUs: 200,
    parts: { rEmitter: { ohm: 3300, ref: 'R12' }, rBiasTop: { ohm: 4700, ref: 'R10' }, rBiasBottom: { ohm: 22000, ref: 'R11' }, cRamp: { farad: 6.8e-7, ref: 'C5' }, rDischarge: { ohm: 22 } },
    transistor: { vebV: 0.62, beta: 220, earlyV: 35 },
  }),
  /** 50 Hz full-wave, 24 V supply, large emitter drop, low beta. */
  fullWave50Drive: design({
    name: 'Test board C (50 Hz full-wave drive)', mainsHz: 50, rectifier: 'full-wave', supplyV: 24, rampTargetV: 10.5, alphaMaxDeg: 170, syncResetUs: 400,
    parts: { rEmitter: { ohm: 15000, ref: 'R3' }, rBiasTop: { ohm: 39000, ref: 'R1' }, rBiasBottom: { ohm: 68000, ref: 'R2' }, cRamp: { farad: 4.7e-7, ref: 'C1' }, rDischarge: { ohm: 10 } },
    transistor: { vebV: 0.68, beta: 80, earlyV: 90 },
  }),
};

export interface DeckRampReading {
  floorV: number;
  peakV: number;
  /** Least-squares slope over the middle 80 % of the unclipped part (V/s). */
  slopeVPerS: number;
  /** Time from the ramp's start until V_EC first falls to the design's vecSatV (s), or null. */
  clipOnsetS: number | null;
  rampStartS: number;
  rampEndS: number;
}

/**
 * Reads one ramp from the traces: `halfCycleIndex` counts charging half-cycles from the start of the run
 * (full-wave: every half-cycle; half-wave: the positive ones). The sync zero crossings come from the deck's
 * construction (t = 0 is a mains zero crossing, sync lags by syncPhaseDeg), not from the traces.
 */
export function readDeckRamp(traces: FiringBoardTraces, board: BoardDesign, halfCycleIndex: number): DeckRampReading {
  const halfCycleS = 1 / (2 * board.mainsHz);
  const lagS = board.syncPhaseDeg / 360 / board.mainsHz;
  const stride = board.rectifier === 'full-wave' ? halfCycleS : 2 * halfCycleS;
  const crossingS = lagS + halfCycleIndex * stride;
  const resetS = board.syncResetUs * 1e-6;
  const rampStartS = crossingS + resetS / 2;
  const rampEndS = crossingS + halfCycleS - resetS / 2;
  const { timeS, ramp, emitter } = traces;
  const indexAt = (targetS: number): number => {
    let low = 0;
    let high = timeS.length - 1;
    while (high - low > 1) {
      const middle = (low + high) >> 1;
      if (timeS[middle] <= targetS) low = middle;
      else high = middle;
    }
    return low;
  };
  // Floor: mean over the last fifth of the reset before the start (the switch is fully on there).
  const floorFrom = indexAt(rampStartS - resetS * 0.3);
  const floorTo = indexAt(rampStartS - resetS * 0.1);
  let floorSum = 0;
  for (let index = floorFrom; index <= floorTo; index += 1) floorSum += ramp[index];
  const floorV = floorSum / (floorTo - floorFrom + 1);
  const startIndex = indexAt(rampStartS);
  const endIndex = indexAt(rampEndS - 10e-6);
  let peakV = -Infinity;
  let clipIndex: number | null = null;
  for (let index = startIndex; index <= endIndex; index += 1) {
    peakV = Math.max(peakV, ramp[index]);
    if (clipIndex === null && emitter[index] - ramp[index] <= board.transistor.vecSatV) clipIndex = index;
  }
  const clipOnsetS = clipIndex === null ? null : timeS[clipIndex] - rampStartS;
  const linearEndS = clipOnsetS === null ? rampEndS : rampStartS + clipOnsetS;
  const spanS = linearEndS - rampStartS;
  const fitFrom = indexAt(rampStartS + 0.1 * spanS);
  const fitTo = indexAt(rampStartS + 0.9 * spanS);
  let sumT = 0;
  let sumV = 0;
  let count = 0;
  for (let index = fitFrom; index <= fitTo; index += 1) {
    sumT += timeS[index];
    sumV += ramp[index];
    count += 1;
  }
  const meanT = sumT / count;
  const meanV = sumV / count;
  let covariance = 0;
  let variance = 0;
  for (let index = fitFrom; index <= fitTo; index += 1) {
    covariance += (timeS[index] - meanT) * (ramp[index] - meanV);
    variance += (timeS[index] - meanT) ** 2;
  }
  return { floorV, peakV, slopeVPerS: covariance / variance, clipOnsetS, rampStartS, rampEndS };
}
