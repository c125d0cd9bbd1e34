/**
 * `rampwright sim --firmware <image.hex> --link <pty>` with `rampwright record --port <pty>` on the other end of a
 * socat pseudo-terminal pair (Debian package): the real logger firmware, built from source and run on the simulated
 * chip against the virtual board, recorded into a logbook whose readings must match the board's truth.
 */
import Database from 'better-sqlite3';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { predictRamp } from '../../../app/board/rampModel';
import { recordSession, type RecordResult } from '../../../main/cli/commands/record';
import { startPtyPair, type PtyPair } from '../../helpers/socat';
import { buildFirmware, hexPath } from '../firmware/firmwareBuild';
import { runCli as run } from './cliRun';
import { chargerBoard, designPath } from './recordKit';

let folder = '';

beforeAll(() => {
  buildFirmware();
  folder = mkdtempSync(join(tmpdir(), 'rampwright-sim-firmware-'));
});
afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('rampwright sim --firmware, checked options', () => {
  it.each([
    [['--firmware', 'x.hex', '--out', 'x.csv'], /--firmware: streams to a link: give --link <device path>/],
    [['--firmware', 'x.hex', '--link', '/tmp', '--rate', '5000'], /--rate: the firmware sets its sample rate \(send it `rate <Hz>` from the host\)/],
    [['--firmware', 'x.hex', '--link', '/tmp', '--fault', 'drop-blocks'], /--fault: drop-blocks belongs to the virtual logger's link/],
  ])('%j is refused with exit 2 and a message naming the problem', async (extra, message) => {
    const result = await run(['sim', '--design', designPath, ...extra]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(message);
  });

  it('names a missing or damaged image', async () => {
    const missing = await run(['sim', '--design', designPath, '--firmware', join(folder, 'none.hex'), '--link', join(folder, 'none')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/none\.hex: no such file; build it with `npm run firmware`/);
    const damaged = join(folder, 'damaged.hex');
    writeFileSync(damaged, ':100000000C9434000C9446000C9446000C944600AA\n:00000001FF\n');
    const bad = await run(['sim', '--design', designPath, '--firmware', damaged, '--link', join(folder, 'none')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/damaged\.hex, line 1: fails its checksum/);
  });
});

describe('rampwright sim --firmware with record on a socat pair', () => {
  let pair: PtyPair;
  let recorded: RecordResult;
  let simOutput = '';

  beforeAll(async () => {
    pair = await startPtyPair(join(folder, 'host'), join(folder, 'logger'));
    const stopRecording = new AbortController();
    // The recorder opens its end first and asks the logger to start (and, seeing its greeting, for the edges).
    const recording = recordSession({ port: pair.hostPath, db: join(folder, 'bench.sqlite'), unit: 'CH50H-0007', designPath, operator: 'bench 2', signal: stopRecording.signal });
    await new Promise((resolve) => setTimeout(resolve, 300));
    const sim = await run(['sim', '--design', designPath, '--firmware', hexPath, '--link', pair.loggerPath, '--seconds', '1.3', '--seed', '3']);
    simOutput = sim.stderr;
    expect(sim.code).toBe(0);
    await new Promise((resolve) => setTimeout(resolve, 500));
    stopRecording.abort();
    recorded = await recording;
  }, 300_000);

  afterAll(async () => {
    await pair?.stop();
  });

  it('streams the firmware and answers the recorder\'s commands', () => {
    expect(simOutput).toMatch(/logger firmware .*rampwright-logger\.hex on a simulated ATmega328P measuring "Charger firing board CH-50H \(demo\)"/);
    expect(simOutput).toMatch(/logger firmware stopped after 1\.3\d s: \d+ data lines sent, [2-9]\d* commands answered/);
    expect(recorded.decoder.crcFailures).toBe(0);
    expect(recorded.decoder.edges).toBeGreaterThan(50);
  });

  it('records readings that match the virtual board: alpha from the timed edges, ramp peak, pulse width', () => {
    const design = chargerBoard();
    const readings = recorded.readings;
    console.log(`record on sim --firmware: ${readings.firingIntervals} firing intervals, ${readings.timedIntervals ?? 0} timed; alpha ${readings.pulse.alphaDeg?.toFixed(3)} deg, ramp peak ${readings.ramp.peakV?.toFixed(4)} V`);
    // The recorder asks for the edges when it sees the greeting; the chip keeps running while the request travels
    // (the simulation runs in 50 ms steps), so the intervals of the first 0.2 s (10 at 50 Hz) may come from samples.
    expect(readings.timedIntervals).toBeGreaterThanOrEqual(readings.firingIntervals - 10);
    // The virtual board's default control voltage fires the design as designed at 90 degrees (virtualBoard.ts).
    // Every timed interval within 0.1 deg: the logbook holds each cycle's alpha, and at least as many as were timed
    // are that close (those read from samples before the edges came may be too, by chance).
    const db = new Database(join(folder, 'bench.sqlite'), { readonly: true });
    const alphas = (db.prepare('SELECT alpha_deg AS alphaDeg FROM cycles WHERE alpha_deg IS NOT NULL').all() as Array<{ alphaDeg: number }>).map((row) => row.alphaDeg);
    db.close();
    expect(alphas.length).toBe(readings.firingIntervals);
    expect(alphas.filter((alphaDeg) => Math.abs(alphaDeg - 90) < 0.1).length).toBeGreaterThanOrEqual(readings.timedIntervals!);
    // The mean: the timed intervals within 0.1 deg, the few from samples within a sample each (below).
    const untimedShare = (readings.firingIntervals - readings.timedIntervals!) / readings.firingIntervals;
    expect(Math.abs(readings.pulse.alphaDeg! - 90)).toBeLessThan(0.1 + untimedShare * 2.88);
    // Every interval, timed or not, within the sampling limit: one sample at 6 250 samples/s is 2.88 degrees at 50 Hz.
    expect(Math.abs(readings.pulse.alphaMaxDeg! - 90)).toBeLessThan(2.88);
    expect(Math.abs(readings.pulse.alphaMinDeg! - 90)).toBeLessThan(2.88);
    // One ADC code at the ramp test point (firmware/README.md) plus 0.5 %.
    const peakV = predictRamp(design).peakV;
    expect(Math.abs(readings.ramp.peakV! - peakV)).toBeLessThanOrEqual(0.02492 + 0.005 * peakV);
    // Timed pulses to a microsecond; the few read from samples before the edges came, within a sample (160 us).
    expect(Math.abs(readings.pulse.widthUs! - design.gatePulseUs)).toBeLessThan(1 + untimedShare * 160);
  });
});
