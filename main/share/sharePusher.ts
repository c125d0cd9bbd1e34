/**
 * The bench setting that shares as it goes (`serve --push-to`, `record --push-to`): every `intervalMs` (and when
 * asked) the bench pushes its finished sessions to the shared logbook, one push at a time, each giving up quickly
 * when the server is away (the next tick tries again). Recording never waits on it: sessions are written to the
 * bench's own logbook first, so a server that goes away costs nothing but a later push.
 */
import type { Logbook } from '../store/index';
import { logbookDisplayLocation, openLogbook } from '../store/index';
import { pushSessions, type PushReport } from './pushSessions';

export interface SharingStatus {
  /** The shared logbook's address without password. */
  target: string;
  /** Finished sessions of this bench not yet in the shared logbook. */
  waiting: number;
  lastAttemptAt: string | null;
  /** When the last push reached the shared logbook. */
  lastReachedAt: string | null;
  /** What stopped the last push, or null when it went through. */
  problem: string | null;
}

export interface SharePusher {
  pushNow(): Promise<PushReport>;
  status(): Promise<SharingStatus>;
  stop(): Promise<void>;
}

export function startSharePusher(local: Logbook, sharedLocation: string, options: { intervalMs?: number; onReport?: (report: PushReport) => void } = {}): SharePusher {
  const target = logbookDisplayLocation(sharedLocation);
  let running: Promise<PushReport> | null = null;
  let lastAttemptAt: string | null = null;
  let lastReachedAt: string | null = null;
  let problem: string | null = null;
  let stopped = false;

  const pushNow = (): Promise<PushReport> => {
    if (running) return running;
    lastAttemptAt = new Date().toISOString();
    running = pushSessions(local, sharedLocation, () => openLogbook(sharedLocation), { retryForMs: 0 })
      .then((report) => {
        const refused = report.sessions.find((session) => session.outcome === 'refused');
        const lastRetry = report.retried[report.retried.length - 1];
        problem = report.gaveUp ? `the shared logbook does not answer (${lastRetry?.reasons[lastRetry.reasons.length - 1] ?? 'no answer'})` : refused ? `session ${refused.sessionId} was refused: ${refused.reason}` : null;
        if (!report.gaveUp) lastReachedAt = new Date().toISOString();
        options.onReport?.(report);
        return report;
      })
      .catch((error: unknown) => {
        problem = error instanceof Error ? error.message : String(error);
        throw error;
      })
      .finally(() => {
        running = null;
      });
    return running;
  };

  const timer = setInterval(() => {
    if (!stopped) pushNow().catch(() => undefined);
  }, options.intervalMs ?? 10_000);
  timer.unref();

  return {
    pushNow,
    async status() {
      return { target, waiting: (await local.sessionsToShare(target)).length, lastAttemptAt, lastReachedAt, problem };
    },
    async stop() {
      stopped = true;
      clearInterval(timer);
      await running?.catch(() => undefined);
    },
  };
}
