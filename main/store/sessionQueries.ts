/**
 * Reading sessions: rows with their figures, a session's detail, its transfer curve, thinned cycles and stored
 * captures, the units. Query programs (sqlProgram.ts): the same SQL on SQLite and PostgreSQL.
 */
import { z } from 'zod';
import type { SignalRole } from '../../app/capture/samples';
import { signOffExceptionSchema, type SignOffException } from '../../app/contract/records';
import { InputError } from '../../app/errors';
import { decodeCapture } from './captureCodec';
import type { CaptureInfo, CycleRecord, LinkEventKind, SessionDetail, SessionFilter, SessionRow, StoredCapture, TransferPointRecord, UnitRecord } from './logbookTypes';
import { linkErrorKinds } from './logbookTypes';
import { recordedFiguresOf } from './recordedFigures';
import { computeSessionTotals, transferFit } from './sessionSummary';
import { parseStoredReadings } from './storedContent';
import { all, get, type SqlProgram, type SqlValue } from './sqlProgram';

export const iso = (ms: number): string => new Date(ms).toISOString();

function parseInstant(text: string, field: string): number {
  const ms = Date.parse(text);
  if (Number.isNaN(ms)) throw new InputError(`"${text}" is not a date or time (use ISO 8601, e.g. 2026-03-01 or 2026-03-01T09:30:00Z)`, field);
  return ms;
}

interface SessionJoinRow {
  id: number;
  unit: string;
  designName: string;
  designVersion: number;
  operator: string;
  status: SessionRow['status'];
  startedAtMs: number;
  endedAtMs: number | null;
  cycleCount: number | null;
  alphaMean: number | null;
  rampPeakMedian: number | null;
  linkErrors: number;
  linkSilentMs: number;
  bench: string | null;
  sharedAtMs: number | null;
  signOff: 'signed-off' | 'signed-off-with-exceptions' | null;
  signOffReason: string | null;
  signOffExceptionsJson: string | null;
  stepsJson: string | null;
  readingsJson: string | null;
}

const errorKindsSql = linkErrorKinds.map((kind) => `'${kind}'`).join(', ');
const sessionSelect = `
  SELECT s.id, u.serial AS "unit", d.name AS "designName", d.version AS "designVersion", s.operator, s.status,
    s.started_at_ms AS "startedAtMs", s.ended_at_ms AS "endedAtMs", s.cycle_count AS "cycleCount",
    s.alpha_mean_deg AS "alphaMean", s.ramp_peak_median_v AS "rampPeakMedian", s.bench,
    s.sign_off AS "signOff", s.sign_off_reason AS "signOffReason", s.sign_off_exceptions_json AS "signOffExceptionsJson",
    s.steps_json AS "stepsJson", s.readings_json AS "readingsJson",
    (SELECT coalesce(sum(count), 0) FROM link_events e WHERE e.session_id = s.id AND e.kind IN (${errorKindsSql})) AS "linkErrors",
    (SELECT coalesce(sum(count), 0) FROM link_events e WHERE e.session_id = s.id AND e.kind = 'link-silent') AS "linkSilentMs",
    (SELECT max(shared_at_ms) FROM shared_copies c WHERE c.session_id = s.id) AS "sharedAtMs"
  FROM sessions s JOIN units u ON u.id = s.unit_id JOIN board_designs d ON d.id = s.design_id`;

function* toRow(row: SessionJoinRow): SqlProgram<SessionRow> {
  // Ended sessions carry cached totals; an open one is counted now.
  const totals = row.cycleCount === null ? yield* computeSessionTotals(row.id) : { cycles: row.cycleCount, alphaDeg: row.alphaMean, rampPeakV: row.rampPeakMedian };
  // The row's figures are the board as recorded at its steps; the whole session's are kept apart.
  const recorded = recordedFiguresOf(row);
  return {
    id: row.id, unit: row.unit, designName: row.designName, designVersion: row.designVersion, operator: row.operator, status: row.status,
    outcome: row.status === 'closed' && row.signOff !== null ? row.signOff : row.status,
    signOffReason: row.signOffReason, signOffExceptions: parseSignOffExceptions(row.signOffExceptionsJson),
    startedAt: iso(row.startedAtMs), endedAt: row.endedAtMs === null ? null : iso(row.endedAtMs),
    cycles: totals.cycles, rampPeakV: recorded.rampPeakV, alphaMinDeg: recorded.alphaMinDeg, alphaMaxDeg: recorded.alphaMaxDeg,
    wholeSession: { rampPeakMedianV: totals.rampPeakV, alphaMeanDeg: totals.alphaDeg }, linkErrors: row.linkErrors, linkSilentS: Number(row.linkSilentMs) / 1000,
    bench: row.bench, sharedAt: row.sharedAtMs === null ? null : iso(row.sharedAtMs),
  };
}

