/**
 * Tolerance analysis of the ramp: seeded Monte Carlo over the parts' tolerances, the transistor's unit-to-unit
 * V_EB and beta spread and the V_EB drift over the ambient range (about -2 mV/K, REFERENCES.md: Sedra and Smith),
 * giving the spread of the ramp peak and of alpha at one control voltage; plus the worst case over every corner
 * (extreme-vertex analysis, common practice). Parts are drawn uniformly within their tolerance: a part sold as
 * 5 % may sit anywhere inside it, and a uniform draw is the cautious reading of a bare tolerance (common practice).
 */
import type { BoardDesign } from './design';
import { alphaForControl, controlForAlpha } from './firingAngle';
import { boardPartValues, type PartOverrides } from './parts';
import { predictRamp, type RampOptions } from './rampModel';
import { seededRandom } from './seededRandom';

export interface ToleranceOptions {
  /** Monte Carlo runs. Default 500. */
  runs?: number;
  /** Seed of the generator; the same seed gives the same spread. Default 1. */
  seed?: number;
  /** Control voltage at which alpha's spread is taken. Default: the nominal board's control for 90 deg. */
  controlV?: number;
  /** Ambient range (C). Default: the design's ambientC. */
  temperatureRangeC?: { minC: number; maxC: number };
  /** Unit-to-unit V_EB spread at the same current, +- (V). Default 0.02 V (from memory: small-signal PNPs of one type). */
  vebSpreadV?: number;
  /** Unit-to-unit beta spread, +- percent. Default 33 % (from memory: a gain group spans about 2:1). */
  betaSpreadPct?: number;
  /** Start from parts as fitted rather than the design's values. */
  partOverrides?: PartOverrides;
}

export interface Spread {
  nominal: number;
  mean: number;
  standardDeviation: number;
  min: number;
  max: number;
}

export interface ToleranceReport {
  runs: number;
  seed: number;
  controlV: number | null;
  peakV: Spread;
  /** Alpha at controlV; null when the nominal board does not fire there. Runs that do not fire are counted, not averaged. */
  alphaDeg: Spread | null;
  missedFiringRuns: number;
  clippedRuns: number;
  worstCase: { peakLowV: number; peakHighV: number; alphaLowDeg: number | null; alphaHighDeg: number | null; clippedCorners: number };
}

const varied = ['rEmitter', 'rBiasTop', 'rBiasBottom', 'cRamp'] as const;

interface Draw {
  overrides: PartOverrides;
  ramp: RampOptions;
}

function spreadOf(nominal: number, values: number[]): Spread {
  const mean = values.reduce((sum, value) => sum + value, 0) / values.length;
  const variance = values.reduce((sum, value) => sum + (value - mean) ** 2, 0) / Math.max(values.length - 1, 1);
  return { nominal, mean, standardDeviation: Math.sqrt(variance), min: Math.min(...values), max: Math.max(...values) };
}

export function analyseTolerances(design: BoardDesign, options: ToleranceOptions = {}): ToleranceReport {
  const runs = options.runs ?? 500;
  const seed = options.seed ?? 1;
  const range = options.temperatureRangeC ?? design.ambientC;
  const vebSpreadV = options.vebSpreadV ?? 0.02;
  const betaSpread = (options.betaSpreadPct ?? 33) / 100;
  const base = boardPartValues(design, options.partOverrides);
  const baseValue: Record<(typeof varied)[number], number> = {
    rEmitter: base.rEmitterOhm,
    rBiasTop: base.rBiasTopOhm,
    rBiasBottom: base.rBiasBottomOhm,
    cRamp: base.cRampFarad,
  };
  const nominal = predictRamp(design, { partOverrides: options.partOverrides });
  const controlV = options.controlV ?? controlForAlpha(design, 90, { prediction: nominal });
  const nominalAlpha = controlV === null ? null : alphaForControl(design, controlV, { prediction: nominal });

  // position in [-1, 1] for each varied quantity: four parts, V_EB spread, beta spread, temperature.
  const drawAt = (position: readonly number[]): Draw => {
    const overrides: PartOverrides = { ...options.partOverrides };
    varied.forEach((role, index) => {
      const tolerance = design.parts[role].tolerancePct / 100;
      overrides[role] = baseValue[role] * (1 + tolerance * position[index]);
    });
    const temperatureC = range.minC + ((position[6] + 1) / 2) * (range.maxC - range.minC);
    return {
      overrides,
      ramp: { vebShiftV: vebSpreadV * position[4], beta: design.transistor.beta * (1 + betaSpread * position[5]), temperatureC },
    };
  };
  const evaluate = (draw: Draw): { peakV: number; alphaDeg: number | null; clipped: boolean } => {
    const prediction = predictRamp(design, { ...draw.ramp, partOverrides: draw.overrides });
    const alphaDeg = controlV === null ? null : alphaForControl(design, controlV, { prediction });
    return { peakV: prediction.peakV, alphaDeg, clipped: prediction.clipped };
  };

  const random = seededRandom(seed);
  const peaks: number[] = [];
  const alphas: number[] = [];
  let missedFiringRuns = 0;
  let clippedRuns = 0;
  for (let run = 0; run < runs; run += 1) {
    const result = evaluate(drawAt(Array.from({ length: 7 }, () => 2 * random() - 1)));
    peaks.push(result.peakV);
    if (result.clipped) clippedRuns += 1;
    if (result.alphaDeg === null) missedFiringRuns += 1;
    else alphas.push(result.alphaDeg);
  }

  let peakLowV = Infinity;
  let peakHighV = -Infinity;
  let alphaLowDeg: number | null = null;
  let alphaHighDeg: number | null = null;
  let clippedCorners = 0;
  for (let corner = 0; corner < 2 ** 7; corner += 1) {
    const position = Array.from({ length: 7 }, (_, bit) => ((corner >> bit) & 1 ? 1 : -1));
    const result = evaluate(drawAt(position));
    peakLowV = Math.min(peakLowV, result.peakV);
    peakHighV = Math.max(peakHighV, result.peakV);
    if (result.clipped) clippedCorners += 1;
    if (result.alphaDeg !== null) {
      alphaLowDeg = alphaLowDeg === null ? result.alphaDeg : Math.min(alphaLowDeg, result.alphaDeg);
      alphaHighDeg = alphaHighDeg === null ? result.alphaDeg : Math.max(alphaHighDeg, result.alphaDeg);
    }
  }

  return {
    runs,
    seed,
    controlV,
    peakV: spreadOf(nominal.peakV, peaks),
    alphaDeg: nominalAlpha === null || alphas.length === 0 ? null : spreadOf(nominalAlpha, alphas),
    missedFiringRuns,
    clippedRuns,
    worstCase: { peakLowV, peakHighV, alphaLowDeg, alphaHighDeg, clippedCorners },
  };
}
