/**
 * Shared logbook figures (printed, not asserted), on a throwaway PostgreSQL cluster of the Debian packages
 * (scripts/postgres/throwawayCluster.ts): push throughput from a bench's SQLite logbook (sessions and cycles per
 * second, each session a transaction of its archive), and the time to recall a unit's history (its sessions, its
 * drift, every session's detail) from a shared logbook holding 10 000 sessions. The 10 000 are filled in by SQL in
 * the server (generate_series) beside the pushed ones, with cycles, so the indexes are as deep as a line's.
 * The server runs with fsync off (a throwaway cluster): figures for a production server with fsync on are lower
 * for the push (one WAL flush per session), unchanged for recall.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import pg from 'pg';
import type { CycleReading } from '../../app/bench/readings';
import { boardDesignSchema } from '../../app/board/design';
import { pushSessions } from '../../main/share/pushSessions';
import { openLogbook } from '../../main/store/openLogbook';
import { startThrowawayCluster } from '../postgres/throwawayCluster';

const design = boardDesignSchema.parse(JSON.parse(readFileSync(new URL('../../fixtures/boards/charger-ch50h.board.json', import.meta.url), 'utf8')));

/** Sessions pushed, cycles per session (60 s at 50 Hz, a commissioning session's order), sessions in the shared logbook. */
const pushedSessions = 40;
const cyclesPerSession = 3000;
const sharedSessions = 10_000;
/** Cycles per generated session: enough rows per session for the per-session queries to do real work. */
const generatedCycles = 100;

function reading(index: number, unit: number): CycleReading {
  return {
    t: index * 0.02, halfCycle: index % 2 === 0 ? 'positive' : 'negative', periodS: 0.02, alphaDeg: 85 + 10 * Math.sin(index / 40) + unit * 0.01, controlV: 3 + (index % 100) * 0.02, pulses: 1,
    wrongHalfCyclePulses: 0, rampPeakV: 7.3 + 0.01 * Math.cos(index / 30), rampFloorV: 0.1, slopeVPerMs: 0.73, startDelayDeg: 1.2, nonlinearityPct: 0.4, clipped: false, resetUs: 300,
  };
}

const median = (values: number[]): number => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

