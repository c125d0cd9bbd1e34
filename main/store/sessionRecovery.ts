/**
 * Sessions left 'open' by a writer that is gone (killed, crashed, power cut) become 'interrupted' with their end set
 * to the last instant anything of theirs reached the disk. A writer counts as alive when it runs on this host and its
 * process still exists, or, on another host (a shared logbook), when its heartbeat is recent.
 */
import { hostname } from 'node:os';
import { storeSessionSummary } from './sessionSummary';
import { all, get, type SqlProgram } from './sqlProgram';

/** A writer touches its session at least every 5 s (logbookWriter.ts); three missed beats mean it is gone. */
const remoteHeartbeatLimitMs = 15_000;

/** True when a process with this id runs on this computer (EPERM: it does, as another user). */
export function processExists(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: the process exists but belongs to someone else.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

export function writerIsAlive(writer: { host: string | null; pid: number | null; heartbeatAtMs: number | null }, nowMs: number): boolean {
  if (writer.host === null || writer.pid === null) return false;
  if (writer.host === hostname()) return processExists(writer.pid);
  return writer.heartbeatAtMs !== null && nowMs - writer.heartbeatAtMs < remoteHeartbeatLimitMs;
}

export function* recoverInterruptedSessions(nowMs = Date.now()): SqlProgram<number[]> {
  const open = yield* all<{ id: number; host: string | null; pid: number | null; heartbeatAtMs: number | null; startedAtMs: number }>(
    `SELECT id, writer_host AS "host", writer_pid AS "pid", heartbeat_at_ms AS "heartbeatAtMs", started_at_ms AS "startedAtMs" FROM sessions WHERE status = 'open'`,
  );
  const recovered: number[] = [];
  for (const session of open) {
    if (writerIsAlive(session, nowMs)) continue;
    const last = yield* get<{ at: number | null }>(
      `SELECT max(at) AS "at" FROM (
         SELECT max(recorded_at_ms) AS at FROM cycles WHERE session_id = ?
         UNION ALL SELECT max(at_ms) FROM link_events WHERE session_id = ?) AS latest`,
      [session.id, session.id],
    );
    const endedAtMs = Math.max(session.startedAtMs, session.heartbeatAtMs ?? 0, last?.at ?? 0);
    yield* storeSessionSummary(session.id, 'interrupted', endedAtMs);
    recovered.push(session.id);
  }
  return recovered;
}
