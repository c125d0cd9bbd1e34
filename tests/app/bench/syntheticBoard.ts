/**
 * Synthetic firing-board captures for the analysis tests, computed in closed form so every reading has an exact
 * expected value: a sine sync, an ideal ramp (linear from the floor, optionally clipped, instant reset held
 * `resetUs` centred on each zero crossing), a rectangular gate pulse at alpha, an optional control sweep; white
 * Gaussian noise and ADC quantisation on top. Scenarios of our own.
 */
import type { SampleBlock } from '../../../app/capture/samples';

export interface SyntheticBoard {
  rectifier: 'half-wave' | 'full-wave';
  frequencyHz: number;
  sampleRateHz: number;
  durationS: number;
  /** Phase of the sync at t = 0 (deg); the first rising crossing is at (360 - phase) / 360 periods. */
  startPhaseDeg?: number;
  syncAmplitudeV?: number;
  syncOffsetV?: number;
  rampFloorV?: number;
  /** Ramp slope (V/ms). */
  slopeVPerMs?: number;
  /** Level where the ramp clips, if it does. */
  clipV?: number;
  resetUs?: number;
  /** Firing angle, fixed, or a function of the control voltage. */
  alphaDeg?: number;
  transfer?: { offsetDeg: number; gainDegPerV: number; controlFromV: number; controlToV: number };
  pulseWidthUs?: number;
  gateHighV?: number;
  /** Extra pulse at this angle in the negative half-cycle (half-wave boards), a fault. */
  strayPulseDeg?: number;
  /** Every n-th firing interval has no pulse (a fault). */
  missingEvery?: number;
  noiseV?: number;
  /** ADC bits over +-12 V. */
  bits?: number;
  blockSamples?: number;
  seed?: number;
  /** Frequency drift (Hz/s), linear. */
  driftHzPerS?: number;
}

export interface SyntheticTruth {
  /** Firing intervals' start crossings (s). */
  intervalStartsS: number[];
  alphaDeg: number[];
  controlV: number[];
}

