/**
 * A session's one-line figures, computed in SQL from its cycles and transfer points, and stored on the session row
 * when it ends (closed or interrupted) so listing a logbook of long sessions stays quick.
 * Definitions follow the analysis summary (app/bench/readings.ts): ramp peak is the median of the per-cycle peaks,
 * alpha the mean; alpha gain and offset are the least-squares line of alpha against control voltage.
 * Query programs (sqlProgram.ts): the same SQL on SQLite and PostgreSQL.
 */
import type { SessionFigures, SessionSignOff, SessionStatus, TransferFitRecord } from './logbookTypes';
import { recordedFiguresOf } from './recordedFigures';
import { get, run, all, type SqlProgram } from './sqlProgram';

export interface SessionTotals {
  cycles: number;
  alphaDeg: number | null;
  rampPeakV: number | null;
}

export function* medianRampPeak(sessionId: number): SqlProgram<number | null> {
  const counted = yield* get<{ n: number }>('SELECT count(*) AS "n" FROM cycles WHERE session_id = ? AND ramp_peak_v IS NOT NULL', [sessionId]);
  const count = counted?.n ?? 0;
  if (count === 0) return null;
  const middle = yield* all<{ v: number }>(
    'SELECT ramp_peak_v AS "v" FROM cycles WHERE session_id = ? AND ramp_peak_v IS NOT NULL ORDER BY ramp_peak_v LIMIT ? OFFSET ?',
    [sessionId, count % 2 === 0 ? 2 : 1, Math.floor((count - 1) / 2)],
  );
  return middle.reduce((sum, row) => sum + row.v, 0) / middle.length;
}

export function* computeSessionTotals(sessionId: number): SqlProgram<SessionTotals> {
  const row = (yield* get<{ cycles: number; alpha: number | null }>('SELECT count(*) AS "cycles", avg(alpha_deg) AS "alpha" FROM cycles WHERE session_id = ?', [sessionId])) ?? { cycles: 0, alpha: null };
  return { cycles: row.cycles, alphaDeg: row.alpha, rampPeakV: yield* medianRampPeak(sessionId) };
}

/** Ends a session: its status, end time and the cached totals, in one statement. */
export function* storeSessionSummary(sessionId: number, status: Exclude<SessionStatus, 'open'>, endedAtMs: number): SqlProgram<void> {
  const totals = yield* computeSessionTotals(sessionId);
  yield* run(
    `UPDATE sessions SET status = ?, ended_at_ms = ?, cycle_count = ?, alpha_mean_deg = ?, ramp_peak_median_v = ?,
       writer_host = NULL, writer_pid = NULL WHERE id = ?`,
    [status, endedAtMs, totals.cycles, totals.alphaDeg, totals.rampPeakV, sessionId],
  );
}

/**
 * A closed session's sign-off: plain, or with the written reason and the steps excepted (schema migration 4).
 * Written while the session is still open, before `storeSessionSummary` ends it: a shared logbook never changes a
 * finished session (postgres/pgSchema.ts).
 */
export function* storeSignOff(sessionId: number, signOff: SessionSignOff): SqlProgram<void> {
  const excepted = signOff.kind === 'signed-off-with-exceptions';
  yield* run('UPDATE sessions SET sign_off = ?, sign_off_reason = ?, sign_off_exceptions_json = ? WHERE id = ?', [
    signOff.kind, excepted ? signOff.reason : null, excepted ? JSON.stringify(signOff.exceptions) : null, sessionId,
  ]);
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
export function* transferFit(sessionId: number, options: { wholeSession?: boolean } = {}): SqlProgram<TransferFitRecord | null> {
  const table = options.wholeSession ? 'cycles' : 'transfer_points';
  const where = `session_id = ? AND control_v IS NOT NULL AND alpha_deg IS NOT NULL`;
  const sums = yield* get<LineSums>(
    `SELECT count(*) AS "n", sum(control_v) AS "sx", sum(alpha_deg) AS "sy", sum(control_v * control_v) AS "sxx",
       sum(control_v * alpha_deg) AS "sxy", min(control_v) AS "minX", max(control_v) AS "maxX" FROM ${table} WHERE ${where}`,
    [sessionId],
  );
  const line = sums ? lineFromSums(sums) : null;
  if (!sums || !line) return null;
  const deviation = yield* get<{ d: number }>(`SELECT max(abs(alpha_deg - (? * control_v + ?))) AS "d" FROM ${table} WHERE ${where}`, [line.gain, line.offset, sessionId]);
  return { gainDegPerV: line.gain, offsetDeg: line.offset, maxDeviationDeg: deviation?.d ?? 0, controlMinV: sums.minX ?? 0, controlMaxV: sums.maxX ?? 0, points: sums.n };
}

export function* sessionFigures(sessionId: number): SqlProgram<SessionFigures | null> {
  const session = yield* get<{ startedAtMs: number; stepsJson: string | null; readingsJson: string | null }>(
    'SELECT started_at_ms AS "startedAtMs", steps_json AS "stepsJson", readings_json AS "readingsJson" FROM sessions WHERE id = ?',
    [sessionId],
  );
  if (!session) return null;
  const row = (yield* get<{ cycles: number; slope: number | null; alpha: number | null; alphaCount: number; alphaSquares: number | null }>(
    `SELECT count(*) AS "cycles", avg(slope_v_per_ms) AS "slope", avg(alpha_deg) AS "alpha", count(alpha_deg) AS "alphaCount",
       sum(alpha_deg * alpha_deg) AS "alphaSquares" FROM cycles WHERE session_id = ?`,
    [sessionId],
  )) as { cycles: number; slope: number | null; alpha: number | null; alphaCount: number; alphaSquares: number | null };
  // Sample standard deviation (n - 1), from the sums: over a session this is a sweep's spread, not jitter.
  let alphaSpreadDeg: number | null = null;
  if (row.alpha !== null && row.alphaSquares !== null && row.alphaCount > 1) {
    const variance = (row.alphaSquares - row.alphaCount * row.alpha * row.alpha) / (row.alphaCount - 1);
    alphaSpreadDeg = Math.sqrt(Math.max(0, variance));
  }
  const recorded = recordedFiguresOf(session);
  // The transfer line as recorded: the transfer step's, else (sessions from before steps were kept) the line through
  // the transfer points, which are of the settled board too.
  const fit = recorded.alphaGainDegPerV === null ? yield* transferFit(sessionId) : null;
  return {
    sessionId,
    startedAt: new Date(session.startedAtMs).toISOString(),
    cycles: row.cycles,
    ...recorded,
    alphaGainDegPerV: recorded.alphaGainDegPerV ?? fit?.gainDegPerV ?? null,
    alphaOffsetDeg: recorded.alphaOffsetDeg ?? fit?.offsetDeg ?? null,
    wholeSession: { rampPeakMedianV: yield* medianRampPeak(sessionId), slopeMeanVPerMs: row.slope, alphaMeanDeg: row.alpha, alphaSpreadDeg },
  };
}
