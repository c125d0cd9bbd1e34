/** Transfer points and readings as CSV tables (tableCsv.ts), with units in the column names. */
import type { ReadingCheck } from '../bench/judge';
import { formatCsvTable } from './tableCsv';

export function transferPointsCsv(points: ReadonlyArray<{ t: number; controlV: number; alphaDeg: number }>): string {
  return formatCsvTable(['t_s', 'control_v', 'alpha_deg'], points.map((point) => [point.t, point.controlV, point.alphaDeg]));
}

export function readingsCsv(checks: readonly ReadingCheck[]): string {
  return formatCsvTable(
    ['reading', 'label', 'measured', 'design', 'tolerance', 'unit', 'verdict', 'note'],
    checks.map((check) => [check.key, check.label, check.measured, check.expected, check.toleranceAbs, check.unit, check.verdict ?? 'not measured', check.note]),
  );
}
