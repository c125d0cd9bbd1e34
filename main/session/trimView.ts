/**
 * The trim plan as the Trim screen shows it: app/board's planTrim on the ramp readings of the last window, with the
 * model's ramp after each change drawn in fold degrees over the measured ramp.
 */
import type { BoardDesign } from '../../app/board/design';
import { predictRamp, rampVoltageAt } from '../../app/board/rampModel';
import { planTrim, type TrimPlan, type TrimSuggestion } from '../../app/board/trimPlan';
import type { ESeriesName } from '../../app/board/eSeries';
import type { PartOverrides } from '../../app/board/parts';
import type { CaptureReadings } from '../../app/bench/readings';
import type { FoldTrace, KnownPart, TrimPlanView } from '../../app/contract';
import { BenchFault } from '../../app/contract';

/** The model's ramp after a change, over its charging interval, in degrees from the sync zero crossing. */
export function predictedRampTrace(design: BoardDesign, suggestion: Pick<TrimSuggestion, 'part' | 'toOhm' | 'toFarad' | 'predictedPeakV' | 'alsoChange'>, points = 60): FoldTrace {
  const overrides: PartOverrides = {};
  if (suggestion.part !== 'transistor') overrides[suggestion.part] = suggestion.toFarad ?? suggestion.toOhm ?? undefined;
  if (suggestion.alsoChange) overrides[suggestion.alsoChange.part] = suggestion.alsoChange.toOhm;
  const prediction = predictRamp(design, { partOverrides: overrides });
  const degPerS = 360 * design.mainsHz;
  // The planner predicts from its estimate of the actual board (fitted parts, V_EB); the design-based shape is
  // scaled between floor and peak so it ends where the planner says the peak will be.
  const riseV = prediction.peakV - prediction.floorV;
  const scale = riseV > 0 ? (suggestion.predictedPeakV - prediction.floorV) / riseV : 1;
  const deg: number[] = [];
  const v: number[] = [];
  for (let index = 0; index <= points; index++) {
    const elapsedS = (index / points) * prediction.chargingIntervalS;
    deg.push(degPerS * (prediction.startDelayS + elapsedS));
    v.push(prediction.floorV + (rampVoltageAt(prediction, elapsedS) - prediction.floorV) * scale);
  }
  return { deg, v };
}

/** The plan for the last window's ramp; `fitted` holds the parts known to differ from the design, `measured` those of them measured. */
export function planFromWindow(design: BoardDesign, window: CaptureReadings | null, series: ESeriesName, fitted: PartOverrides = {}, measured: PartOverrides = {}): TrimPlan {
  const ramp = window?.ramp;
  if (!ramp || ramp.peakV === null || ramp.floorV === null || ramp.slopeVPerMs === null) {
    throw new BenchFault('not-ready', 'no ramp measured yet: connect the board and wait a second for the ramp readings');
  }
  return planTrim(design, { floorV: ramp.floorV, peakV: ramp.peakV, slopeVPerMs: ramp.slopeVPerMs, startDelayDeg: ramp.startDelayDeg ?? undefined, clipped: ramp.clipped, alphaMaxDeg: window?.pulse.alphaMaxDeg ?? null }, { series, fitted, measured });
}

export function trimPlanView(design: BoardDesign, plan: TrimPlan, window: CaptureReadings | null, measuredRamp: FoldTrace | null, knownParts: KnownPart[] = []): TrimPlanView {
  return {
    inTolerance: plan.status === 'in-tolerance',
    status: plan.status,
    summary: plan.summary,
    notes: plan.notes,
    message: [plan.summary, ...plan.notes].join(' '),
    measuredPeakV: window?.ramp.peakV ?? null,
    targetPeakV: design.rampTargetV,
    estimate: {
      chargingCurrentA: plan.estimate.chargingCurrentA,
      designCurrentA: plan.estimate.designCurrentA,
      vebV: plan.estimate.vebV,
      explanation: plan.estimate.explanation,
      capacitanceErrorPct: plan.estimate.capacitanceErrorPct,
      ambiguity: plan.estimate.ambiguity,
    },
    suggestions: plan.suggestions.map((suggestion) => ({
      kind: suggestion.kind,
      part: suggestion.part,
      partRef: suggestion.ref,
      method: suggestion.method,
      fromOhm: suggestion.fromOhm,
      toOhm: suggestion.toOhm,
      fromFarad: suggestion.fromFarad,
      toFarad: suggestion.toFarad,
      addOhm: suggestion.addOhm,
      series: suggestion.series,
      predictedPeakV: suggestion.predictedPeakV,
      predictedAlphaMaxDeg: suggestion.predictedAlphaRangeDeg.maxDeg,
      headroomV: suggestion.headroomV,
      withinTolerance: suggestion.withinTolerance,
      // The planner's reason names the second change too ("... and the emitter resistor R7 (7k5) with 8k2").
      reason: suggestion.reason,
      predictedRamp: predictedRampTrace(design, suggestion),
      alsoChange: suggestion.alsoChange ? { part: suggestion.alsoChange.part, partRef: suggestion.alsoChange.ref, fromOhm: suggestion.alsoChange.fromOhm, toOhm: suggestion.alsoChange.toOhm } : null,
    })),
    measuredRamp,
    knownParts,
  };
}
