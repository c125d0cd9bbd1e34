/**
 * Writes the logbook makes outside a session's batches: a design version, a new session, a bench's record of what
 * it pushed. Query programs (sqlProgram.ts) run inside the store's write transaction.
 */
import type { BoardDesign } from '../../app/board/design';
import { canonicalJson, sha256OfText } from './canonicalJson';
import type { DesignVersion, SharedCopy, StoredDesignVersion } from './logbookTypes';
import { insertDesignVersion } from './recordQueries';
import { iso } from './sessionQueries';
import { all, get, run, type SqlProgram } from './sqlProgram';

export const designVersionView = (stored: StoredDesignVersion): DesignVersion => ({
  id: stored.id, name: stored.name, version: stored.version, contentHash: stored.contentHash, savedAt: iso(stored.savedAtMs),
});

/** Versions a design by its content: the same content (in any key order) is the same version. */
export function* saveDesign(design: BoardDesign, nowMs: number): SqlProgram<DesignVersion> {
  const designJson = canonicalJson(design);
  return designVersionView(yield* insertDesignVersion({ name: design.name, contentHash: sha256OfText(designJson), designJson, savedAtMs: nowMs }));
}

export interface NewSession {
  serial: string;
  designId: number;
  designName: string;
  operator: string;
  startedAtMs: number;
  notes: string | null;
  bench: string;
  writer: { host: string; pid: number };
  nowMs: number;
}

export function* insertSession(session: NewSession): SqlProgram<number> {
  yield* run('INSERT INTO units (serial, design_name, created_at_ms) VALUES (?, ?, ?) ON CONFLICT (serial) DO NOTHING', [session.serial, session.designName, session.startedAtMs]);
  yield* run('UPDATE units SET design_name = ? WHERE serial = ? AND design_name IS NULL', [session.designName, session.serial]);
  const unitId = ((yield* get<{ id: number }>('SELECT id FROM units WHERE serial = ?', [session.serial])) as { id: number }).id;
  const inserted = yield* get<{ id: number }>(
    `INSERT INTO sessions (unit_id, design_id, operator, started_at_ms, status, notes, writer_host, writer_pid, heartbeat_at_ms, bench)
     VALUES (?, ?, ?, ?, 'open', ?, ?, ?, ?, ?) RETURNING id`,
    [unitId, session.designId, session.operator, session.startedAtMs, session.notes, session.writer.host, session.writer.pid, session.nowMs, session.bench],
  );
  return (inserted as { id: number }).id;
}

export function* sessionsToShare(target: string): SqlProgram<number[]> {
  const rows = yield* all<{ id: number }>(
    `SELECT s.id FROM sessions s WHERE s.status != 'open' AND NOT EXISTS (SELECT 1 FROM shared_copies c WHERE c.session_id = s.id AND c.target = ?) ORDER BY s.started_at_ms, s.id`,
    [target],
  );
  return rows.map((row) => row.id);
}

export function* recordSharedCopy(copy: SharedCopy, nowMs: number): SqlProgram<void> {
  yield* run(
    `INSERT INTO shared_copies (session_id, target, content_sha256, remote_session_id, shared_at_ms) VALUES (?, ?, ?, ?, ?)
     ON CONFLICT (session_id, target) DO UPDATE SET content_sha256 = excluded.content_sha256, remote_session_id = excluded.remote_session_id, shared_at_ms = excluded.shared_at_ms`,
    [copy.sessionId, copy.target, copy.contentSha256, copy.remoteSessionId, nowMs],
  );
}