export async function run(): Promise<void> {
  const folder = mkdtempSync(join(tmpdir(), 'rampwright-bench-shared-'));
  const cluster = await startThrowawayCluster();
  try {
    cluster.createDatabase('line');
    const shared = cluster.url('line');

    // A bench's logbook with finished sessions.
    const bench = await openLogbook(join(folder, 'bench.sqlite'));
    for (let session = 0; session < pushedSessions; session += 1) {
      const writer = await bench.startSession({ unitSerial: `PUSH-${String(session).padStart(4, '0')}`, design, operator: 'bench', bench: 'bench 1' }, { flushIntervalMs: 3_600_000 });
      for (let index = 0; index < cyclesPerSession; index += 1) {
        const cycle = reading(index, session);
        writer.addCycle(cycle);
        if (index % 10 === 0) writer.addTransferPoint({ t: cycle.t, controlV: cycle.controlV as number, alphaDeg: cycle.alphaDeg as number });
      }
      await writer.close();
    }
    const started = performance.now();
    const report = await pushSessions(bench, shared, () => openLogbook(shared));
    const seconds = (performance.now() - started) / 1000;
    const cycles = report.sessions.reduce((sum, session) => sum + session.cycles, 0);
    console.log(`  push: ${report.sessions.length} sessions of ${cyclesPerSession} cycles in ${seconds.toFixed(2)} s: ${(report.sessions.length / seconds).toFixed(1)} sessions/s, ${Math.round(cycles / seconds).toLocaleString('en')} cycles/s`);
    const again = performance.now();
    await pushSessions(bench, shared, () => openLogbook(shared));
    console.log(`  push again (nothing new): ${((performance.now() - again)).toFixed(0)} ms`);
    await bench.close();

    // Fill the shared logbook to 10 000 sessions: 2 000 units of the same design, five sessions each a month apart.
    const fillStarted = performance.now();
    const client = new pg.Client({ connectionString: shared });
    await client.connect();
    const designId = (await client.query('SELECT id FROM board_designs LIMIT 1')).rows[0].id;
    const units = (sharedSessions - pushedSessions) / 5;
    await client.query('BEGIN');
    await client.query(`INSERT INTO units (serial, design_name, created_at_ms) SELECT 'LINE-' || lpad(i::text, 5, '0'), $1, 1767225600000 FROM generate_series(1, $2) AS i`, [design.name, units]);
    await client.query(
      `INSERT INTO sessions (unit_id, design_id, operator, started_at_ms, ended_at_ms, status, bench, writer_host)
       SELECT u.id, $1, 'line', 1767225600000 + k * 2592000000 + u.id * 60000, 1767225600000 + k * 2592000000 + u.id * 60000 + 600000, 'open', 'bench ' || (1 + (u.id + k) % 4), 'generated'
       FROM units u CROSS JOIN generate_series(0, 4) AS k WHERE u.serial LIKE 'LINE-%'`,
      [designId],
    );
    await client.query(
      `INSERT INTO cycles (session_id, seq, t_s, half_cycle, period_s, alpha_deg, control_v, pulses, wrong_half_cycle_pulses, ramp_peak_v, ramp_floor_v, slope_v_per_ms, start_delay_deg, nonlinearity_pct, clipped, reset_us, recorded_at_ms)
       SELECT s.id, c, c * 0.02, 'positive', 0.02, 85 + 10 * sin(c / 40.0), 3 + (c % 100) * 0.02, 1, 0, 7.3 + 0.01 * cos(c / 30.0) + (s.id % 7) * 0.001, 0.1, 0.73, 1.2, 0.4, 0, 300, s.started_at_ms + c * 20
       FROM sessions s CROSS JOIN generate_series(0, $1 - 1) AS c WHERE s.writer_host = 'generated'`,
      [generatedCycles],
    );
    await client.query(
      `UPDATE sessions s SET status = 'closed', writer_host = NULL, cycle_count = $1,
         alpha_mean_deg = (SELECT avg(alpha_deg) FROM cycles c WHERE c.session_id = s.id), ramp_peak_median_v = 7.3
       WHERE s.writer_host = 'generated'`,
      [generatedCycles],
    );
    await client.query('COMMIT');
    await client.query('ANALYZE');
    const counts = (await client.query('SELECT (SELECT count(*) FROM sessions) AS sessions, (SELECT count(*) FROM cycles) AS cycles')).rows[0];
    await client.end();
    console.log(`  shared logbook filled to ${Number(counts.sessions).toLocaleString('en')} sessions, ${Number(counts.cycles).toLocaleString('en')} cycles (${((performance.now() - fillStarted) / 1000).toFixed(1)} s by SQL)`);

    // Recall of one unit's history, as a reviewer opens it: sessions, drift, and each session's detail.
    const logbook = await openLogbook(shared);
    const list: number[] = [];
    const drift: number[] = [];
    const whole: number[] = [];
    for (let sample = 0; sample < 25; sample += 1) {
      const serial = `LINE-${String(1 + Math.floor((sample * 7919) % units)).padStart(5, '0')}`;
      const begin = performance.now();
      const sessions = await logbook.listSessions({ unitSerial: serial });
      const listed = performance.now();
      await logbook.unitDrift(serial);
      const drifted = performance.now();
      for (const session of sessions) await logbook.session(session.id);
      const done = performance.now();
      if (sessions.length !== 5) throw new Error(`unit ${serial} has ${sessions.length} sessions, not 5`);
      list.push(listed - begin);
      drift.push(drifted - listed);
      whole.push(done - begin);
    }
    const all = performance.now();
    const everything = await logbook.listSessions();
    const listAllMs = performance.now() - all;
    await logbook.close();
    console.log(`  recall of a unit's history (5 sessions) from ${everything.length.toLocaleString('en')}: list ${median(list).toFixed(1)} ms, drift ${median(drift).toFixed(1)} ms, list + drift + every session's detail ${median(whole).toFixed(1)} ms (medians of 25 units)`);
    console.log(`  listing all ${everything.length.toLocaleString('en')} sessions: ${listAllMs.toFixed(0)} ms`);
  } finally {
    await cluster.stop();
    rmSync(folder, { recursive: true, force: true });
  }
}
