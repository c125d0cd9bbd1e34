/**
 * Two sessions side by side: the figures as recorded at each step first (judged against the tolerances of the design
 * version session A used, where the design gives one), then the whole-session figures, labelled as such and never
 * judged: they mix the board before and after a trim, and a sweep's spread is not jitter. A count is never judged.
 * One rule for every store.
 */
import type { BoardDesign } from '../../app/board/design';
import type { ComparisonRow, SessionFigures } from './logbookTypes';

export function comparisonRows(a: SessionFigures, b: SessionFigures, design: BoardDesign): ComparisonRow[] {
  const rampToleranceV = (design.tolerances.rampPeakPct / 100) * design.rampTargetV;
  const alphaToleranceDeg = design.tolerances.alphaDeg;
  const row = (scope: ComparisonRow['scope'], key: string, label: string, unit: string, valueA: number | null, valueB: number | null, toleranceAbs: number | null): ComparisonRow => {
    const difference = valueA !== null && valueB !== null ? valueB - valueA : null;
    return { key, label, unit, scope, a: valueA, b: valueB, difference, judged: toleranceAbs !== null, beyondTolerance: toleranceAbs !== null && difference !== null && Math.abs(difference) > toleranceAbs };
  };
  const recorded = (key: keyof Omit<SessionFigures, 'sessionId' | 'startedAt' | 'cycles' | 'wholeSession'>, label: string, unit: string, toleranceAbs: number | null) =>
    row('recorded', key, label, unit, a[key], b[key], toleranceAbs);
  const whole = (key: keyof SessionFigures['wholeSession'], label: string, unit: string) => row('whole-session', `wholeSession.${key}`, label, unit, a.wholeSession[key], b.wholeSession[key], null);
  return [
    recorded('rampPeakV', 'Ramp peak', 'V', rampToleranceV),
    recorded('slopeVPerMs', 'Ramp slope', 'V/ms', null),
    recorded('alphaJitterDeg', 'Firing jitter at a held control', 'deg', null),
    recorded('alphaGainDegPerV', 'Alpha gain (transfer curve)', 'deg/V', null),
    recorded('alphaOffsetDeg', 'Alpha offset (transfer curve)', 'deg', alphaToleranceDeg),
    recorded('alphaMinDeg', 'Smallest alpha', 'deg', alphaToleranceDeg),
    recorded('alphaMaxDeg', 'Largest alpha', 'deg', alphaToleranceDeg),
    whole('rampPeakMedianV', 'Ramp peak, median over the whole session', 'V'),
    whole('alphaMeanDeg', 'Alpha, mean over the whole session', 'deg'),
    whole('alphaSpreadDeg', 'Alpha spread over the whole session (a sweep\'s range, not jitter)', 'deg'),
    row('whole-session', 'cycles', 'Cycles measured', '', a.cycles, b.cycles, null),
  ];
}
