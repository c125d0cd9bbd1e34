/**
 * A session's rows in the archive's shape (app/exchange/archiveSchema.ts), read from and written to the logbook.
 * Local ids never travel: the unit is its serial, the design version its content hash, the session its content.
 * Writing assumes the caller holds a transaction (importArchiveSession in sqliteLogbook.ts).
 */
import { archiveColumns, fromArchiveCell, toArchiveCell, type ArchiveSession } from '../../app/exchange/archiveSchema';
import { InputError } from '../../app/errors';
import type { SqliteDatabase } from './openDatabase';

type Row = Record<string, unknown>;

function table(db: SqliteDatabase, name: string, columns: readonly string[], sessionId: number, order: string) {
  const rows = db.prepare(`SELECT ${columns.join(', ')} FROM ${name} WHERE session_id = ? ORDER BY ${order}`).all(sessionId) as Row[];
  return { columns: [...columns], rows: rows.map((row) => columns.map((column) => toArchiveCell(row[column]))) };
}

export function readArchiveSession(db: SqliteDatabase, sessionId: number): { session: ArchiveSession; captureData: Buffer[] } {
  const head = db
    .prepare(
      `SELECT s.operator, s.started_at_ms, s.ended_at_ms, s.status, s.notes, s.readings_json, s.steps_json, s.cycle_count, s.alpha_mean_deg, s.ramp_peak_median_v,
         u.serial, u.design_name, u.created_at_ms AS unit_created_at_ms, d.name AS design_name_version, d.content_hash, d.design_json, d.saved_at_ms
       FROM sessions s JOIN units u ON u.id = s.unit_id JOIN board_designs d ON d.id = s.design_id WHERE s.id = ?`,
    )
    .get(sessionId) as Row | undefined;
  if (!head) throw new InputError(`there is no session ${sessionId} in this logbook`);
  if (head.status === 'open') throw new InputError(`session ${sessionId} is still being recorded: close it (or let it be marked interrupted) before exporting it`);
  const captures = db
    .prepare('SELECT label, start_s, sample_rate_hz, samples_per_channel, roles, after_gap, started_at_ms, encoding, sha256, data FROM captures WHERE session_id = ? ORDER BY started_at_ms, start_s, sha256, id')
    .all(sessionId) as Row[];
  const session: ArchiveSession = {
    unit: { serial: String(head.serial), designName: head.design_name === null ? null : String(head.design_name), createdAtMs: Number(head.unit_created_at_ms) },
    design: { name: String(head.design_name_version), contentHash: String(head.content_hash), designJson: String(head.design_json), savedAtMs: Number(head.saved_at_ms) },
    record: {
      operator: String(head.operator),
      startedAtMs: Number(head.started_at_ms),
      endedAtMs: head.ended_at_ms === null ? null : Number(head.ended_at_ms),
      status: head.status as 'closed' | 'interrupted',
      notes: (head.notes as string | null) ?? null,
      readingsJson: (head.readings_json as string | null) ?? null,
      cycleCount: (head.cycle_count as number | null) ?? null,
      alphaMeanDeg: (head.alpha_mean_deg as number | null) ?? null,
      rampPeakMedianV: (head.ramp_peak_median_v as number | null) ?? null,
      ...(head.steps_json === null || head.steps_json === undefined ? {} : { stepsJson: String(head.steps_json) }),
    },
    cycles: table(db, 'cycles', archiveColumns.cycles, sessionId, 'seq'),
    transferPoints: table(db, 'transfer_points', archiveColumns.transferPoints, sessionId, 'seq'),
    captures: captures.map((row) => ({
      label: (row.label as string | null) ?? null,
      startS: Number(row.start_s),
      sampleRateHz: Number(row.sample_rate_hz),
      samplesPerChannel: Number(row.samples_per_channel),
      roles: JSON.parse(String(row.roles)),
      afterGap: Number(row.after_gap) === 1,
      startedAtMs: Number(row.started_at_ms),
      encoding: 'f64le-planar+zlib' as const,
      sha256: String(row.sha256),
    })),
    // Rows in time order, ties by local id: the order they were recorded in.
    trims: table(db, 'trims', archiveColumns.trims, sessionId, 'at_ms, id'),
    linkEvents: table(db, 'link_events', archiveColumns.linkEvents, sessionId, 'at_ms, id'),
  };
  // Only when there are any: an archive of a session without them hashes as it always did.
  const measurements = table(db, 'part_measurements', archiveColumns.partMeasurements, sessionId, 'at_ms, id');
  if (measurements.rows.length > 0) session.partMeasurements = measurements;
  return { session, captureData: captures.map((row) => row.data as Buffer) };
}

