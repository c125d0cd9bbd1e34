/**
 * The fixed control resistor when the pot's end fires away from alphaMaxDeg (measured, or predicted after the
 * trim): rounded up to the series so alpha stays short of the limit (REFERENCES.md commissioning rule).
 */
import type { BoardDesign } from './design';
import type { ESeriesName } from './eSeries';
import { standardValueNeighbours } from './eSeries';
import { controlLimitsOf } from './controlDivider';
import { formatOhm } from './formatValues';
import { partName } from './partNames';
import type { RampPrediction } from './rampModel';
import type { RampReadings } from './rampReadings';
import type { CandidateContext } from './trimCandidates';

export interface ControlLimitSuggestion {
  part: 'rControlTop';
  ref: string | null;
  method: 'replace';
  fromOhm: number | null;
  toOhm: number;
  series: ESeriesName;
  predictedAlphaMaxDeg: number | null;
  reason: string;
}

export function controlLimitSuggestion(design: BoardDesign, measured: RampReadings, prediction: RampPrediction, context: CandidateContext): ControlLimitSuggestion | null {
  if (!design.parts.potControl && !design.parts.rControlTop) return null;
  const limits = controlLimitsOf(design, { prediction, partOverrides: context.fitted });
  const toleranceDeg = design.tolerances.alphaDeg;
  // Only a measured alpha past the limit counts: a lower largest alpha may just mean the pot was not at its end.
  const measuredOff = measured.alphaMaxDeg != null && measured.alphaMaxDeg > design.alphaMaxDeg + toleranceDeg;
  const predictedOff = limits.alphaMaxDeg === null || Math.abs(limits.alphaMaxDeg - design.alphaMaxDeg) > toleranceDeg;
  if (!(measuredOff || predictedOff) || limits.limitResistorOhm === null) return null;
  // Round up: a larger top resistor lowers the pot's end, so alpha stays short of alphaMaxDeg (REFERENCES.md rule).
  const toOhm = standardValueNeighbours(limits.limitResistorOhm, context.series).above;
  const fromOhm = context.fitted.rControlTop ?? design.parts.rControlTop?.ohm ?? null;
  // The fitted value is already the best the series offers: the shortfall is the series' step, not a fault.
  if (fromOhm !== null && Math.abs(fromOhm / toOhm - 1) < 1e-6) return null;
  const after = controlLimitsOf(design, { prediction, partOverrides: { ...context.fitted, rControlTop: toOhm } });
  const name = partName(design, 'rControlTop');
  const seen = measured.alphaMaxDeg != null ? `alpha max measured ${measured.alphaMaxDeg.toFixed(1)} deg` : `alpha max would be ${limits.alphaMaxDeg === null ? 'past the ramp end' : `${limits.alphaMaxDeg.toFixed(1)} deg`}`;
  return {
    part: 'rControlTop',
    ref: design.parts.rControlTop?.ref ?? null,
    method: 'replace',
    fromOhm,
    toOhm,
    series: context.series,
    predictedAlphaMaxDeg: after.alphaMaxDeg,
    reason: `${seen}, design ${design.alphaMaxDeg} deg: ${fromOhm === null ? `fit a ${name} of ${formatOhm(toOhm)}` : `replace the ${name} (${formatOhm(fromOhm)}) with ${formatOhm(toOhm)}`} so the pot's end fires at ${after.alphaMaxDeg === null ? '(past the ramp end)' : `${after.alphaMaxDeg.toFixed(1)} deg`}.`,
  };
}
