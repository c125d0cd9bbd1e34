/**
 * What the board design says the trended figures should be, and how far they may go: the limits the drift
 * forecast and the fleet view measure against. From the board model (app/board):
 * - ramp peak: the design's target +- its rampPeakPct;
 * - ramp slope: the model's slope +- the same percentage (peak = slope x charging time, so the same parts move both);
 * - alpha gain and offset: the model's transfer line through the firing angles at 60 and 120 degrees; gain +- the
 *   ramp percentage (gain is inverse to slope), offset +- the design's alpha tolerance;
 * - firing jitter at a held control: at most half the alpha tolerance (our rule: jitter eats the margin a reading
 *   needs). Never the spread of alpha over a session: a control sweep spreads alpha by design.
 */
import type { BoardDesign } from '../board/design';
import { controlForAlpha } from '../board/firingAngle';
import { predictRamp } from '../board/rampModel';
import type { DriftLimits } from './drift';

export type TrendedFigure = 'rampPeakV' | 'slopeVPerMs' | 'alphaGainDegPerV' | 'alphaOffsetDeg' | 'alphaJitterDeg';

export const trendedFigures: ReadonlyArray<{ key: TrendedFigure; label: string; unit: string }> = [
  { key: 'rampPeakV', label: 'Ramp peak', unit: 'V' },
  { key: 'slopeVPerMs', label: 'Ramp slope', unit: 'V/ms' },
  { key: 'alphaGainDegPerV', label: 'Alpha gain', unit: 'deg/V' },
  { key: 'alphaOffsetDeg', label: 'Alpha offset', unit: 'deg' },
  { key: 'alphaJitterDeg', label: 'Firing jitter at a held control', unit: 'deg' },
];

export interface DesignFigure {
  nominal: number | null;
  limits: DriftLimits;
}

export function designFigures(design: BoardDesign): Record<TrendedFigure, DesignFigure> {
  const prediction = predictRamp(design);
  const fraction = design.tolerances.rampPeakPct / 100;
  const band = (nominal: number | null, width: number | null): DesignFigure => ({
    nominal,
    limits: nominal === null || width === null ? { low: null, high: null } : { low: nominal - width, high: nominal + width },
  });
  const lowV = controlForAlpha(design, 60, { prediction });
  const highV = controlForAlpha(design, 120, { prediction });
  const gain = lowV !== null && highV !== null && highV !== lowV ? 60 / (highV - lowV) : null;
  const offset = gain !== null && lowV !== null ? 60 - gain * lowV : null;
  const slope = prediction.slopeVPerS / 1000;
  return {
    rampPeakV: band(design.rampTargetV, design.rampTargetV * fraction),
    slopeVPerMs: band(slope, slope * fraction),
    alphaGainDegPerV: band(gain, gain === null ? null : Math.abs(gain) * fraction),
    alphaOffsetDeg: band(offset, design.tolerances.alphaDeg),
    alphaJitterDeg: { nominal: 0, limits: { low: null, high: design.tolerances.alphaDeg / 2 } },
  };
}