/** The stored exceptions of a sign-off; a list that does not read (a foreign edit) is kept as one line saying so. */
function parseSignOffExceptions(json: string | null): SignOffException[] {
  if (json === null) return [];
  let stored: unknown;
  try {
    stored = JSON.parse(json);
  } catch {
    stored = null;
  }
  const parsed = z.array(signOffExceptionSchema).safeParse(stored);
  return parsed.success ? parsed.data : [{ step: 'sign-off', problem: 'not-recorded', readings: [`the stored list of exceptions does not read: ${json.slice(0, 200)}`] }];
}

export function* findSessionRow(id: number): SqlProgram<SessionRow | null> {
  const row = yield* get<SessionJoinRow>(`${sessionSelect} WHERE s.id = ?`, [id]);
  return row ? yield* toRow(row) : null;
}

/** The session's row; InputError naming `location` when there is none. */
export function* readSessionRow(id: number, location: string): SqlProgram<SessionRow> {
  const row = yield* findSessionRow(id);
  if (!row) throw new InputError(`there is no session ${id} in this logbook`, location);
  return row;
}

export function* listUnits(): SqlProgram<UnitRecord[]> {
  const rows = yield* all<{ serial: string; designName: string | null; sessions: number; lastMs: number | null }>(
    `SELECT u.serial, u.design_name AS "designName", count(s.id) AS "sessions", max(s.started_at_ms) AS "lastMs"
     FROM units u LEFT JOIN sessions s ON s.unit_id = u.id GROUP BY u.id, u.serial, u.design_name ORDER BY u.serial`,
  );
  return rows.map((row): UnitRecord => ({ serial: row.serial, designName: row.designName, sessions: row.sessions, lastSessionAt: row.lastMs === null ? null : iso(row.lastMs) }));
}

export function* listSessions(filter: SessionFilter = {}): SqlProgram<SessionRow[]> {
  const clauses: string[] = [];
  const parameters: SqlValue[] = [];
  if (filter.unitSerial !== undefined) {
    clauses.push('u.serial = ?');
    parameters.push(filter.unitSerial);
  }
  if (filter.designName !== undefined) {
    clauses.push('d.name = ?');
    parameters.push(filter.designName);
  }
  if (filter.from !== undefined) {
    clauses.push('s.started_at_ms >= ?');
    parameters.push(parseInstant(filter.from, 'from'));
  }
  if (filter.to !== undefined) {
    clauses.push('s.started_at_ms < ?');
    parameters.push(parseInstant(filter.to, 'to'));
  }
  const where = clauses.length > 0 ? ` WHERE ${clauses.join(' AND ')}` : '';
  const rows =
    filter.newest === undefined
      ? yield* all<SessionJoinRow>(`${sessionSelect}${where} ORDER BY s.started_at_ms, s.id`, parameters)
      : yield* all<SessionJoinRow>(`SELECT * FROM (${sessionSelect}${where} ORDER BY s.started_at_ms DESC, s.id DESC LIMIT ?) newest ORDER BY "startedAtMs", id`, [...parameters, filter.newest]);
  const result: SessionRow[] = [];
  for (const row of rows) result.push(yield* toRow(row));
  return result;
}

export function* transferCurve(sessionId: number): SqlProgram<TransferPointRecord[]> {
  return yield* all<TransferPointRecord>('SELECT t_s AS "t", control_v AS "controlV", alpha_deg AS "alphaDeg" FROM transfer_points WHERE session_id = ? ORDER BY seq', [sessionId]);
}

