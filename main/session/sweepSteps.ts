/**
 * The two steps that need the control swept: the transfer curve and the limits. Both measure against one control
 * range (app/board/controlRange.ts): the transfer curve is judged where its fitted line meets the range's two ends,
 * the limits are the alpha extremes the board gave inside that range. Neither gives a verdict before the sweep has
 * reached both ends: until then its checks are "not measured yet".
 */
import type { ControlRange } from '../../app/board/controlRange';
import { controlEndsSeen } from '../../app/board/controlRange';
import type { BoardDesign } from '../../app/board/design';
import { formatVolt } from '../../app/board/formatValues';
import { checkAgainst, judgeReadings, type ReadingCheck } from '../../app/bench/judge';
import type { CaptureReadings, TransferSummary } from '../../app/bench/readings';
import type { Reading, StepReport } from '../../app/contract';
import { averageOutputV } from '../../app/power/rectifierOutput';
import type { AlphaExtremes } from './benchPipeline';
import { infoReading, pickChecks, readingFromCheck, stepReport } from './stepReadings';

const endWords = { low: 'the low end', high: 'the top' } as const;

function missingEnds(range: ControlRange, seen: { low: boolean; high: boolean }): string {
  const missing = (['low', 'high'] as const).filter((end) => !seen[end]).map((end) => `${endWords[end]} (${formatVolt(end === 'low' ? range.lowV : range.highV)})`);
  return missing.join(' and ');
}

/**
 * The transfer step: the fitted line's alpha at each end of the design's control range against the board model
 * there, once the sweep reached that end (a line is not judged where it was extrapolated).
 */
export function transferStep(design: BoardDesign, window: CaptureReadings | null, fit: TransferSummary | null, range: ControlRange): StepReport {
  const rangeText = `${formatVolt(range.lowV)} to ${formatVolt(range.highV)}`;
  if (!fit || !window) {
    // Before a sweep: the alpha at the control as it stands, for information only (this step judges the curve).
    const live = window ? pickChecks(judgeReadings(window, design), ['alphaDeg']).map((reading) => ({ ...reading, low: null, high: null, verdict: null, note: 'at the control voltage as it stands; the step judges the swept curve' })) : [];
    return stepReport('transfer', live, window?.cycles ?? 0, `sweep the control over the design's range, ${rangeText}, to record the transfer curve`, true);
  }
  const seen = controlEndsSeen(range, { controlMinV: fit.controlMinV, controlMaxV: fit.controlMaxV, alphaMinDeg: null, alphaMaxDeg: null });
  const ends: ReadingCheck[] = [];
  for (const end of ['low', 'high'] as const) {
    const controlV = end === 'low' ? range.lowV : range.highV;
    const expected = end === 'low' ? range.alphaAtLowDeg : range.alphaAtHighDeg;
    if (expected === null) continue;
    const measured = seen[end] ? fit.offsetDeg + fit.gainDegPerV * controlV : null;
    const key = end === 'low' ? 'alphaAtControlLowDeg' : 'alphaAtControlHighDeg';
    ends.push(checkAgainst(key, `Alpha at ${endWords[end]} of the control (${formatVolt(controlV)})`, 'deg', measured, expected, design.tolerances.alphaDeg, seen[end] ? null : 'the sweep has not reached this end yet'));
  }
  const note = seen.low && seen.high ? null : `sweep on to ${missingEnds(range, seen)}: the curve is judged at both ends of the design's range, ${rangeText}`;
  return stepReport(
    'transfer',
    [
      ...ends.map(readingFromCheck),
      infoReading('gainDegPerV', 'Transfer gain', 'deg/V', fit.gainDegPerV),
      infoReading('offsetDeg', 'Transfer offset', 'deg', fit.offsetDeg),
      infoReading('maxDeviationDeg', 'Largest deviation from a line', 'deg', fit.maxDeviationDeg),
      infoReading('controlMinV', 'Control swept from', 'V', fit.controlMinV, range.lowV),
      infoReading('controlMaxV', 'Control swept to', 'V', fit.controlMaxV, range.highV),
    ],
    fit.points,
    note,
    false,
  );
}

/**
 * The limits step: the smallest and largest alpha inside the design's control range once the sweep reached both
 * ends, the pulse checks of the last window, and (with a load) latching and the load voltage range.
 */
export function limitsStep(design: BoardDesign, window: CaptureReadings | null, extremes: AlphaExtremes, range: ControlRange): StepReport {
  const waiting = window === null || window.firingIntervals === 0;
  const seen = controlEndsSeen(range, extremes);
  const bothSeen = seen.low && seen.high;
  let checks: ReadingCheck[] = [];
  if (window) {
    const swept = bothSeen ? { alphaMinDeg: extremes.alphaMinDeg, alphaMaxDeg: extremes.alphaMaxDeg } : { alphaMinDeg: null, alphaMaxDeg: null };
    checks = judgeReadings({ ...window, pulse: { ...window.pulse, ...swept } }, design);
  }
  const notes: string[] = [];
  if (!waiting && !bothSeen) notes.push(`turn the control to both ends of its range, ${formatVolt(range.lowV)} to ${formatVolt(range.highV)}: ${missingEnds(range, seen)} not reached yet`);
  if (extremes.cyclesBelowRange > 0) notes.push(`${extremes.cyclesBelowRange} cycles fired below the design's control range (under ${formatVolt(range.lowV)}) were left out of the smallest alpha`);
  return stepReport(
    'limits',
    [...pickChecks(checks, ['alphaMaxDeg', 'alphaMinDeg', 'alphaBalanceDeg', 'pulseWidthUs', 'pulseLatchUs', 'wrongHalfCyclePulses', 'missingPulses', 'multiplePulses']), ...loadReadings(design, checks)],
    window?.cycles ?? 0,
    notes.length > 0 ? notes.join('; ') : null,
    waiting,
  );
}

/**
 * What the measured alpha range means at the load, when the design names it: the average load voltage at the
 * smallest and largest alpha (resistive load, app/power/rectifierOutput.ts), for information.
 */
function loadReadings(design: BoardDesign, limitChecks: readonly ReadingCheck[]): Reading[] {
  const load = design.load;
  if (!load) return [];
  const measured = (key: string): number | null => {
    const value = limitChecks.find((check) => check.key === key)?.measured;
    return typeof value === 'number' ? value : null;
  };
  const outputAt = (alphaDeg: number | null): number | null => (alphaDeg === null ? null : averageOutputV(design.rectifier, load.mainsRmsV, alphaDeg));
  const note = load.henry > 0 ? 'resistive-load formula; an inductive load conducting past the zero crossing gives less' : null;
  return [
    infoReading('loadAtAlphaMinV', 'Average load voltage at the smallest alpha', 'V', outputAt(measured('alphaMinDeg')), outputAt(design.alphaMinDeg), note),
    infoReading('loadAtAlphaMaxV', 'Average load voltage at the largest alpha', 'V', outputAt(measured('alphaMaxDeg')), outputAt(design.alphaMaxDeg), note),
  ];
}
