/**
 * A session's figures as recorded at each step: the board as the technician checked it and signed for it, after any
 * trim (the ramp step recorded again once a fitted change was re-checked). The logbook's table, comparisons, drift and
 * fleet use these; figures over every cycle of a session (before and after a trim, through a whole control sweep)
 * are kept apart as whole-session figures and labelled so wherever they are shown.
 * From the stored step reports; a session from before steps were kept falls back to the readings stored with it
 * (the last check's window, or a headless recording's summary). Pure: every store reads them the same way.
 */
import type { CaptureReadings } from '../../app/bench/readings';
import { parseStepReports, type CommissioningStep, type StepReport } from '../../app/contract/readings';

export interface RecordedFigures {
  /** Ramp step: ramp peak, slope, and firing jitter at a held control. */
  rampPeakV: number | null;
  slopeVPerMs: number | null;
  alphaJitterDeg: number | null;
  /** Transfer step: the least-squares line of alpha against control. */
  alphaGainDegPerV: number | null;
  alphaOffsetDeg: number | null;
  /** Limits step: the smallest and largest alpha inside the design's control range. */
  alphaMinDeg: number | null;
  alphaMaxDeg: number | null;
}

export const noRecordedFigures: RecordedFigures = { rampPeakV: null, slopeVPerMs: null, alphaJitterDeg: null, alphaGainDegPerV: null, alphaOffsetDeg: null, alphaMinDeg: null, alphaMaxDeg: null };

function valueOf(steps: readonly StepReport[], step: CommissioningStep, key: string): number | null {
  return steps.find((report) => report.step === step)?.readings.find((reading) => reading.key === key)?.value ?? null;
}

function parseReadings(json: string | null): CaptureReadings | null {
  if (json === null) return null;
  try {
    return JSON.parse(json) as CaptureReadings;
  } catch {
    return null;
  }
}

export function recordedFiguresOf(stored: { stepsJson: string | null; readingsJson: string | null }): RecordedFigures {
  const steps = parseStepReports(stored.stepsJson);
  if (steps !== null) {
    return {
      rampPeakV: valueOf(steps, 'ramp', 'rampPeakV'),
      slopeVPerMs: valueOf(steps, 'ramp', 'slopeVPerMs'),
      alphaJitterDeg: valueOf(steps, 'ramp', 'alphaJitterDeg'),
      alphaGainDegPerV: valueOf(steps, 'transfer', 'gainDegPerV'),
      alphaOffsetDeg: valueOf(steps, 'transfer', 'offsetDeg'),
      alphaMinDeg: valueOf(steps, 'limits', 'alphaMinDeg'),
      alphaMaxDeg: valueOf(steps, 'limits', 'alphaMaxDeg'),
    };
  }
  const readings = parseReadings(stored.readingsJson);
  if (!readings) return noRecordedFigures;
  return {
    ...noRecordedFigures,
    rampPeakV: readings.ramp?.peakV ?? null,
    slopeVPerMs: readings.ramp?.slopeVPerMs ?? null,
    alphaGainDegPerV: readings.transfer?.gainDegPerV ?? null,
    alphaOffsetDeg: readings.transfer?.offsetDeg ?? null,
  };
}