/** The session's per-cycle readings in order, thinned evenly to at most `maxRows`. */
export function* cycleReadings(sessionId: number, maxRows?: number): SqlProgram<CycleRecord[]> {
  const n = (yield* get<{ n: number }>('SELECT count(*) AS "n" FROM cycles WHERE session_id = ?', [sessionId]))?.n ?? 0;
  const every = Math.max(1, Math.ceil(n / Math.max(1, maxRows ?? n)));
  return yield* all<CycleRecord>(
    'SELECT t_s AS "t", alpha_deg AS "alphaDeg", ramp_peak_v AS "rampPeakV", control_v AS "controlV" FROM cycles WHERE session_id = ? AND seq % ? = 0 ORDER BY seq',
    [sessionId, every],
  );
}

function* captureInfos(where: 'session_id' | 'id', value: number): SqlProgram<CaptureInfo[]> {
  const rows = yield* all<{ id: number; label: string | null; startS: number; n: number; sampleRateHz: number; roles: string; startedAtMs: number; sha256: string }>(
    `SELECT id, label, start_s AS "startS", samples_per_channel AS "n", sample_rate_hz AS "sampleRateHz", roles, started_at_ms AS "startedAtMs", sha256
     FROM captures WHERE ${where} = ? ORDER BY id`,
    [value],
  );
  return rows.map((row) => ({
    id: row.id, label: row.label, startS: row.startS, seconds: row.n / row.sampleRateHz, sampleRateHz: row.sampleRateHz,
    roles: JSON.parse(row.roles) as SignalRole[], startedAt: iso(row.startedAtMs), sha256: row.sha256,
  }));
}

export function* readCapture(captureId: number, location: string): SqlProgram<StoredCapture | null> {
  const [info] = yield* captureInfos('id', captureId);
  if (!info) return null;
  const stored = (yield* get<{ n: number; afterGap: number; data: Uint8Array }>('SELECT samples_per_channel AS "n", after_gap AS "afterGap", data FROM captures WHERE id = ?', [captureId])) as {
    n: number; afterGap: number; data: Uint8Array;
  };
  const block = decodeCapture({
    roles: info.roles, samplesPerChannel: stored.n, sha256: info.sha256, data: stored.data, startS: info.startS, sampleRateHz: info.sampleRateHz,
    afterGap: stored.afterGap === 1, where: `${location}: capture ${captureId}`,
  });
  return { info, block };
}

/** `location` names the logbook in the message when the stored readings are not sound (storedContent.ts). */
export function* sessionDetail(id: number, location = 'logbook'): SqlProgram<SessionDetail | null> {
  const row = yield* findSessionRow(id);
  if (!row) return null;
  const extra = (yield* get<{ notes: string | null; readings: string | null; steps: string | null; designId: number }>(
    'SELECT notes, readings_json AS "readings", steps_json AS "steps", design_id AS "designId" FROM sessions WHERE id = ?',
    [id],
  )) as { notes: string | null; readings: string | null; steps: string | null; designId: number };
  const trims = yield* all<{ id: number; part: string; fromOhm: number; toOhm: number; method: string; reason: string; atMs: number }>(
    'SELECT id, part, from_ohm AS "fromOhm", to_ohm AS "toOhm", method, reason, at_ms AS "atMs" FROM trims WHERE session_id = ? ORDER BY at_ms, id',
    [id],
  );
  const measurements = yield* all<{ part: string; value: number; designValue: number; atMs: number }>(
    'SELECT part, value, design_value AS "designValue", at_ms AS "atMs" FROM part_measurements WHERE session_id = ? ORDER BY at_ms, id',
    [id],
  );
  const events = yield* all<{ kind: LinkEventKind; detail: string; count: number; atMs: number }>(
    'SELECT kind, detail, count, at_ms AS "atMs" FROM link_events WHERE session_id = ? ORDER BY at_ms, id',
    [id],
  );
  return {
    row,
    notes: extra.notes,
    designId: extra.designId,
    readings: extra.readings === null ? null : parseStoredReadings(extra.readings, `${location}: session ${id}`),
    stepsJson: extra.steps,
    transfer: { points: yield* transferCurve(id), fit: yield* transferFit(id) },
    trims: trims.map(({ atMs, ...trim }) => ({ ...trim, at: iso(atMs) })),
    partMeasurements: measurements.map(({ atMs, ...measurement }) => ({ ...measurement, at: iso(atMs) })),
    linkEvents: events.map(({ atMs, ...event }) => ({ ...event, at: iso(atMs) })),
    captures: yield* captureInfos('session_id', id),
  };
}
