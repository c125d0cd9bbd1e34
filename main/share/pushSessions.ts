/**
 * Pushing a bench's finished sessions to the shared logbook. A bench records into its own SQLite logbook, so a
 * session is never lost because the server went away; pushing copies each finished session not yet shared as its
 * archive (app/exchange/ARCHIVE.md), idempotently: the shared logbook stores a session once by its content hash,
 * so a push that is cut off after the server committed, and tried again, finds the session there and only notes
 * it. A lost connection is retried (opening included) with a growing pause until `retryForMs` has passed; the
 * report says which sessions needed retries and why. A session the shared logbook refuses (another session of the
 * same unit at the same start) is reported and left unshared; the others go on.
 */
import { isInputError } from '../../app/errors';
import { archiveContentHash, connectionFaultDetail, isConnectionFault, logbookDisplayLocation, type Logbook } from '../store/index';

export interface PushOptions {
  /** How long a lost connection is retried before the push gives up (default 120 s; 0: one attempt). */
  retryForMs?: number;
  /** First pause between attempts; doubles up to 5 s (default 250 ms). */
  retryDelayMs?: number;
  signal?: AbortSignal;
  /** Called as each session is done (pushed, found already there, or refused). */
  onSession?: (outcome: PushedSession) => void;
}

export interface PushedSession {
  sessionId: number;
  outcome: 'pushed' | 'already-shared' | 'refused';
  remoteSessionId: number | null;
  cycles: number;
  /** Attempts it took (1 when nothing had to be retried). */
  attempts: number;
  reason: string | null;
}

export interface PushRetry {
  /** null: opening the shared logbook. */
  sessionId: number | null;
  attempts: number;
  reasons: string[];
}

export interface PushReport {
  /** The shared logbook's address, without any password. */
  target: string;
  sessions: PushedSession[];
  retried: PushRetry[];
  /** True when the connection stayed lost longer than `retryForMs`: sessions were left for the next push. */
  gaveUp: boolean;
  /** Finished sessions still not shared after this push. */
  waiting: number;
  elapsedMs: number;
}

const sleep = (ms: number, signal?: AbortSignal) =>
  new Promise<void>((resolve) => {
    const timer = setTimeout(resolve, ms);
    signal?.addEventListener('abort', () => {
      clearTimeout(timer);
      resolve();
    }, { once: true });
  });

export async function pushSessions(local: Logbook, sharedLocation: string, openShared: () => Promise<Logbook>, options: PushOptions = {}): Promise<PushReport> {
  const started = Date.now();
  const target = logbookDisplayLocation(sharedLocation);
  const retryForMs = options.retryForMs ?? 120_000;
  const report: PushReport = { target, sessions: [], retried: [], gaveUp: false, waiting: 0, elapsedMs: 0 };
  let shared: Logbook | null = null;
  let lostSinceMs: number | null = null;
  let pauseMs = options.retryDelayMs ?? 250;

  const noteRetry = (sessionId: number | null, reason: string): void => {
    let entry = report.retried.find((retry) => retry.sessionId === sessionId);
    if (!entry) report.retried.push((entry = { sessionId, attempts: 0, reasons: [] }));
    entry.attempts += 1;
    if (!entry.reasons.includes(reason)) entry.reasons.push(reason);
  };
  /** After a lost connection: true to try again, false when the time is up. */
  const waitToRetry = async (sessionId: number | null, error: unknown): Promise<boolean> => {
    noteRetry(sessionId, connectionFaultDetail(error));
    if (shared) {
      await shared.close().catch(() => undefined);
      shared = null;
    }
    lostSinceMs ??= Date.now();
    if (Date.now() - lostSinceMs >= retryForMs || options.signal?.aborted) return false;
    await sleep(pauseMs, options.signal);
    pauseMs = Math.min(5_000, pauseMs * 2);
    return !options.signal?.aborted;
  };
  const connected = (): void => {
    lostSinceMs = null;
    pauseMs = options.retryDelayMs ?? 250;
  };

  try {
    const queue = await local.sessionsToShare(target);
    for (let index = 0; index < queue.length && !report.gaveUp; index += 1) {
      const sessionId = queue[index];
      const content = await local.archiveSession(sessionId);
      const contentSha256 = archiveContentHash(content.session);
      let attempts = 0;
      for (;;) {
        attempts += 1;
        try {
          if (!shared) {
            try {
              shared = await openShared();
            } catch (error) {
              if (!isConnectionFault(error)) throw error;
              attempts -= 1;
              if (await waitToRetry(null, error)) continue;
              report.gaveUp = true;
              break;
            }
            connected();
          }
          const result = await shared.importArchiveSession({ ...content, contentSha256, where: `session ${sessionId} of ${local.location}` });
          connected();
          await local.recordSharedCopy({ sessionId, target, contentSha256, remoteSessionId: result.sessionId });
          const done: PushedSession = { sessionId, outcome: result.imported ? 'pushed' : 'already-shared', remoteSessionId: result.sessionId, cycles: content.session.cycles.rows.length, attempts, reason: null };
          report.sessions.push(done);
          options.onSession?.(done);
          break;
        } catch (error) {
          if (isConnectionFault(error)) {
            if (await waitToRetry(sessionId, error)) continue;
            report.gaveUp = true;
            break;
          }
          if (!isInputError(error)) throw error;
          const refused: PushedSession = { sessionId, outcome: 'refused', remoteSessionId: null, cycles: 0, attempts, reason: error.message };
          report.sessions.push(refused);
          options.onSession?.(refused);
          break;
        }
      }
    }
    report.waiting = (await local.sessionsToShare(target)).length;
  } finally {
    if (shared) await (shared as Logbook).close().catch(() => undefined);
  }
  report.elapsedMs = Date.now() - started;
  return report;
}
