/**
 * `rampwright record` on a real pseudo-terminal pair (socat) with the virtual logger on the far end: what the logbook
 * holds must be exactly what the analysis makes of the lines that were sent, link faults counted as the decoder
 * counted them, and Ctrl-C must close the session cleanly.
 */
import Database from 'better-sqlite3';
import { spawn } from 'node:child_process';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createCaptureAnalyzer } from '../../../app/bench/captureAnalyzer';
import type { CycleReading } from '../../../app/bench/readings';
import { createLoggerDecoder } from '../../../app/logger';
import { recordSession } from '../../../main/cli/commands/record';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { chargerBoard, designPath, paceVirtualLogger, ptyPairEachTest } from './recordKit';

const rig = ptyPairEachTest('rampwright-record-');

/** The analysis of the lines as sent, without any link: what the logbook must hold. */
function offlineCycles(lines: string[]): CycleReading[] {
  const design = chargerBoard();
  const decoder = createLoggerDecoder();
  const analyzer = createCaptureAnalyzer({ rectifier: design.rectifier, syncPhaseDeg: design.syncPhaseDeg, keepPerCycle: false });
  const cycles: CycleReading[] = [];
  for (const line of lines) for (const event of decoder.pushLine(line)) if (event.kind === 'block') cycles.push(...analyzer.push(event.block));
  return cycles;
}

describe('rampwright record', () => {
  it('stores every cycle the analysis finds in the lines sent, and the decoder-counted link faults', async () => {
    // The logger waits for the recorder's `start`, so the recorder sees the whole data stream (a port opened late
    // loses what came before; that case is the reopen test's).
    const paced = paceVirtualLogger(rig.logger, { seed: 11, autostart: false, faults: ['corrupt-blocks'], controlSweep: { fromV: 2, toV: 6, periodS: 2 } });
    const dbPath = join(rig.folder, 'logbook.sqlite');
    const result = await recordSession({ port: rig.pair.hostPath, db: dbPath, unit: 'RW-0142', designPath, seconds: 2.5, operator: 'bench 4' });
    await paced.stop();

    const db = new Database(dbPath, { readonly: true });
    const stored = db.prepare('SELECT t_s AS t, alpha_deg AS alphaDeg, ramp_peak_v AS rampPeakV, control_v AS controlV FROM cycles ORDER BY seq').all() as Array<Pick<CycleReading, 't' | 'alphaDeg' | 'rampPeakV' | 'controlV'>>;
    const crcRows = (db.prepare("SELECT coalesce(sum(count), 0) AS n FROM link_events WHERE kind = 'crc-failures'").get() as { n: number }).n;
    const transferPoints = (db.prepare('SELECT count(*) AS n FROM transfer_points').get() as { n: number }).n;
    db.close();

    // At 50 Hz, 2.5 s minus the analysis warm-up gives over 100 cycles on an idle machine; on a loaded one (the full
    // suite beside the simulated-chip tests on two cores) the port opening and the first lines can take over a second,
    // so the floor is 25: enough cycles for the value-for-value comparison below to mean something.
    expect(stored.length).toBeGreaterThan(25);
    const expected = offlineCycles(paced.sent).slice(0, stored.length);
    // Same lines, same pure analysis: the stored cycles are the offline ones, value for value.
    expect(stored).toEqual(expected.map((cycle) => ({ t: cycle.t, alphaDeg: cycle.alphaDeg, rampPeakV: cycle.rampPeakV, controlV: cycle.controlV })));
    expect(result.session).toMatchObject({ unit: 'RW-0142', status: 'closed', cycles: stored.length, operator: 'bench 4' });
    // The corrupt-blocks fault hit some lines (2 % each, seeded); every CRC failure the decoder saw is in the logbook.
    expect(result.decoder.crcFailures).toBeGreaterThan(0);
    expect(crcRows).toBe(result.decoder.crcFailures);
    expect(result.session.linkErrors).toBeGreaterThanOrEqual(result.decoder.crcFailures);
    // The swept control voltage gave a transfer point for every fired cycle.
    expect(transferPoints).toBe(stored.filter((cycle) => cycle.alphaDeg !== null && cycle.controlV !== null).length);
    // The readings summary was stored with the session.
    const logbook = await openSqliteLogbook(dbPath);
    const detail = await logbook.session(result.session.id);
    await logbook.close();
    expect(detail?.readings?.cycles).toBe(result.readings.cycles);
    expect(detail?.linkEvents[0]).toMatchObject({ kind: 'opened', detail: rig.pair.hostPath });
  });

  it('closes the session cleanly on Ctrl-C (SIGINT) from the command line', async () => {
    const paced = paceVirtualLogger(rig.logger, { seed: 3, autostart: false });
    const dbPath = join(rig.folder, 'logbook.sqlite');
    const root = resolve(__dirname, '../../..');
    const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'main/cli/rampwright.ts'), 'record', '--port', rig.pair.hostPath, '--db', dbPath, '--unit', 'RW-0311', '--design', designPath], {
      cwd: root,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    const exited = new Promise<number | null>((resolveExit) => child.on('exit', (code) => resolveExit(code)));
    // Wait until cycles have reached the logbook, then interrupt.
    const cyclesStored = (): number => {
      try {
        const db = new Database(dbPath, { readonly: true, fileMustExist: true });
        try {
          return (db.prepare('SELECT count(*) AS n FROM cycles').get() as { n: number }).n;
        } finally {
          db.close();
        }
      } catch {
        return 0;
      }
    };
    const deadline = Date.now() + 25_000;
    while (cyclesStored() < 20 && Date.now() < deadline) await new Promise((resolveWait) => setTimeout(resolveWait, 100));
    const cyclesBeforeInterrupt = cyclesStored();
    child.kill('SIGINT');
    const code = await Promise.race([exited, new Promise<string>((resolveLate) => setTimeout(() => resolveLate('still running'), 10_000))]);
    if (code === 'still running') child.kill('SIGKILL');
    expect(cyclesBeforeInterrupt, stderr).toBeGreaterThanOrEqual(20);
    await paced.stop();
    expect(code, stderr).toBe(0);
    expect(stdout).toMatch(/^Session 1 of unit RW-0311 closed: \d+ cycles/);
    const logbook = await openSqliteLogbook(dbPath);
    const [row] = await logbook.listSessions();
    await logbook.close();
    expect(row.status).toBe('closed');
    expect(row.cycles).toBeGreaterThanOrEqual(20);
    expect(row.endedAt).not.toBeNull();
  }, 40_000);

  it('refuses a missing port before it starts a session', async () => {
    const dbPath = join(rig.folder, 'logbook.sqlite');
    await expect(recordSession({ port: join(rig.folder, 'ttyACM9'), db: dbPath, unit: 'RW-0142', designPath })).rejects.toThrow(/ttyACM9: no such serial device/);
    const logbook = await openSqliteLogbook(dbPath);
    expect(await logbook.listSessions()).toEqual([]);
    await logbook.close();
  });
});
