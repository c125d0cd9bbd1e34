/**
 * `record` through an unplug: the logger's pseudo-terminal pair is killed mid-session (SIGKILL to socat) and a new
 * pair appears at the same path, as a logger pulled out and plugged back in. The session must go on in the same
 * logbook session, with the unplug and the reopen recorded between the cycles of the two stretches.
 */
import Database from 'better-sqlite3';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { recordSession } from '../../../main/cli/commands/record';
import { startPtyPair, type PtyPair } from '../../helpers/socat';
import { closePort, openLoggerEnd } from '../serial/linkTestKit';
import { designPath, paceVirtualLogger } from './recordKit';

let folder: string;
const pairs: PtyPair[] = [];

beforeEach(() => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-record-reopen-'));
});
afterEach(async () => {
  for (const pair of pairs.splice(0)) await pair.stop();
  rmSync(folder, { recursive: true, force: true });
});

function query<T>(path: string, sql: string): T | null {
  try {
    const db = new Database(path, { readonly: true, fileMustExist: true });
    try {
      return db.prepare(sql).get() as T;
    } finally {
      db.close();
    }
  } catch {
    return null;
  }
}

async function until(check: () => boolean, what: string, limitMs = 15_000): Promise<void> {
  const deadline = Date.now() + limitMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`waited ${limitMs} ms for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

describe('rampwright record through an unplug', () => {
  it('records the unplug and the reopen and keeps recording the same session', async () => {
    const hostPath = join(folder, 'host');
    const loggerPath = join(folder, 'logger');
    const dbPath = join(folder, 'logbook.sqlite');
    const cycles = (): number => query<{ n: number }>(dbPath, 'SELECT count(*) AS n FROM cycles')?.n ?? 0;
    const hasEvent = (kind: string): boolean => query<{ n: number }>(dbPath, `SELECT count(*) AS n FROM link_events WHERE kind = '${kind}'`)?.n === 1;

    const first = await startPtyPair(hostPath, loggerPath);
    pairs.push(first);
    const firstLogger = await openLoggerEnd(loggerPath);
    const firstPaced = paceVirtualLogger(firstLogger, { seed: 21, autostart: false });
    const stop = new AbortController();
    const recording = recordSession({ port: hostPath, db: dbPath, unit: 'RW-0415', designPath, signal: stop.signal });

    await until(() => cycles() >= 20, 'cycles of the first stretch');
    await firstPaced.stop();
    await closePort(firstLogger);
    await first.unplug();
    await until(() => hasEvent('unplugged'), 'the unplug to be recorded');
    const cyclesBeforeUnplug = cycles();

    // Plugged back in: a logger that streams from power-up, at the same path.
    const second = await startPtyPair(hostPath, loggerPath);
    pairs.push(second);
    await until(() => hasEvent('reopened'), 'the reopen to be recorded');
    const secondLogger = await openLoggerEnd(loggerPath);
    const secondPaced = paceVirtualLogger(secondLogger, { seed: 22 });
    await until(() => cycles() >= cyclesBeforeUnplug + 20, 'cycles of the second stretch');
    stop.abort();
    const result = await recording;
    await secondPaced.stop();
    await closePort(secondLogger);

    expect(result.session.status).toBe('closed');
    const db = new Database(dbPath, { readonly: true });
    const events = (db.prepare('SELECT kind FROM link_events ORDER BY at_ms, id').all() as Array<{ kind: string }>).map((row) => row.kind);
    const unpluggedAt = (db.prepare("SELECT at_ms AS at FROM link_events WHERE kind = 'unplugged'").get() as { at: number }).at;
    const reopenedAt = (db.prepare("SELECT at_ms AS at FROM link_events WHERE kind = 'reopened'").get() as { at: number }).at;
    const before = (db.prepare('SELECT count(*) AS n FROM cycles WHERE recorded_at_ms <= ?').get(unpluggedAt) as { n: number }).n;
    const after = (db.prepare('SELECT count(*) AS n FROM cycles WHERE recorded_at_ms >= ?').get(reopenedAt) as { n: number }).n;
    db.close();
    // One session, in order: opened, (decoder problems), unplugged, reopened, ..., closed.
    const linkKinds = events.filter((kind) => ['opened', 'unplugged', 'reopened', 'closed'].includes(kind));
    expect(linkKinds).toEqual(['opened', 'unplugged', 'reopened', 'closed']);
    expect(before).toBeGreaterThanOrEqual(20);
    expect(after).toBeGreaterThanOrEqual(20);
    expect(result.session.cycles).toBe(before + after);
    expect(result.session.linkErrors).toBeGreaterThanOrEqual(1);
  }, 60_000);
});
