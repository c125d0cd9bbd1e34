/**
 * The truth the analysis engine is checked against, read straight from a dense ngspice trace without using the
 * engine's code: zero crossings and gate edges by linear interpolation between the trace's points (5 us apart, where
 * a 50 Hz sine is straight to 1e-7 of its amplitude), ramp peaks as the trace's maximum in each charging interval.
 * Plus the resampling of a trace at a logger's rate with noise and ADC quantisation.
 */
import type { SampleBlock } from '../../../app/capture/samples';
import { normalSource } from '../../app/bench/syntheticBoard';
import type { FiringBoardTraces } from '../firingBoardDeck';

export interface DeckWindow {
  startS: number;
  endS: number;
  /** Falling crossing inside a half-wave window; the end of the charging half. */
  chargeEndS: number;
  periodS: number;
  peakV: number;
  /** Gate rising 50 % crossings in the half-cycle that should fire, and in the other one. */
  firingS: number[];
  wrongHalfS: number[];
  controlAtFiringV: number | null;
  /** The current source saturated (V_EC at or below `vecSatV` + 0.1 V) before the charging interval ended. */
  clipped: boolean;
}

export interface DeckTruth {
  frequencyHz: number;
  risingS: number[];
  windows: DeckWindow[];
}

function crossings(timeS: Float64Array, values: Float64Array, levelV: number): Array<{ timeS: number; rising: boolean }> {
  const found: Array<{ timeS: number; rising: boolean }> = [];
  for (let i = 1; i < values.length; i++) {
    const before = values[i - 1] - levelV;
    const after = values[i] - levelV;
    if ((before < 0 && after >= 0) || (before > 0 && after <= 0)) {
      const fraction = before / (before - after);
      found.push({ timeS: timeS[i - 1] + fraction * (timeS[i] - timeS[i - 1]), rising: after > before });
    }
  }
  return found;
}

function interpolate(timeS: Float64Array, values: Float64Array, atS: number): number {
  let low = 0;
  let high = timeS.length - 1;
  while (high - low > 1) {
    const middle = (low + high) >> 1;
    if (timeS[middle] <= atS) low = middle;
    else high = middle;
  }
  const fraction = (atS - timeS[low]) / (timeS[high] - timeS[low]);
  return values[low] + fraction * (values[high] - values[low]);
}

/**
 * Windows between the crossings at least a quarter period inside the run: a crossing closer to the start or end
 * cannot be told from noise by any detector with hysteresis, which must see the signal swing beyond a band on both
 * sides (common practice), so neither the truth nor the engine counts it.
 */
export function deckTruth(traces: FiringBoardTraces, options: { rectifier: 'half-wave' | 'full-wave'; gateHighV: number; vecSatV: number; syncPhaseDeg: number }): DeckTruth {
  const { timeS } = traces;
  const firstS = timeS[0];
  const lastS = timeS[timeS.length - 1];
  const all = crossings(timeS, traces.sync, 0);
  const quarterS = (all[all.length - 1].timeS - all[0].timeS) / (all.length - 1) / 2;
  const sync = all.filter((crossing) => crossing.timeS > firstS + quarterS && crossing.timeS < lastS - quarterS);
  const risingS = sync.filter((crossing) => crossing.rising).map((crossing) => crossing.timeS);
  const frequencyHz = (risingS.length - 1) / (risingS[risingS.length - 1] - risingS[0]);
  const boundaries = options.rectifier === 'full-wave' ? sync : sync.filter((crossing) => crossing.rising);
  const gateRises = crossings(timeS, traces.gate, options.gateHighV / 2).filter((crossing) => crossing.rising).map((crossing) => crossing.timeS);
  const windows: DeckWindow[] = [];
  for (let k = 0; k + 1 < boundaries.length; k++) {
    const startS = boundaries[k].timeS;
    const endS = boundaries[k + 1].timeS;
    const periodS = options.rectifier === 'full-wave' ? 2 * (endS - startS) : endS - startS;
    const falling = sync.find((crossing) => !crossing.rising && crossing.timeS > startS && crossing.timeS < endS);
    const chargeEndS = options.rectifier === 'half-wave' && falling ? falling.timeS : endS;
    let peakV = Number.NEGATIVE_INFINITY;
    let clipped = false;
    for (let i = 0; i < timeS.length; i++) {
      if (timeS[i] < startS || timeS[i] > chargeEndS) continue;
      peakV = Math.max(peakV, traces.ramp[i]);
      if (traces.emitter[i] - traces.ramp[i] <= options.vecSatV + 0.1) clipped = true;
    }
    const inWindow = gateRises.filter((riseS) => riseS >= startS && riseS < endS);
    const firingS = inWindow.filter((riseS) => riseS < chargeEndS);
    const wrongHalfS = inWindow.filter((riseS) => riseS >= chargeEndS);
    windows.push({
      startS, endS, chargeEndS, periodS, peakV, firingS, wrongHalfS, clipped,
      controlAtFiringV: firingS.length > 0 ? interpolate(timeS, traces.control, firingS[0]) : null,
    });
  }
  return { frequencyHz, risingS, windows };
}