/** Local sessions of a unit that started at that instant: the candidates an imported session may already be. */
export function sessionsOfUnitAt(db: SqliteDatabase, serial: string, startedAtMs: number): number[] {
  return (db.prepare('SELECT s.id FROM sessions s JOIN units u ON u.id = s.unit_id WHERE u.serial = ? AND s.started_at_ms = ? AND s.status != \'open\' ORDER BY s.id').all(serial, startedAtMs) as Array<{ id: number }>).map((row) => row.id);
}

function insertTable(db: SqliteDatabase, name: string, sessionId: number, section: { columns: string[]; rows: Array<Array<number | string | null>> }): void {
  const statement = db.prepare(`INSERT INTO ${name} (session_id, ${section.columns.join(', ')}) VALUES (?, ${section.columns.map(() => '?').join(', ')})`);
  for (const row of section.rows) statement.run(sessionId, ...row.map(fromArchiveCell));
}

/** Inserts the session (and its unit and design version when this logbook lacks them); returns the new session id. */
export function insertArchiveSession(db: SqliteDatabase, session: ArchiveSession, captureData: readonly Uint8Array[]): number {
  let designId = (db.prepare('SELECT id FROM board_designs WHERE content_hash = ?').get(session.design.contentHash) as { id: number } | undefined)?.id;
  if (designId === undefined) {
    // Version numbers are per logbook: the next one for this name here, as saving the design would give.
    const next = (db.prepare('SELECT coalesce(max(version), 0) + 1 AS v FROM board_designs WHERE name = ?').get(session.design.name) as { v: number }).v;
    designId = Number(
      db.prepare('INSERT INTO board_designs (name, version, content_hash, design_json, saved_at_ms) VALUES (?, ?, ?, ?, ?)').run(session.design.name, next, session.design.contentHash, session.design.designJson, session.design.savedAtMs).lastInsertRowid,
    );
  }
  db.prepare('INSERT INTO units (serial, design_name, created_at_ms) VALUES (?, ?, ?) ON CONFLICT (serial) DO NOTHING').run(session.unit.serial, session.unit.designName, session.unit.createdAtMs);
  const unitId = (db.prepare('SELECT id FROM units WHERE serial = ?').get(session.unit.serial) as { id: number }).id;
  const record = session.record;
  const sessionId = Number(
    db
      .prepare(
        `INSERT INTO sessions (unit_id, design_id, operator, started_at_ms, ended_at_ms, status, notes, readings_json, steps_json, cycle_count, alpha_mean_deg, ramp_peak_median_v)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      )
      .run(unitId, designId, record.operator, record.startedAtMs, record.endedAtMs, record.status, record.notes, record.readingsJson, record.stepsJson ?? null, record.cycleCount, record.alphaMeanDeg, record.rampPeakMedianV).lastInsertRowid,
  );
  insertTable(db, 'cycles', sessionId, session.cycles);
  insertTable(db, 'transfer_points', sessionId, session.transferPoints);
  insertTable(db, 'trims', sessionId, session.trims);
  insertTable(db, 'link_events', sessionId, session.linkEvents);
  if (session.partMeasurements) insertTable(db, 'part_measurements', sessionId, session.partMeasurements);
  const capture = db.prepare(
    `INSERT INTO captures (session_id, label, start_s, sample_rate_hz, samples_per_channel, roles, after_gap, started_at_ms, encoding, sha256, data)
     VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  session.captures.forEach((info, index) => {
    capture.run(sessionId, info.label, info.startS, info.sampleRateHz, info.samplesPerChannel, JSON.stringify(info.roles), info.afterGap ? 1 : 0, info.startedAtMs, info.encoding, info.sha256, Buffer.from(captureData[index]));
  });
  return sessionId;
}
