/**
 * Logbook records as the contract shapes them: session rows, a session's detail (its steps as they were recorded;
 * for sessions stored before steps were kept, recomputed from the readings stored with it, against the design
 * version it used), comparisons and drift.
 */
import type { CaptureReadings } from '../../app/bench/readings';
import type { DriftPoint, SessionComparison, SessionDetail, SessionRow, StepReport } from '../../app/contract';
import { BenchFault, parseStepReports } from '../../app/contract';
import type { Logbook, SessionDetail as StoredDetail, SessionRow as StoredRow } from '../store/logbookTypes';
import type { DesignCatalog } from './designCatalog';
import { stepReports } from './steps';

export function sessionRowView(row: StoredRow): SessionRow {
  return { ...row };
}

async function stepsOf(detail: StoredDetail, designs: DesignCatalog): Promise<StepReport[]> {
  const recorded = parseStepReports(detail.stepsJson);
  if (recorded !== null) return recorded;
  const readings: CaptureReadings | null = detail.readings;
  if (!readings) return [];
  const stored = await designs.get(detail.row.designName, detail.row.designVersion).catch(() => designs.get(detail.row.designName).catch(() => null));
  if (!stored) return [];
  // The readings' own fit carries its thinning estimate; the logbook's fit record has none (taken as 0).
  const fit = readings.transfer ?? (detail.transfer.fit ? { ...detail.transfer.fit, thinningErrorDeg: 0 } : null);
  const inputs = {
    design: stored.design,
    window: readings,
    transferFit: fit,
    extremes: { alphaMinDeg: readings.pulse.alphaMinDeg, alphaMaxDeg: readings.pulse.alphaMaxDeg, controlMinV: fit?.controlMinV ?? null, controlMaxV: fit?.controlMaxV ?? null, cycles: readings.firingIntervals, cyclesBelowRange: 0 },
    recorded: {},
    recheckNeeded: false,
    trimsApplied: detail.trims.length,
    signedOff: detail.row.outcome === 'signed-off' || detail.row.outcome === 'signed-off-with-exceptions',
  };
  return stepReports(inputs).map((report) => ({ ...report, status: 'done' as const }));
}

export async function sessionDetailView(logbook: Logbook, designs: DesignCatalog, sessionId: number): Promise<SessionDetail> {
  const detail = await logbook.session(sessionId);
  if (!detail) throw new BenchFault('not-found', `there is no session ${sessionId} in the logbook`, 'sessionId');
  return {
    row: sessionRowView(detail.row),
    notes: detail.notes,
    steps: await stepsOf(detail, designs),
    transfer: { points: detail.transfer.points, fit: detail.transfer.fit },
    trims: detail.trims.map((trim) => ({ id: trim.id, part: trim.part, fromOhm: trim.fromOhm, toOhm: trim.toOhm, reason: trim.reason, at: trim.at })),
    partMeasurements: detail.partMeasurements.map(({ part, value, designValue, at }) => ({ part, value, designValue, at })),
    linkEvents: detail.linkEvents.map((event) => ({ at: event.at, kind: event.kind, detail: event.count > 1 ? `${event.detail} (${event.count} times)` : event.detail })),
    perCycle: await logbook.cycleReadings(sessionId, { maxRows: 400 }),
    captures: detail.captures.map((capture) => ({ id: capture.id, startS: capture.startS, seconds: capture.seconds, label: capture.label })),
  };
}

export async function compareView(logbook: Logbook, aId: number, bId: number): Promise<SessionComparison> {
  for (const id of [aId, bId]) {
    if (!(await logbook.session(id))) throw new BenchFault('not-found', `there is no session ${id} in the logbook`, 'sessionId');
  }
  const comparison = await logbook.compareSessions(aId, bId);
  return {
    a: sessionRowView(comparison.a),
    b: sessionRowView(comparison.b),
    rows: comparison.rows.map((row) => ({ ...row, key: String(row.key) })),
    transferA: comparison.transferA,
    transferB: comparison.transferB,
  };
}

export async function driftView(logbook: Logbook, unitSerial: string): Promise<{ unitSerial: string; points: DriftPoint[] }> {
  const drift = await logbook.unitDrift(unitSerial);
  const outcomeOf = new Map((await logbook.listSessions({ unitSerial })).map((row) => [row.id, row.outcome]));
  return {
    unitSerial,
    points: drift.points.map((point) => ({
      sessionId: point.sessionId,
      startedAt: point.startedAt,
      outcome: outcomeOf.get(point.sessionId) ?? 'open',
      rampPeakV: point.rampPeakV,
      slopeVPerMs: point.slopeVPerMs,
      alphaGainDegPerV: point.alphaGainDegPerV,
      alphaOffsetDeg: point.alphaOffsetDeg,
      alphaJitterDeg: point.alphaJitterDeg,
    })),
  };
}
