/**
 * What a firing angle means at the power stage: average output of a phase-controlled single-phase rectifier
 * into a resistive load (REFERENCES.md, rectifier facts; any power-electronics handbook):
 *   half-wave  V_dc = V_m / (2 pi) (1 + cos alpha)
 *   full-wave  V_dc = V_m / pi     (1 + cos alpha)
 * with V_m the peak of the mains (sqrt 2 times its rms value).
 */
import type { Rectifier } from '../bench/readings';

export function averageOutputV(rectifier: Rectifier, mainsRmsV: number, alphaDeg: number): number {
  const peakV = Math.SQRT2 * mainsRmsV;
  const alphaRad = (alphaDeg * Math.PI) / 180;
  const share = (1 + Math.cos(alphaRad)) / Math.PI;
  return rectifier === 'half-wave' ? (peakV * share) / 2 : peakV * share;
}

/** The firing angle that gives a wanted average output (inverse of averageOutputV), clamped to 0..180 degrees. */
export function alphaForAverageOutputDeg(rectifier: Rectifier, mainsRmsV: number, averageV: number): number {
  const fullScaleV = averageOutputV(rectifier, mainsRmsV, 0);
  const cosine = Math.min(1, Math.max(-1, (2 * averageV) / fullScaleV - 1));
  return (Math.acos(cosine) * 180) / Math.PI;
}
