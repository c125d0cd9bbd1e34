/** Transfer points and readings as CSV tables (tableCsv.ts), with units in the column names. */
import type { ReadingCheck } from '../bench/judge';
import type { StepReport } from '../contract/readings';
import { formatCsvTable } from './tableCsv';

export function transferPointsCsv(points: ReadonlyArray<{ t: number; controlV: number; alphaDeg: number }>): string {
  return formatCsvTable(['t_s', 'control_v', 'alpha_deg'], points.map((point) => [point.t, point.controlV, point.alphaDeg]));
}

/** Readings judged after the session (a session from before steps were kept). */
export function readingsCsv(checks: readonly ReadingCheck[]): string {
  return formatCsvTable(
    ['reading', 'label', 'measured', 'design', 'tolerance', 'unit', 'verdict', 'note'],
    checks.map((check) => [check.key, check.label, check.measured, check.expected, check.toleranceAbs, check.unit, check.verdict, check.note]),
  );
}

/**
 * The readings as recorded at each step, one row per reading with its step, band and verdict: the board as the
 * technician checked it. `verdict` is empty for a reading shown for information (no tolerance applies to it).
 */
export function stepReadingsCsv(steps: readonly StepReport[]): string {
  return formatCsvTable(
    ['step', 'reading', 'label', 'value', 'design', 'low', 'high', 'unit', 'verdict', 'note'],
    steps.flatMap((report) => report.readings.map((reading) => [report.step, reading.key, reading.label, reading.value, reading.expected, reading.low, reading.high, reading.unit, reading.verdict, reading.note])),
  );
}