/** Deterministic PRNG (mulberry32, public domain) and Box-Muller normal deviates. */
export function normalSource(seed: number): () => number {
  let state = seed >>> 0;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

export function quantise(value: number, bits: number | undefined): number {
  if (!bits) return value;
  const lsbV = 24 / 2 ** bits;
  return Math.max(-12, Math.min(12 - lsbV, Math.round(value / lsbV) * lsbV));
}

/** Phase (cycles) of the mains at time t, with linear drift. */
function cyclesAt(board: SyntheticBoard, tS: number): number {
  return (board.startPhaseDeg ?? 0) / 360 + board.frequencyHz * tS + 0.5 * (board.driftHzPerS ?? 0) * tS * tS;
}

/** Time of the k-th half-cycle boundary (crossing number k counted from phase 0). */
function crossingTimeS(board: SyntheticBoard, halfCycle: number): number {
  const target = halfCycle / 2 - (board.startPhaseDeg ?? 0) / 360;
  const drift = board.driftHzPerS ?? 0;
  if (drift === 0) return target / board.frequencyHz;
  return (-board.frequencyHz + Math.sqrt(board.frequencyHz ** 2 + 2 * drift * target)) / drift;
}

export function synthesize(board: SyntheticBoard): { blocks: SampleBlock[]; truth: SyntheticTruth } {
  const n = Math.round(board.durationS * board.sampleRateHz);
  const noise = normalSource(board.seed ?? 1);
  const sync = new Float64Array(n);
  const ramp = new Float64Array(n);
  const gate = new Float64Array(n);
  const control = board.transfer ? new Float64Array(n) : null;
  const amplitudeV = board.syncAmplitudeV ?? 5;
  const floorV = board.rampFloorV ?? 0.2;
  const slopeVPerS = (board.slopeVPerMs ?? 0.8) * 1000;
  const resetS = (board.resetUs ?? 300) * 1e-6;
  const widthS = (board.pulseWidthUs ?? 200) * 1e-6;
  const gateHighV = board.gateHighV ?? 5;
  const controlAt = (tS: number): number =>
    board.transfer ? board.transfer.controlFromV + ((board.transfer.controlToV - board.transfer.controlFromV) * tS) / board.durationS : 0;
  // Firing intervals and their pulses.
  const truth: SyntheticTruth = { intervalStartsS: [], alphaDeg: [], controlV: [] };
  const pulses: Array<{ fromS: number; toS: number }> = [];
  const step = board.rectifier === 'full-wave' ? 1 : 2;
  const firstCrossing = Math.ceil((2 * (board.startPhaseDeg ?? 0)) / 360);
  let intervalNumber = 0;
  for (let k = firstCrossing + (board.rectifier === 'half-wave' && firstCrossing % 2 === 1 ? 1 : 0); ; k += step) {
    const startS = crossingTimeS(board, k);
    if (startS > board.durationS) break;
    const periodS = crossingTimeS(board, k + 2) - startS;
    intervalNumber += 1;
    let alphaDeg = board.alphaDeg ?? 90;
    let controlV = Number.NaN;
    if (board.transfer) {
      // Fixed point: alpha depends on the control at the firing instant.
      for (let iteration = 0; iteration < 4; iteration++) {
        controlV = controlAt(startS + (alphaDeg / 360) * periodS);
        alphaDeg = board.transfer.offsetDeg + board.transfer.gainDegPerV * controlV;
      }
    }
    const fires = !(board.missingEvery && intervalNumber % board.missingEvery === 0);
    if (fires) pulses.push({ fromS: startS + (alphaDeg / 360) * periodS, toS: startS + (alphaDeg / 360) * periodS + widthS });
    if (board.strayPulseDeg !== undefined) pulses.push({ fromS: startS + (board.strayPulseDeg / 360) * periodS, toS: startS + (board.strayPulseDeg / 360) * periodS + widthS });
    truth.intervalStartsS.push(startS);
    truth.alphaDeg.push(fires ? alphaDeg : Number.NaN);
    truth.controlV.push(controlV);
  }
  pulses.sort((a, b) => a.fromS - b.fromS);
  let pulseCursor = 0;
  for (let i = 0; i < n; i++) {
    const tS = i / board.sampleRateHz;
    const cycles = cyclesAt(board, tS);
    sync[i] = (board.syncOffsetV ?? 0) + amplitudeV * Math.sin(2 * Math.PI * cycles);
    // Ramp: time since the end of the last reset; held through the negative half on a half-wave board.
    const halfCycles = 2 * cycles;
    const k = Math.floor(halfCycles);
    const nextCrossingS = crossingTimeS(board, k + 1);
    const lastCrossingS = crossingTimeS(board, k);
    let rampV = floorV;
    const charging = board.rectifier === 'full-wave' || k % 2 === 0;
    if (charging && tS > lastCrossingS + resetS / 2 && tS < nextCrossingS - resetS / 2) {
      rampV = floorV + slopeVPerS * (tS - lastCrossingS - resetS / 2);
      if (board.clipV !== undefined) rampV = Math.min(rampV, board.clipV);
    }
    ramp[i] = rampV;
    while (pulseCursor < pulses.length && pulses[pulseCursor].toS < tS) pulseCursor++;
    let high = false;
    for (let p = pulseCursor; p < pulses.length && pulses[p].fromS <= tS; p++) if (tS < pulses[p].toS) high = true;
    gate[i] = high ? gateHighV : 0;
    if (control) control[i] = controlAt(tS);
  }
  const noiseV = board.noiseV ?? 0;
  const channels = control ? [sync, ramp, gate, control] : [sync, ramp, gate];
  for (const channel of channels) {
    for (let i = 0; i < n; i++) channel[i] = quantise(channel[i] + noiseV * noise(), board.bits);
  }
  const blockSamples = board.blockSamples ?? 4096;
  const blocks: SampleBlock[] = [];
  for (let from = 0; from < n; from += blockSamples) {
    const to = Math.min(n, from + blockSamples);
    blocks.push({
      startS: from / board.sampleRateHz,
      sampleRateHz: board.sampleRateHz,
      sync: sync.slice(from, to),
      ramp: ramp.slice(from, to),
      gate: gate.slice(from, to),
      control: control ? control.slice(from, to) : null,
      afterGap: false,
    });
  }
  return { blocks, truth };
}
