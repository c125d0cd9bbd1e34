// `rampwright demo` end to end: the summary a technician reads, the safety note once, and a closed session with
// its trim in the logbook of the user's data folder (or --db). Runs the command function in-process.
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { demoSummaryLines } from '../../../main/cli/commands/demo';
import { openRecordSources } from '../../../main/record/openRecordSources';
import { fleetReport } from '../../../main/record/recall';
import { openBenchContext } from '../../../main/session/benchContext';
import { runCommissioningDemo, type DemoReport } from '../../../main/session/commissioningDemo';
import { runCli as runInProcess } from './cliRun';

const folder = mkdtempSync(join(tmpdir(), 'rampwright-demo-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('rampwright demo', () => {
  it('commissions the demo unit into the data folder and prints the summary and the safety note once', async () => {
    const dataHome = join(folder, 'xdg');
    const { code, stdout, stderr } = await runInProcess(['demo'], { XDG_DATA_HOME: dataHome });
    expect(stderr).toBe('');
    expect(code).toBe(0);
    // XDG Base Directory: $XDG_DATA_HOME/rampwright on Linux.
    const logbookPath = join(dataHome, 'rampwright', 'logbook.sqlite');
    expect(existsSync(logbookPath)).toBe(true);
    expect(stdout).toContain(`Logbook: ${logbookPath}`);
    expect(stdout.match(/Safety when measuring/g)).toHaveLength(1);
    expect(stdout).toMatch(/isolated source/);
    expect(stdout).toMatch(/differential or isolated probes/);
    expect(stdout).toMatch(/local electrical codes and licensed practice/);
    for (const step of ['1 Sync', '2 Ramp', '3 Trim', '4 Transfer', '5 Limits', '6 Sign-off']) expect(stdout).toContain(step);
    expect(stdout).toMatch(/before the trim \(\[x\] out of tolerance\)/);
    expect(stdout).toMatch(/fitted: .*rEmitter \(R14\)/);
    expect(stdout).toMatch(/6 Sign-off\s+\[ok\] signed off\s+every step recorded and within tolerance/);

    const logbook = await openSqliteLogbook(logbookPath);
    try {
      const sessions = await logbook.listSessions();
      expect(sessions).toHaveLength(1);
      // Every step recorded and in tolerance after the trim: the gate clears and the unit is signed off.
      expect(sessions[0]).toMatchObject({ unit: 'CH50H-0042', status: 'closed', outcome: 'signed-off' });
      const detail = await logbook.session(sessions[0].id);
      expect(detail?.trims).toHaveLength(1);
      expect(detail?.transfer.points.length).toBeGreaterThan(100);
    } finally {
      await logbook.close();
    }
  });

  it('with --db and --json: every step in tolerance after the trim, the ramp on its target', async () => {
    const dbPath = join(folder, 'json', 'bench.sqlite');
    const { code, stdout } = await runInProcess(['demo', '--db', dbPath, '--json'], {});
    expect(code).toBe(0);
    const result = JSON.parse(stdout) as {
      logbook: string;
      session: { status: string; cycles: number };
      steps: Array<{ step: string; verdict: string | null }>;
      rampPeakBeforeV: number;
      rampPeakAfterV: number;
      trim: { part: string; series: string } | null;
      safety: string[];
    };
    expect(result.logbook).toBe(dbPath);
    expect(result.session.status).toBe('closed');
    // The fault: the ramp capacitor 30 % low makes the ramp about 1/0.7 times its 7.3 V target (board model).
    expect(result.rampPeakBeforeV).toBeGreaterThan(7.3 * 1.3);
    // After the first suggestion: within the design's 3 % ramp peak tolerance (fixtures/boards/charger-ch50h).
    expect(Math.abs(result.rampPeakAfterV - 7.3) / 7.3).toBeLessThan(0.03);
    expect(result.trim).toMatchObject({ part: 'rEmitter', series: 'E24' });
    expect(result.steps.filter((step) => step.step !== 'sign-off').map((step) => step.verdict)).toEqual(['in-tolerance', 'in-tolerance', 'in-tolerance', 'in-tolerance', 'in-tolerance']);
    expect(result.safety.length).toBeGreaterThan(3);

    // The logbook keeps every cycle, and a transfer curve of the trimmed board only: the charging ramp is linear
    // (board model), so alpha is a straight line in the control voltage to within the design's 2 deg alpha
    // tolerance; points from before the trim (a ramp 43 % taller) would sit tens of degrees off that line.
    const logbook = await openSqliteLogbook(dbPath);
    try {
      const stored = await logbook.listSessions();
      const detail = await logbook.session(stored[0].id);
      expect(detail?.transfer.fit?.maxDeviationDeg).toBeLessThan(2);
      expect((await logbook.cycleReadings(stored[0].id)).length).toBe(result.session.cycles);
    } finally {
      await logbook.close();
    }

    // `log --json`: the ramp peak as recorded after the trim (within the 3 % tolerance of 7.3 V), not the whole
    // session's median, which the cycles before the trim (about 1/0.7 of the target) pull up.
    const listing = await runInProcess(['log', '--db', dbPath, '--json'], {});
    const [row] = (JSON.parse(listing.stdout) as { sessions: Array<{ outcome: string; rampPeakV: number; wholeSession: { rampPeakMedianV: number } }> }).sessions;
    expect(row.outcome).toBe('signed-off');
    expect(Math.abs(row.rampPeakV - 7.3) / 7.3).toBeLessThan(0.03);
    expect(row.rampPeakV).toBeCloseTo(result.rampPeakAfterV, 12);
    // The fleet places the unit by its recorded ramp, inside the board model's prediction: no outlier.
    const sources = await openRecordSources(dbPath);
    try {
      const fleet = await fleetReport(sources, 'Charger firing board CH-50H (demo)', { unitSerial: 'CH50H-0042', runs: 200 });
      const peak = fleet.figures.find((figure) => figure.key === 'rampPeakV')!;
      expect(peak.values).toEqual([row.rampPeakV]);
      expect(peak.outliers).toBe(0);
      // Within 3 standard deviations of the Monte Carlo prediction (the outlier rule of app/record/fleet.ts).
      expect(Math.abs(peak.marked!.predictionZ!)).toBeLessThan(3);
    } finally {
      await sources.close();
    }
  });

  it('a unit that fails a step is never signed off silently: the demo shows the refusal and closes without sign-off', async () => {
    const context = await openBenchContext({ logbookPath: join(folder, 'gate', 'bench.sqlite'), virtualPaced: false });
    let report: DemoReport;
    try {
      // Our scenario: the pulse stage drops pulses, so the limits step finds missing pulses whatever the trim does.
      report = await runCommissioningDemo(context, { faults: ['capacitor-low', 'missing-pulses'] });
    } finally {
      await context.close();
    }
    expect(report.signOffGate.clear).toBe(false);
    expect(report.signOffGate.exceptions.map((exception) => exception.step)).toContain('limits');
    expect(report.session).toMatchObject({ status: 'closed', outcome: 'closed', signOffReason: null });
    const lines = demoSummaryLines(report, 'bench.sqlite', 1).join('\n');
    expect(lines).toMatch(/6 Sign-off\s+\[x\] sign-off refused\s+.*Check limits and pulses: out of tolerance \(.*Missing pulses.*\)/);
    expect(lines).toMatch(/closed without sign-off/);
  }, 60_000);
});
