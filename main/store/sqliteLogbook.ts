/**
 * The logbook on the bench PC: one SQLite file (better-sqlite3), the embedded default behind the `Logbook` interface.
 * Opening it marks sessions whose writer is gone as interrupted (sessionRecovery.ts).
 */
import { boardDesignSchema, type BoardDesign } from '../../app/board/design';
import type { SignalRole } from '../../app/capture/samples';
import { InputError } from '../../app/errors';
import { decideImport } from './archiveImport';
import { archiveContentHash, canonicalJson, sha256OfText } from './canonicalJson';
import { decodeCapture } from './captureCodec';
import { driftTrend } from './driftTrend';
import type {
  CaptureInfo, ComparisonRow, DesignVersion, LinkEventKind, Logbook, SessionComparison, SessionDetail, SessionFigures, SessionFilter, SessionRow,
  CycleRecord, TransferPointRecord, UnitRecord,
} from './logbookTypes';
import { linkErrorKinds } from './logbookTypes';
import { insertArchiveSession, readArchiveSession, sessionsOfUnitAt } from './exchangeRows';
import { createSqliteLogbookWriter, writerIdentity } from './logbookWriter';
import { openLogbookDatabase, type OpenLogbookDatabaseOptions, type SqliteDatabase } from './openDatabase';
import { latestDesignVersion, latestSessionPerUnit, readDesignVersion } from './recordQueries';
import { recoverInterruptedSessions, writerIsAlive } from './sessionRecovery';
import { removeStaleReserves, takeSpaceReserve } from './spaceReserve';
import { guardStorage, storageInputError } from './storageFaults';
import { parseStoredDesign, parseStoredReadings } from './storedContent';
import { computeSessionTotals, sessionFigures, transferFit } from './sessionSummary';

const iso = (ms: number): string => new Date(ms).toISOString();

function parseInstant(text: string, field: string): number {
  const ms = Date.parse(text);
  if (Number.isNaN(ms)) throw new InputError(`"${text}" is not a date or time (use ISO 8601, e.g. 2026-03-01 or 2026-03-01T09:30:00Z)`, field);
  return ms;
}

interface SessionJoinRow {
  id: number;
  writerHost: string | null;
  writerPid: number | null;
  heartbeatAtMs: number | null;
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
}

const errorKindsSql = linkErrorKinds.map((kind) => `'${kind}'`).join(', ');
const sessionSelect = `
  SELECT s.id, s.writer_host AS writerHost, s.writer_pid AS writerPid, s.heartbeat_at_ms AS heartbeatAtMs, u.serial AS unit, d.name AS designName, d.version AS designVersion, s.operator, s.status,
    s.started_at_ms AS startedAtMs, s.ended_at_ms AS endedAtMs, s.cycle_count AS cycleCount,
    s.alpha_mean_deg AS alphaMean, s.ramp_peak_median_v AS rampPeakMedian,
    (SELECT coalesce(sum(count), 0) FROM link_events e WHERE e.session_id = s.id AND e.kind IN (${errorKindsSql})) AS linkErrors,
    (SELECT coalesce(sum(count), 0) FROM link_events e WHERE e.session_id = s.id AND e.kind = 'link-silent') AS linkSilentMs
  FROM sessions s JOIN units u ON u.id = s.unit_id JOIN board_designs d ON d.id = s.design_id`;

export async function openSqliteLogbook(path: string, options: OpenLogbookDatabaseOptions = {}): Promise<Logbook> {
  return createSqliteLogbook(openLogbookDatabase(path, options), path, { readOnly: options.readOnly });
}

