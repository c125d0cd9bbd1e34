/**
 * A session's rows in the archive's shape (app/exchange/archiveSchema.ts), read from and written to the logbook.
 * Local ids never travel: the unit is its serial, the design version its content hash, the session its content.
 * Query programs (sqlProgram.ts), the same on both stores; `importArchive` runs inside the store's write transaction.
 */
import { archiveColumns, fromArchiveCell, toArchiveCell, type ArchiveSession } from '../../app/exchange/archiveSchema';
import { InputError } from '../../app/errors';
import { decideImport } from './archiveImport';
import { archiveContentHash } from './canonicalJson';
import type { ArchiveImportRequest, ArchiveImportResult, ArchiveSessionContent } from './logbookTypes';
import { insertDesignVersion } from './recordQueries';
import { all, get, insertMany, lock, run, type SqlProgram, type SqlValue } from './sqlProgram';

type Row = Record<string, unknown>;

function* table(name: string, columns: readonly string[], sessionId: number, order: string) {
  const rows = yield* all<Row>(`SELECT ${columns.join(', ')} FROM ${name} WHERE session_id = ? ORDER BY ${order}`, [sessionId]);
  return { columns: [...columns], rows: rows.map((row) => columns.map((column) => toArchiveCell(row[column]))) };
}

export function* readArchiveSession(sessionId: number): SqlProgram<ArchiveSessionContent> {
  const head = yield* get<Row>(
    `SELECT s.operator, s.started_at_ms, s.ended_at_ms, s.status, s.notes, s.readings_json, s.steps_json, s.cycle_count, s.alpha_mean_deg, s.ramp_peak_median_v, s.bench,
       s.sign_off, s.sign_off_reason, s.sign_off_exceptions_json,
       u.serial, u.design_name, u.created_at_ms AS unit_created_at_ms, d.name AS design_name_version, d.content_hash, d.design_json, d.saved_at_ms
     FROM sessions s JOIN units u ON u.id = s.unit_id JOIN board_designs d ON d.id = s.design_id WHERE s.id = ?`,
    [sessionId],
  );
  if (!head) throw new InputError(`there is no session ${sessionId} in this logbook`);
  if (head.status === 'open') throw new InputError(`session ${sessionId} is still being recorded: close it (or let it be marked interrupted) before exporting it`);
  const captures = yield* all<Row>(
    'SELECT label, start_s, sample_rate_hz, samples_per_channel, roles, after_gap, started_at_ms, encoding, sha256, data FROM captures WHERE session_id = ? ORDER BY started_at_ms, start_s, sha256, id',
    [sessionId],
  );
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
      ...(head.bench === null || head.bench === undefined ? {} : { bench: String(head.bench) }),
      // Only when signed off: a session closed without sign-off (or exported before sign-offs were kept) hashes as before.
      ...(head.sign_off === null || head.sign_off === undefined ? {} : { signOff: head.sign_off as 'signed-off' | 'signed-off-with-exceptions' }),
      ...(head.sign_off_reason === null || head.sign_off_reason === undefined ? {} : { signOffReason: String(head.sign_off_reason) }),
      // Written compact, whichever store wrote it (PostgreSQL's jsonb text has spaces), so both hash it alike.
      ...(head.sign_off_exceptions_json === null || head.sign_off_exceptions_json === undefined ? {} : { signOffExceptionsJson: compactJson(String(head.sign_off_exceptions_json)) }),
    },
    cycles: yield* table('cycles', archiveColumns.cycles, sessionId, 'seq'),
    transferPoints: yield* table('transfer_points', archiveColumns.transferPoints, sessionId, 'seq'),
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
    trims: yield* table('trims', archiveColumns.trims, sessionId, 'at_ms, id'),
    linkEvents: yield* table('link_events', archiveColumns.linkEvents, sessionId, 'at_ms, id'),
  };
  // Only when there are any: an archive of a session without them hashes as it always did.
  const measurements = yield* table('part_measurements', archiveColumns.partMeasurements, sessionId, 'at_ms, id');
  if (measurements.rows.length > 0) session.partMeasurements = measurements;
  return { session, captureData: captures.map((row) => Buffer.from(row.data as Uint8Array)) };
}

/** A session's rows of one table. */
export function* insertRows(name: string, sessionId: number, columns: readonly string[], rows: ReadonlyArray<readonly SqlValue[]>): SqlProgram<void> {
  yield* insertMany(name, ['session_id', ...columns], rows.map((row) => [sessionId, ...row]));
}

function* insertTable(name: string, sessionId: number, section: { columns: string[]; rows: Array<Array<number | string | null>> }): SqlProgram<void> {
  yield* insertRows(name, sessionId, section.columns, section.rows.map((row) => row.map(fromArchiveCell)));
}