/**
 * Alpha of a window's first pulse from the mains zero crossing that starts its half-cycle, or null. The deck puts a
 * rising mains crossing at t = 0 (firingBoardDeck.ts), so mains crossings are at whole half-periods (full-wave) or
 * periods (half-wave) of the design's mains frequency: independent of the sync trace and of any phase correction.
 */
export function truthAlphaDeg(window: DeckWindow, design: { mainsHz: number; rectifier: 'half-wave' | 'full-wave' }): number | null {
  if (window.firingS.length === 0) return null;
  const strideS = design.rectifier === 'full-wave' ? 1 / (2 * design.mainsHz) : 1 / design.mainsHz;
  const mainsCrossingS = Math.floor(window.firingS[0] / strideS) * strideS;
  return (window.firingS[0] - mainsCrossingS) * 360 * design.mainsHz;
}

export interface Resampling {
  sampleRateHz: number;
  bits: number;
  noiseV: number;
  /** Sampling starts this fraction of a sample interval after the trace's start (asynchronous logger). */
  phase: number;
  seed: number;
  blockSamples?: number;
}

/** ADC ranges of our logger scenario: sync +-8 V, ramp, gate and control 0-16 V. */
const ranges = { sync: [-8, 8], ramp: [0, 16], gate: [0, 16], control: [0, 16] } as const;

export function resampleTraces(traces: FiringBoardTraces, resampling: Resampling): SampleBlock[] {
  const noise = normalSource(resampling.seed);
  const { timeS } = traces;
  const intervalS = 1 / resampling.sampleRateHz;
  const count = Math.floor((timeS[timeS.length - 1] - timeS[0]) / intervalS - resampling.phase);
  const channels = { sync: new Float64Array(count), ramp: new Float64Array(count), gate: new Float64Array(count), control: new Float64Array(count) };
  let cursor = 0;
  for (let n = 0; n < count; n++) {
    const atS = timeS[0] + (n + resampling.phase) * intervalS;
    while (cursor + 2 < timeS.length && timeS[cursor + 1] <= atS) cursor++;
    const fraction = (atS - timeS[cursor]) / (timeS[cursor + 1] - timeS[cursor]);
    for (const role of ['sync', 'ramp', 'gate', 'control'] as const) {
      const source = traces[role];
      const value = source[cursor] + fraction * (source[cursor + 1] - source[cursor]) + resampling.noiseV * noise();
      const [low, high] = ranges[role];
      const lsbV = (high - low) / 2 ** resampling.bits;
      channels[role][n] = low + Math.max(0, Math.min(2 ** resampling.bits - 1, Math.round((value - low) / lsbV))) * lsbV;
    }
  }
  const blockSamples = resampling.blockSamples ?? 2048;
  const blocks: SampleBlock[] = [];
  for (let from = 0; from < count; from += blockSamples) {
    const to = Math.min(count, from + blockSamples);
    blocks.push({
      startS: timeS[0] + (from + resampling.phase) * intervalS,
      sampleRateHz: resampling.sampleRateHz,
      sync: channels.sync.slice(from, to),
      ramp: channels.ramp.slice(from, to),
      gate: channels.gate.slice(from, to),
      control: channels.control.slice(from, to),
      afterGap: false,
    });
  }
  return blocks;
}