export function createSqliteLogbook(db: SqliteDatabase, location: string, options: { readOnly?: boolean } = {}): Logbook {
  // Opened for reading only, nothing is written: a session whose writer is gone is shown as interrupted (what the
  // next writing opener will store) instead of being marked so.
  if (!options.readOnly) {
    recoverInterruptedSessions(db);
    removeStaleReserves(location);
  }
  const nowMs = Date.now();

  const toRow = (row: SessionJoinRow): SessionRow => {
    // Ended sessions carry cached totals; an open one is counted now.
    const totals = row.cycleCount === null ? computeSessionTotals(db, row.id) : { cycles: row.cycleCount, alphaDeg: row.alphaMean, rampPeakV: row.rampPeakMedian };
    const writerGone = row.status === 'open' && options.readOnly === true && !writerIsAlive({ host: row.writerHost, pid: row.writerPid, heartbeatAtMs: row.heartbeatAtMs }, nowMs);
    return {
      id: row.id, unit: row.unit, designName: row.designName, designVersion: row.designVersion, operator: row.operator, status: writerGone ? 'interrupted' : row.status,
      startedAt: iso(row.startedAtMs), endedAt: row.endedAtMs === null ? null : iso(row.endedAtMs),
      cycles: totals.cycles, alphaDeg: totals.alphaDeg, rampPeakV: totals.rampPeakV, linkErrors: row.linkErrors, linkSilentS: row.linkSilentMs / 1000,
    };
  };
  const readRow = (id: number): SessionRow => {
    const row = db.prepare(`${sessionSelect} WHERE s.id = ?`).get(id) as SessionJoinRow | undefined;
    if (!row) throw new InputError(`there is no session ${id} in this logbook`, location);
    return toRow(row);
  };

  function saveDesignNow(design: BoardDesign): DesignVersion {
    const json = canonicalJson(design);
    const contentHash = sha256OfText(json);
    const select = db.prepare('SELECT id, name, version, content_hash AS contentHash, saved_at_ms AS savedAtMs FROM board_designs WHERE content_hash = ?');
    const found = (): DesignVersion | null => {
      const row = select.get(contentHash) as { id: number; name: string; version: number; contentHash: string; savedAtMs: number } | undefined;
      return row ? { id: row.id, name: row.name, version: row.version, contentHash: row.contentHash, savedAt: iso(row.savedAtMs) } : null;
    };
    return db.transaction(() => {
      const existing = found();
      if (existing) return existing;
      const next = (db.prepare('SELECT coalesce(max(version), 0) + 1 AS v FROM board_designs WHERE name = ?').get(design.name) as { v: number }).v;
      db.prepare('INSERT INTO board_designs (name, version, content_hash, design_json, saved_at_ms) VALUES (?, ?, ?, ?, ?)').run(design.name, next, contentHash, json, Date.now());
      return found() as DesignVersion;
    }).immediate();
  }

  const sessionIdsExist = (ids: number[]): void => {
    for (const id of ids) readRow(id);
  };

  const logbook: Logbook = {
    location,
    async saveDesign(design) {
      return saveDesignNow(boardDesignSchema.parse(design));
    },
    async listUnits() {
      const rows = db
        .prepare(
          `SELECT u.serial, u.design_name AS designName, count(s.id) AS sessions, max(s.started_at_ms) AS lastMs
           FROM units u LEFT JOIN sessions s ON s.unit_id = u.id GROUP BY u.id ORDER BY u.serial`,
        )
        .all() as Array<{ serial: string; designName: string | null; sessions: number; lastMs: number | null }>;
      return rows.map((row): UnitRecord => ({ serial: row.serial, designName: row.designName, sessions: row.sessions, lastSessionAt: row.lastMs === null ? null : iso(row.lastMs) }));
    },
    async startSession(request, writerOptions = {}) {
      const serial = request.unitSerial.trim();
      if (serial === '') throw new InputError('a unit needs a serial number', 'unit');
      // Taken first: a disk too full to hold the reserve is too full for a session that could be ended.
      const reserve = takeSpaceReserve(location);
      let sessionId: number;
      try {
        const design = saveDesignNow(boardDesignSchema.parse(request.design));
        const writer = writerIdentity();
        const startedAtMs = (request.startedAt ?? new Date()).getTime();
        sessionId = db.transaction(() => {
          db.prepare('INSERT INTO units (serial, design_name, created_at_ms) VALUES (?, ?, ?) ON CONFLICT (serial) DO NOTHING').run(serial, design.name, startedAtMs);
          db.prepare('UPDATE units SET design_name = ? WHERE serial = ? AND design_name IS NULL').run(design.name, serial);
          const unitId = (db.prepare('SELECT id FROM units WHERE serial = ?').get(serial) as { id: number }).id;
          const result = db
            .prepare(
              `INSERT INTO sessions (unit_id, design_id, operator, started_at_ms, status, notes, writer_host, writer_pid, heartbeat_at_ms)
               VALUES (?, ?, ?, ?, 'open', ?, ?, ?, ?)`,
            )
            .run(unitId, design.id, request.operator, startedAtMs, request.notes ?? null, writer.host, writer.pid, Date.now());
          return Number(result.lastInsertRowid);
        }).immediate();
      } catch (error) {
        reserve.release();
        throw storageInputError(error, location);
      }
      return createSqliteLogbookWriter(db, sessionId, { ...writerOptions, readRow, location, reserve });
    },
    async listSessions(filter: SessionFilter = {}) {
      const clauses: string[] = [];
      const parameters: Array<string | number> = [];
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
      const rows = db.prepare(`${sessionSelect}${where} ORDER BY s.started_at_ms, s.id`).all(...parameters) as SessionJoinRow[];
      return rows.map(toRow);
    },
    async session(id) {
      const found = db.prepare(`${sessionSelect} WHERE s.id = ?`).get(id) as SessionJoinRow | undefined;
      if (!found) return null;
      const extra = db.prepare('SELECT notes, readings_json AS readings, steps_json AS steps, design_id AS designId FROM sessions WHERE id = ?').get(id) as {
        notes: string | null; readings: string | null; steps: string | null; designId: number;
      };
      const trims = db.prepare('SELECT id, part, from_ohm AS fromOhm, to_ohm AS toOhm, method, reason, at_ms AS atMs FROM trims WHERE session_id = ? ORDER BY at_ms, id').all(id) as Array<{
        id: number; part: string; fromOhm: number; toOhm: number; method: string; reason: string; atMs: number;
      }>;
      const measurements = db.prepare('SELECT part, value, design_value AS designValue, at_ms AS atMs FROM part_measurements WHERE session_id = ? ORDER BY at_ms, id').all(id) as Array<{
        part: string; value: number; designValue: number; atMs: number;
      }>;
      const events = db.prepare('SELECT kind, detail, count, at_ms AS atMs FROM link_events WHERE session_id = ? ORDER BY at_ms, id').all(id) as Array<{
        kind: LinkEventKind; detail: string; count: number; atMs: number;
      }>;
      const detail: SessionDetail = {
        row: toRow(found),
        notes: extra.notes,
        designId: extra.designId,
        readings: extra.readings === null ? null : parseStoredReadings(extra.readings, `${location}: session ${id}`),
        stepsJson: extra.steps,
        transfer: { points: await this.transferCurve(id), fit: transferFit(db, id) },
        trims: trims.map(({ atMs, ...trim }) => ({ ...trim, at: iso(atMs) })),
        partMeasurements: measurements.map(({ atMs, ...measurement }) => ({ ...measurement, at: iso(atMs) })),
        linkEvents: events.map(({ atMs, ...event }) => ({ ...event, at: iso(atMs) })),
        captures: captureInfos(db, 'session_id = ?', id),
      };
      return detail;
    },
    async transferCurve(sessionId) {
      return db.prepare('SELECT t_s AS t, control_v AS controlV, alpha_deg AS alphaDeg FROM transfer_points WHERE session_id = ? ORDER BY seq').all(sessionId) as TransferPointRecord[];
    },
    async cycleReadings(sessionId, options = {}) {
      const { n } = db.prepare('SELECT count(*) AS n FROM cycles WHERE session_id = ?').get(sessionId) as { n: number };
      const every = Math.max(1, Math.ceil(n / Math.max(1, options.maxRows ?? n)));
      return db
        .prepare('SELECT t_s AS t, alpha_deg AS alphaDeg, ramp_peak_v AS rampPeakV, control_v AS controlV FROM cycles WHERE session_id = ? AND seq % ? = 0 ORDER BY seq')
        .all(sessionId, every) as CycleRecord[];
    },
    async readCapture(captureId) {
      const [info] = captureInfos(db, 'id = ?', captureId);
      if (!info) return null;
      const stored = db.prepare('SELECT samples_per_channel AS n, after_gap AS afterGap, data FROM captures WHERE id = ?').get(captureId) as { n: number; afterGap: number; data: Buffer };
      const block = decodeCapture({
        roles: info.roles, samplesPerChannel: stored.n, sha256: info.sha256, data: stored.data, startS: info.startS, sampleRateHz: info.sampleRateHz,
        afterGap: stored.afterGap === 1, where: `${location}: capture ${captureId}`,
      });
      return { info, block };
    },
    async sessionFigures(sessionId) {
      return sessionFigures(db, sessionId);
    },
    async compareSessions(aId, bId) {
      sessionIdsExist([aId, bId]);
      const a = sessionFigures(db, aId) as SessionFigures;
      const b = sessionFigures(db, bId) as SessionFigures;
      const designJson = (db.prepare('SELECT d.design_json AS json FROM sessions s JOIN board_designs d ON d.id = s.design_id WHERE s.id = ?').get(aId) as { json: string }).json;
      const design = parseStoredDesign(designJson, `${location}: session ${aId}`);
      const rampToleranceV = (design.tolerances.rampPeakPct / 100) * design.rampTargetV;
      const row = (key: ComparisonRow['key'], label: string, unit: string, toleranceAbs: number | null): ComparisonRow => {
        const difference = a[key] !== null && b[key] !== null ? (b[key] as number) - (a[key] as number) : null;
        return { key, label, unit, a: a[key], b: b[key], difference, beyondTolerance: toleranceAbs !== null && difference !== null && Math.abs(difference) > toleranceAbs };
      };
      const result: SessionComparison = {
        a: readRow(aId),
        b: readRow(bId),
        rows: [
          row('rampPeakV', 'Ramp peak', 'V', rampToleranceV),
          row('slopeVPerMs', 'Ramp slope', 'V/ms', null),
          row('alphaDeg', 'Firing angle (mean)', 'deg', design.tolerances.alphaDeg),
          row('alphaStdDeg', 'Firing jitter', 'deg', null),
          row('alphaGainDegPerV', 'Alpha gain', 'deg/V', null),
          row('alphaOffsetDeg', 'Alpha offset', 'deg', design.tolerances.alphaDeg),
          row('cycles', 'Cycles', '', null),
        ],
        transferA: await this.transferCurve(aId),
        transferB: await this.transferCurve(bId),
      };
      return result;
    },
    async unitDrift(unitSerial) {
      const ids = db.prepare('SELECT s.id FROM sessions s JOIN units u ON u.id = s.unit_id WHERE u.serial = ? ORDER BY s.started_at_ms, s.id').all(unitSerial) as Array<{ id: number }>;
      const known = db.prepare('SELECT 1 FROM units WHERE serial = ?').get(unitSerial);
      if (!known) throw new InputError(`there is no unit "${unitSerial}" in this logbook`, location);
      const points = ids.map(({ id }) => sessionFigures(db, id) as SessionFigures);
      const series = (pick: (figures: SessionFigures) => number | null) => points.map((point) => ({ atMs: Date.parse(point.startedAt), value: pick(point) }));
      return {
        unit: unitSerial,
        points,
        rampPeakV: driftTrend(series((point) => point.rampPeakV)),
        alphaGainDegPerV: driftTrend(series((point) => point.alphaGainDegPerV)),
      };
    },
    async designVersion(designId) {
      return readDesignVersion(db, designId);
    },
    async latestDesignVersion(designName) {
      return latestDesignVersion(db, designName);
    },
    async latestSessionPerUnit(designName) {
      return latestSessionPerUnit(db, designName);
    },
    async archiveSession(sessionId) {
      return readArchiveSession(db, sessionId);
    },
    async sessionContentHash(sessionId) {
      return archiveContentHash(readArchiveSession(db, sessionId).session);
    },
    async importArchiveSession(request) {
      const { session, captureData, contentSha256 } = request;
      return db.transaction(() => {
        const candidates = sessionsOfUnitAt(db, session.unit.serial, session.record.startedAtMs)
          .map((sessionId) => ({ sessionId, contentSha256: archiveContentHash(readArchiveSession(db, sessionId).session) }));
        const decision = decideImport(request, candidates);
        if (decision.kind === 'present') return { sessionId: decision.sessionId, contentSha256, imported: false };
        return { sessionId: insertArchiveSession(db, session, captureData), contentSha256, imported: true };
      }).immediate();
    },
    async recoverInterruptedSessions() {
      return recoverInterruptedSessions(db);
    },
    async close() {
      if (db.open) db.close();
    },
  };
  return guardStorage(logbook, location);
}

function captureInfos(db: SqliteDatabase, where: string, value: number): CaptureInfo[] {
  const rows = db
    .prepare(
      `SELECT id, label, start_s AS startS, samples_per_channel AS n, sample_rate_hz AS sampleRateHz, roles, started_at_ms AS startedAtMs, sha256
       FROM captures WHERE ${where} ORDER BY id`,
    )
    .all(value) as Array<{ id: number; label: string | null; startS: number; n: number; sampleRateHz: number; roles: string; startedAtMs: number; sha256: string }>;
  return rows.map((row) => ({
    id: row.id, label: row.label, startS: row.startS, seconds: row.n / row.sampleRateHz, sampleRateHz: row.sampleRateHz,
    roles: JSON.parse(row.roles) as SignalRole[], startedAt: iso(row.startedAtMs), sha256: row.sha256,
  }));
}