/** JSON text without white space between tokens; text that does not parse is kept as it is. */
function compactJson(text: string): string {
  try {
    return JSON.stringify(JSON.parse(text));
  } catch {
    return text;
  }
}

/** Finished sessions of a unit that started at that instant: the candidates an imported session may already be. */
function* sessionsOfUnitAt(serial: string, startedAtMs: number): SqlProgram<Array<{ id: number; contentSha256: string | null }>> {
  return yield* all<{ id: number; contentSha256: string | null }>(
    'SELECT s.id, s.content_sha256 AS "contentSha256" FROM sessions s JOIN units u ON u.id = s.unit_id WHERE u.serial = ? AND s.started_at_ms = ? AND s.status != \'open\' ORDER BY s.id',
    [serial, startedAtMs],
  );
}

/** Inserts the session (and its unit and design version when this logbook lacks them); returns the new session id. */
function* insertArchiveSession(session: ArchiveSession, captureData: readonly Uint8Array[], contentSha256: string): SqlProgram<number> {
  const design = yield* insertDesignVersion(session.design);
  yield* run('INSERT INTO units (serial, design_name, created_at_ms) VALUES (?, ?, ?) ON CONFLICT (serial) DO NOTHING', [session.unit.serial, session.unit.designName, session.unit.createdAtMs]);
  const unitId = ((yield* get<{ id: number }>('SELECT id FROM units WHERE serial = ?', [session.unit.serial])) as { id: number }).id;
  const record = session.record;
  // Inserted open, its rows added, then given its status: a shared logbook refuses rows for a finished session.
  const inserted = yield* get<{ id: number }>(
    `INSERT INTO sessions (unit_id, design_id, operator, started_at_ms, ended_at_ms, status, notes, readings_json, steps_json, cycle_count, alpha_mean_deg, ramp_peak_median_v, bench, content_sha256,
       sign_off, sign_off_reason, sign_off_exceptions_json)
     VALUES (?, ?, ?, ?, ?, 'open', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`,
    [
      unitId, design.id, record.operator, record.startedAtMs, record.endedAtMs, record.notes, record.readingsJson, record.stepsJson ?? null, record.cycleCount, record.alphaMeanDeg, record.rampPeakMedianV, record.bench ?? null, contentSha256,
      record.signOff ?? null, record.signOffReason ?? null, record.signOffExceptionsJson ?? null,
    ],
  );
  const sessionId = (inserted as { id: number }).id;
  yield* insertTable('cycles', sessionId, session.cycles);
  yield* insertTable('transfer_points', sessionId, session.transferPoints);
  yield* insertTable('trims', sessionId, session.trims);
  yield* insertTable('link_events', sessionId, session.linkEvents);
  if (session.partMeasurements) yield* insertTable('part_measurements', sessionId, session.partMeasurements);
  yield* insertRows(
    'captures', sessionId, ['label', 'start_s', 'sample_rate_hz', 'samples_per_channel', 'roles', 'after_gap', 'started_at_ms', 'encoding', 'sha256', 'data'],
    session.captures.map((info, index) => [info.label, info.startS, info.sampleRateHz, info.samplesPerChannel, JSON.stringify(info.roles), info.afterGap ? 1 : 0, info.startedAtMs, info.encoding, info.sha256, captureData[index]]),
  );
  yield* run('UPDATE sessions SET status = ? WHERE id = ?', [record.status, sessionId]);
  return sessionId;
}

/** The import rule of ARCHIVE.md, in the caller's write transaction. */
export function* importArchive(request: ArchiveImportRequest): SqlProgram<ArchiveImportResult> {
  const { session, captureData, contentSha256 } = request;
  // Imports of one unit wait for each other, so two benches pushing the same session store it once.
  yield* lock(`unit ${session.unit.serial}`);
  const candidates: Array<{ sessionId: number; contentSha256: string }> = [];
  for (const { id, contentSha256: stored } of yield* sessionsOfUnitAt(session.unit.serial, session.record.startedAtMs)) {
    // A session that arrived as an archive carries its hash; one recorded here is hashed from its rows.
    candidates.push({ sessionId: id, contentSha256: stored ?? archiveContentHash((yield* readArchiveSession(id)).session) });
  }
  const decision = decideImport(request, candidates);
  if (decision.kind === 'present') return { sessionId: decision.sessionId, contentSha256, imported: false };
  // Kept with the hash of the session as stored: an archive from before sign-offs were kept arrives classified
  // (sessionArchive.ts withLegacySignOff), as the bench that recorded it holds the same session once upgraded.
  return { sessionId: yield* insertArchiveSession(session, captureData, archiveContentHash(session)), contentSha256, imported: true };
}
