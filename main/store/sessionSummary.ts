/**
 * A session's one-line figures, computed in SQL from its cycles and transfer points, and stored on the session row
 * when it ends (closed or interrupted) so listing a logbook of long sessions stays quick.
 * Definitions follow the analysis summary (app/bench/readings.ts): ramp peak is the median of the per-cycle peaks,
 * alpha the mean; alpha gain and offset are the least-squares line of alpha against control voltage.
 */
import type { SessionFigures, SessionSignOff, SessionStatus, TransferFitRecord } from './logbookTypes';
import { recordedFiguresOf } from './recordedFigures';
import type { SqliteDatabase } from './openDatabase';

export interface SessionTotals {
  cycles: number;
  alphaDeg: number | null;
  rampPeakV: number | null;
}

export function medianRampPeak(db: SqliteDatabase, sessionId: number): number | null {
  const count = (db.prepare('SELECT count(*) AS n FROM cycles WHERE session_id = ? AND ramp_peak_v IS NOT NULL').get(sessionId) as { n: number }).n;
  if (count === 0) return null;
  const middle = db
    .prepare('SELECT ramp_peak_v AS v FROM cycles WHERE session_id = ? AND ramp_peak_v IS NOT NULL ORDER BY ramp_peak_v LIMIT ? OFFSET ?')
    .all(sessionId, count % 2 === 0 ? 2 : 1, Math.floor((count - 1) / 2)) as Array<{ v: number }>;
  return middle.reduce((sum, row) => sum + row.v, 0) / middle.length;
}

export function computeSessionTotals(db: SqliteDatabase, sessionId: number): SessionTotals {
  const row = db.prepare('SELECT count(*) AS cycles, avg(alpha_deg) AS alpha FROM cycles WHERE session_id = ?').get(sessionId) as {
    cycles: number;
    alpha: number | null;
  };
  return { cycles: row.cycles, alphaDeg: row.alpha, rampPeakV: medianRampPeak(db, sessionId) };
}

/** Ends a session: its status, end time and the cached totals, in one statement. */
export function storeSessionSummary(db: SqliteDatabase, sessionId: number, status: Exclude<SessionStatus, 'open'>, endedAtMs: number): void {
  const totals = computeSessionTotals(db, sessionId);
  db.prepare(
    `UPDATE sessions SET status = ?, ended_at_ms = ?, cycle_count = ?, alpha_mean_deg = ?, ramp_peak_median_v = ?,
       writer_host = NULL, writer_pid = NULL WHERE id = ?`,
  ).run(status, endedAtMs, totals.cycles, totals.alphaDeg, totals.rampPeakV, sessionId);
}

/** A closed session's sign-off: plain, or with the written reason and the steps excepted (schema migration 3). */
export function storeSignOff(db: SqliteDatabase, sessionId: number, signOff: SessionSignOff): void {
  const excepted = signOff.kind === 'signed-off-with-exceptions';
  db.prepare('UPDATE sessions SET sign_off = ?, sign_off_reason = ?, sign_off_exceptions_json = ? WHERE id = ?').run(
    signOff.kind, excepted ? signOff.reason : null, excepted ? JSON.stringify(signOff.exceptions) : null, sessionId,
  );
}

interface LineSums {
  n: number;
  sx: number | null;
  sy: number | null;
  sxx: number | null;
  sxy: number | null;
  minX: number | null;
  maxX: number | null;
}

/** Least squares y = gain x + offset from running sums (common practice; the normal equations). */
function lineFromSums(sums: LineSums): { gain: number; offset: number } | null {
  if (sums.n < 2 || sums.sx === null || sums.sy === null || sums.sxx === null || sums.sxy === null) return null;
  const denominator = sums.n * sums.sxx - sums.sx * sums.sx;
  if (!(Math.abs(denominator) > 1e-12 * Math.max(1, sums.n * sums.sxx))) return null;
  const gain = (sums.n * sums.sxy - sums.sx * sums.sy) / denominator;
  return { gain, offset: (sums.sy - gain * sums.sx) / sums.n };
}

/**
 * Least-squares line of a session's transfer points, which are only recorded during the sweep steps (the settled
 * board, benchSession.ts); null without them. `wholeSession` takes every cycle's (control, alpha) pair instead.
 */
export function transferFit(db: SqliteDatabase, sessionId: number, options: { wholeSession?: boolean } = {}): TransferFitRecord | null {
  const table = options.wholeSession ? 'cycles' : 'transfer_points';
  const where = `session_id = ? AND control_v IS NOT NULL AND alpha_deg IS NOT NULL`;
  const sums = db
    .prepare(
      `SELECT count(*) AS n, sum(control_v) AS sx, sum(alpha_deg) AS sy, sum(control_v * control_v) AS sxx,
         sum(control_v * alpha_deg) AS sxy, min(control_v) AS minX, max(control_v) AS maxX FROM ${table} WHERE ${where}`,
    )
    .get(sessionId) as LineSums;
  const line = lineFromSums(sums);
  if (!line) return null;
  const deviation = db
    .prepare(`SELECT max(abs(alpha_deg - (? * control_v + ?))) AS d FROM ${table} WHERE ${where}`)
    .get(line.gain, line.offset, sessionId) as { d: number };
  return { gainDegPerV: line.gain, offsetDeg: line.offset, maxDeviationDeg: deviation.d, controlMinV: sums.minX ?? 0, controlMaxV: sums.maxX ?? 0, points: sums.n };
}

export function sessionFigures(db: SqliteDatabase, sessionId: number): SessionFigures | null {
  const session = db.prepare('SELECT started_at_ms AS startedAtMs, steps_json AS stepsJson, readings_json AS readingsJson FROM sessions WHERE id = ?').get(sessionId) as
    | { startedAtMs: number; stepsJson: string | null; readingsJson: string | null }
    | undefined;
  if (!session) return null;
  const row = db
    .prepare(
      `SELECT count(*) AS cycles, avg(slope_v_per_ms) AS slope, avg(alpha_deg) AS alpha, count(alpha_deg) AS alphaCount,
         sum(alpha_deg * alpha_deg) AS alphaSquares FROM cycles WHERE session_id = ?`,
    )
    .get(sessionId) as { cycles: number; slope: number | null; alpha: number | null; alphaCount: number; alphaSquares: number | null };
  // Sample standard deviation (n - 1), from the sums.
  let alphaSpreadDeg: number | null = null;
  if (row.alpha !== null && row.alphaSquares !== null && row.alphaCount > 1) {
    const variance = (row.alphaSquares - row.alphaCount * row.alpha * row.alpha) / (row.alphaCount - 1);
    alphaSpreadDeg = Math.sqrt(Math.max(0, variance));
  }
  const recorded = recordedFiguresOf(session);
  // The transfer line as recorded: the transfer step's, else (sessions from before steps were kept) the line through
  // the transfer points, which are of the settled board too.
  const fit = recorded.alphaGainDegPerV === null ? transferFit(db, sessionId) : null;
  return {
    sessionId,
    startedAt: new Date(session.startedAtMs).toISOString(),
    cycles: row.cycles,
    ...recorded,
    alphaGainDegPerV: recorded.alphaGainDegPerV ?? fit?.gainDegPerV ?? null,
    alphaOffsetDeg: recorded.alphaOffsetDeg ?? fit?.offsetDeg ?? null,
    wholeSession: { rampPeakMedianV: medianRampPeak(db, sessionId), slopeMeanVPerMs: row.slope, alphaMeanDeg: row.alpha, alphaSpreadDeg },
  };
}
