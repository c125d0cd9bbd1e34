/**
 * Two sessions side by side, and a unit's drift across its sessions. Query programs (sqlProgram.ts), the same on
 * both stores.
 */
import { InputError } from '../../app/errors';
import { driftTrend } from './driftTrend';
import { comparisonRows } from './comparisonRows';
import type { SessionComparison, SessionFigures, UnitDrift } from './logbookTypes';
import { readSessionRow, transferCurve } from './sessionQueries';
import { sessionFigures } from './sessionSummary';
import { parseStoredDesign } from './storedContent';
import { all, get, type SqlProgram } from './sqlProgram';

export function* compareSessions(aId: number, bId: number, location: string): SqlProgram<SessionComparison> {
  const rowA = yield* readSessionRow(aId, location);
  const rowB = yield* readSessionRow(bId, location);
  const a = (yield* sessionFigures(aId)) as SessionFigures;
  const b = (yield* sessionFigures(bId)) as SessionFigures;
  const designJson = ((yield* get<{ json: string }>('SELECT d.design_json AS "json" FROM sessions s JOIN board_designs d ON d.id = s.design_id WHERE s.id = ?', [aId])) as { json: string }).json;
  const design = parseStoredDesign(designJson, `${location}: session ${aId}`);
  return {
    a: rowA,
    b: rowB,
    rows: comparisonRows(a, b, design),
    transferA: yield* transferCurve(aId),
    transferB: yield* transferCurve(bId),
  };
}

export function* unitDrift(unitSerial: string, location: string): SqlProgram<UnitDrift> {
  const known = yield* get('SELECT 1 AS "one" FROM units WHERE serial = ?', [unitSerial]);
  if (!known) throw new InputError(`there is no unit "${unitSerial}" in this logbook`, location);
  const ids = yield* all<{ id: number }>('SELECT s.id FROM sessions s JOIN units u ON u.id = s.unit_id WHERE u.serial = ? ORDER BY s.started_at_ms, s.id', [unitSerial]);
  const points: SessionFigures[] = [];
  for (const { id } of ids) points.push((yield* sessionFigures(id)) as SessionFigures);
  const series = (pick: (figures: SessionFigures) => number | null) => points.map((point) => ({ atMs: Date.parse(point.startedAt), value: pick(point) }));
  return {
    unit: unitSerial,
    points,
    rampPeakV: driftTrend(series((point) => point.rampPeakV)),
    alphaGainDegPerV: driftTrend(series((point) => point.alphaGainDegPerV)),
  };
}
