/**
 * The Board screen's sizing calculator: the emitter resistor that brings the model's ramp to a target height with
 * the design's divider and capacitor, exactly and as the nearest standard value (IEC 60063, nearest by ratio),
 * each with the peak the model then predicts. DOM-free for unit tests.
 */
import type { BoardDesign } from '../../app/board/design';
import { nearestStandardValue, type ESeriesName } from '../../app/board/eSeries';
import { predictRamp, type RampPrediction } from '../../app/board/rampModel';

export interface EmitterSizing {
  exactOhm: number;
  standardOhm: number;
  series: ESeriesName;
  exactPeakV: number;
  standard: RampPrediction;
}

/**
 * Bisection on the emitter resistor in log space: the peak falls as R_E grows (less charging current), so the
 * target is bracketed between 10 ohm and 10 Mohm or there is no answer (null).
 */
export function sizeEmitterResistor(design: BoardDesign, targetV: number, series: ESeriesName): EmitterSizing | null {
  const peakAt = (ohm: number) => predictRamp(design, { partOverrides: { rEmitter: ohm } }).peakV;
  let lowOhm = 10;
  let highOhm = 1e7;
  if (!(peakAt(lowOhm) >= targetV && peakAt(highOhm) <= targetV)) return null;
  for (let iteration = 0; iteration < 80; iteration++) {
    const middleOhm = Math.sqrt(lowOhm * highOhm);
    if (peakAt(middleOhm) > targetV) lowOhm = middleOhm;
    else highOhm = middleOhm;
    if (highOhm / lowOhm < 1 + 1e-9) break;
  }
  const exactOhm = Math.sqrt(lowOhm * highOhm);
  const standardOhm = nearestStandardValue(exactOhm, series);
  return { exactOhm, standardOhm, series, exactPeakV: peakAt(exactOhm), standard: predictRamp(design, { partOverrides: { rEmitter: standardOhm } }) };
}
