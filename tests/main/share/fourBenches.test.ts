/**
 * Four benches, one shared logbook, a server that goes away: four processes each commission units on their own
 * virtual board into their own SQLite logbook, pushing finished sessions to one PostgreSQL logbook as they go, each
 * with its own bench role (roles.sql). Part-way through, the PostgreSQL server is stopped; the benches keep
 * recording; their final pushes start while it is down and retry; then it is started again. Afterwards every
 * session of every bench is in the shared logbook exactly once, with the cycle count its bench recorded, and each
 * push says what it retried. Real server (throwaway cluster), real processes, no mock.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PushReport, PushRetry } from '../../../main/share/pushSessions';
import { openLogbook } from '../../../main/store/openLogbook';
import { startThrowawayCluster, type ThrowawayCluster } from '../../../scripts/postgres/throwawayCluster';
import { tempFolder, type TempFolder } from '../store/storeFixtures';

const benches = 4;
const sessionsPerBench = 5;
const database = 'line_logbook';
const root = resolve(__dirname, '../../..');
let cluster: ThrowawayCluster;
let folder: TempFolder;
let admin: pg.Client;

interface BenchRun {
  name: string;
  child: ChildProcess;
  recorded: Array<{ id: number; cycles: number; startedAt: string }>;
  recordedAll: boolean;
  background: { pushes: number; pushed: number; retried: PushRetry[] } | null;
  report: PushReport | null;
  exited: Promise<number | null>;
  stderr: string;
}

async function until(check: () => boolean | Promise<boolean>, limitMs: number, what: string): Promise<void> {
  const start = Date.now();
  while (!(await check())) {
    if (Date.now() - start > limitMs) throw new Error(`waited ${limitMs} ms for ${what}`);
    await new Promise((resolveWait) => setTimeout(resolveWait, 100));
  }
}

function startBench(index: number): BenchRun {
  const name = `bench-${index}`;
  const role = `line_bench_${index}`;
  const config = { logbook: folder.file(`${name}.sqlite`), pushTo: `postgres://${role}@127.0.0.1:${cluster.port}/${database}`, bench: name, sessions: sessionsPerBench, unitPrefix: `LN${index}`, swapMs: 600 };
  const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'tests/main/share/benchChild.ts'), JSON.stringify(config)], {
    cwd: root,
    // Each bench logs in with its own role; the password from the standard setting, never the address.
    env: { ...process.env, PGPASSWORD: `${role}-pw` },
    stdio: ['pipe', 'pipe', 'pipe'],
  });
  const run: BenchRun = { name, child, recorded: [], recordedAll: false, background: null, report: null, stderr: '', exited: new Promise((resolveExit) => child.once('exit', (code) => resolveExit(code))) };
  let text = '';
  child.stdout?.setEncoding('utf8');
  child.stdout?.on('data', (chunk: string) => {
    text += chunk;
    const lines = text.split('\n');
    text = lines.pop() ?? '';
    for (const line of lines) {
      const [tag, ...rest] = line.split(' ');
      if (tag === 'recorded') run.recorded.push({ id: Number(rest[0]), cycles: Number(rest[1]), startedAt: rest[2] });
      else if (tag === 'recorded-all') run.recordedAll = true;
      else if (tag === 'background') run.background = JSON.parse(rest.join(' '));
      else if (tag === 'report') run.report = JSON.parse(rest.join(' '));
    }
  });
  child.stderr?.setEncoding('utf8');
  child.stderr?.on('data', (chunk: string) => (run.stderr += chunk));
  return run;
}

beforeAll(async () => {
  folder = tempFolder('rampwright-line-');
  cluster = await startThrowawayCluster();
  cluster.psql(`CREATE ROLE line_owner LOGIN PASSWORD 'line_owner-pw'; CREATE DATABASE ${database} OWNER line_owner;`);
  await (await openLogbook(cluster.url(database, 'line_owner', 'line_owner-pw'))).close();
  cluster.psql(readFileSync(join(root, 'main/store/postgres/roles.sql'), 'utf8'), database, { owner: 'line_owner' });
  for (let index = 1; index <= benches; index += 1) cluster.psql(`CREATE ROLE line_bench_${index} LOGIN PASSWORD 'line_bench_${index}-pw' IN ROLE rampwright_bench;`);
  admin = new pg.Client({ connectionString: cluster.url(database) });
}, 60_000);

afterAll(async () => {
  await admin?.end().catch(() => undefined);
  await cluster?.stop();
  folder?.remove();
});

describe('four benches pushing to one shared logbook', () => {
  it('lose nothing and store nothing twice when the server stops part-way', async () => {
    const runs = Array.from({ length: benches }, (_, index) => startBench(index + 1));
    try {
      // Mid-way: some sessions have reached the shared logbook, none of the benches is done.
      await admin.connect();
      const sharedCount = async () => Number((await admin.query('SELECT count(*) AS n FROM sessions')).rows[0].n);
      await until(async () => (await sharedCount()) >= 2, 120_000, 'the first shared sessions');
      await admin.end();
      const stoppedAtMs = Date.now();
      await cluster.pause();
      // The benches record on without the server, then their final pushes start while it is still down.
      await until(() => runs.every((run) => run.recordedAll || run.child.exitCode !== null), 180_000, 'every bench to record its sessions');
      for (const run of runs) run.child.stdin?.write('push\n');
      await new Promise((resolveWait) => setTimeout(resolveWait, 1500));
      await cluster.resume();
      const codes = await Promise.all(runs.map((run) => run.exited));
      expect(codes, runs.map((run) => run.stderr).join('\n')).toEqual(runs.map(() => 0));

      const recordedWhileDown = runs.flatMap((run) => run.recorded).filter((session) => Date.parse(session.startedAt) > stoppedAtMs);
      expect(recordedWhileDown.length).toBeGreaterThan(0);

      // Every session of every bench, exactly once, with its cycle count.
      const shared = await openLogbook(cluster.url(database));
      try {
        const rows = await shared.listSessions();
        expect(rows).toHaveLength(benches * sessionsPerBench);
        for (const run of runs) {
          expect(run.recorded).toHaveLength(sessionsPerBench);
          const local = await openLogbook(folder.file(`${run.name}.sqlite`));
          const localRows = await local.listSessions();
          await local.close();
          expect(localRows.map((row) => row.cycles)).toEqual(run.recorded.map((session) => session.cycles));
          for (const row of localRows) {
            const copies = rows.filter((remote) => remote.unit === row.unit && remote.startedAt === row.startedAt);
            expect(copies.map((copy) => [copy.bench, copy.cycles, copy.status]), `${run.name} ${row.unit}`).toEqual([[run.name, row.cycles, row.status]]);
            // The cycles themselves arrived, not only the count.
            expect((await shared.cycleReadings(copies[0].id)).length).toBe(row.cycles);
            expect(row.sharedAt).not.toBeNull();
          }
          // The final push found the server down, retried, and says so; nothing was left behind.
          const report = run.report as PushReport;
          expect(report.gaveUp).toBe(false);
          expect(report.waiting).toBe(0);
          expect(report.retried.length).toBeGreaterThan(0);
          // Refused while the server was down (or cut off by its shutdown).
          expect(report.retried.flatMap((retry) => retry.reasons).join(' ')).toMatch(/ECONNREFUSED|terminating connection|Connection terminated/);
          expect(report.retried.every((retry) => retry.attempts >= 1)).toBe(true);
          // Pushed once each: by the background pusher before the stop, or by the final push after it.
          const pushedInTotal = (run.background?.pushed ?? 0) + report.sessions.length;
          expect(pushedInTotal).toBeGreaterThanOrEqual(sessionsPerBench);
          expect(report.sessions.every((session) => session.outcome !== 'refused')).toBe(true);
        }
        expect(new Set(rows.map((row) => row.bench))).toEqual(new Set(runs.map((run) => run.name)));
      } finally {
        await shared.close();
      }
    } finally {
      for (const run of runs) if (run.child.exitCode === null) run.child.kill('SIGKILL');
    }
  }, 300_000);
});
