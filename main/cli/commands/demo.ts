/**
 * `rampwright demo [--db <file>] [--json]`: the main job on the virtual board, two stories (main/session/
 * commissioningDemo.ts): a unit with a wrong part (diagnosed, measured, replaced) and one whose parts in tolerance
 * stack up (trimmed), each commissioned step by step (sync, ramp, trim plan and its first change fitted and
 * re-checked, transfer sweep, limits, sign-off) through the bench API, faster than real time, into a logbook in the
 * user's data folder.
 */
import { homedir } from 'node:os';
import { join } from 'node:path';
import { logbookDisplayLocation, resolveLogbookLocation } from '../../store/index';
import { localFirst, pushAfterSession } from './push';
import type { Command } from 'commander';
import { signOffExceptionText } from '../../../app/bench/signOffGate';
import { outcomeWords, verdictWords, type StepReport, type Verdict } from '../../../app/contract';
import { faultDescriptions, type FaultName } from '../../../app/sim';
import { openBenchContext } from '../../session/benchContext';
import { demoStories, runDemoStories, type DemoReport } from '../../session/commissioningDemo';
import { recordedPartName, recordedPartValue } from '../../../app/board/partNames';
import { defaultLogbookFileName, userDataFolder } from '../../session/dataFolder';
import { safetyNoteLines } from '../../session/safetyNote';
import { jsonOutput } from '../jsonOutput';

interface DemoOptions {
  db?: string;
  pushTo?: string;
  json?: boolean;
}

export function defaultLogbookPath(): string {
  return join(userDataFolder({ platform: process.platform, env: process.env, home: homedir() }), defaultLogbookFileName);
}

const verdictMarks: Record<Verdict, string> = { 'in-tolerance': '[ok]', marginal: '[~]', 'out-of-tolerance': '[x]', 'not-measured': '[ ]' };
const verdictLine = (verdict: Verdict): string => `${verdictMarks[verdict]} ${verdictWords[verdict].phrase}`;
const stepTitles: Record<StepReport['step'], string> = { sync: '1 Sync', ramp: '2 Ramp', trim: '3 Trim', transfer: '4 Transfer', limits: '5 Limits', 'sign-off': '6 Sign-off' };

function value(report: StepReport | undefined, key: string, digits: number): string {
  const reading = report?.readings.find((candidate) => candidate.key === key);
  return reading?.value === null || reading?.value === undefined ? '-' : reading.value.toFixed(digits);
}

function verdictText(verdict: Verdict | null | undefined): string {
  return verdictLine(verdict ?? 'not-measured');
}

/** The sign-off line: the outcome, or the gate's refusal with what stood in the way. */
function signOffLine(report: DemoReport): [string, string] {
  if (report.session.outcome === 'signed-off') return ['[ok] signed off', `every step recorded and within tolerance; session ${report.session.id}, ${report.session.cycles} cycles recorded`];
  const refused = report.signOffGate.exceptions.map(signOffExceptionText).join('; ');
  return ['[x] sign-off refused', `${refused}: closed without sign-off (${outcomeWords[report.session.outcome].phrase}); a failing step is never signed off without a written reason`];
}

/** Where the trim step says what was found and what was done, in the technician's words. */
function trimDetail(report: DemoReport): string {
  const change = report.change;
  if (!change) return 'no change needed';
  // A replaced part's reading is in the repair's own words ("measured 273n"): said once.
  const measured = Object.entries(report.measuredParts)
    .filter(([part]) => !(change.kind === 'repair' && part === change.part))
    .map(([part, partValue]) => `measured the ${recordedPartName(null, part)}: ${recordedPartValue(part, partValue as number)}; `)
    .join('');
  return `${measured}${change.kind === 'repair' ? 'repaired' : 'trimmed'}: ${change.reason}`;
}

/** One unit's story: its steps, verdicts and the change made. */
export function demoUnitLines(report: DemoReport, story: string): string[] {
  const steps = new Map(report.steps.map((step) => [step.step, step]));
  const sync = steps.get('sync');
  const ramp = steps.get('ramp');
  const transfer = steps.get('transfer');
  const limits = steps.get('limits');
  const rows: Array<[string, string, string]> = [
    [stepTitles.sync, verdictText(sync?.verdict ?? null), `mains ${value(sync, 'frequencyHz', 2)} Hz`],
    [stepTitles.ramp, verdictText(ramp?.verdict ?? null), `peak ${report.rampPeakBeforeV?.toFixed(2) ?? '-'} V before the change (${verdictLine(report.rampVerdictBefore ?? 'not-measured')}), ${report.rampPeakAfterV?.toFixed(2) ?? '-'} V after (target ${ramp?.readings.find((reading) => reading.key === 'rampPeakV')?.expected?.toFixed(2) ?? '-'} V)`],
    [stepTitles.trim, verdictText(steps.get('trim')?.verdict ?? null), trimDetail(report)],
    [stepTitles.transfer, verdictText(transfer?.verdict ?? null), report.transferFit ? `gain ${report.transferFit.gainDegPerV.toFixed(2)} deg/V, offset ${report.transferFit.offsetDeg.toFixed(2)} deg, ${report.transferFit.points} points` : 'no sweep'],
    [stepTitles.limits, verdictText(limits?.verdict ?? null), `alpha ${value(limits, 'alphaMinDeg', 1)} to ${value(limits, 'alphaMaxDeg', 1)} deg, gate pulse ${value(limits, 'pulseWidthUs', 0)} us`],
    [stepTitles['sign-off'], ...signOffLine(report)],
  ];
  const width = Math.max(...rows.map((row) => row[1].length));
  return [
    `Unit ${report.session.unit}: ${story}`,
    `Virtual board fault: ${report.faults.map((fault) => `${fault} (${faultDescriptions[fault as FaultName] ?? 'our scenario'})`).join('; ')}`,
    `First plan: ${report.firstPlan.summary}`,
    ...rows.map(([title, verdict, detail]) => `${title.padEnd(11)} ${verdict.padEnd(width)}  ${detail}`),
  ];
}

export function demoSummaryLines(reports: readonly DemoReport[], logbookPath: string, elapsedS: number): string[] {
  const first = reports[0];
  return [
    `Rampwright demo: commissioning ${reports.length} units of ${first?.designName ?? 'the demo design'} on the virtual board`,
    ...reports.flatMap((report, index) => ['', ...demoUnitLines(report, demoStories[index]?.story ?? 'our scenario')]),
    '',
    `Logbook: ${logbookPath} (${reports.map((report) => `session ${report.session.id} ${outcomeWords[report.session.outcome].phrase}`).join(', ')})`,
    `Simulated ${reports.reduce((sum, report) => sum + report.signalSeconds, 0).toFixed(1)} s of board signal in ${elapsedS.toFixed(1)} s.`,
    'Next: rampwright log --db <logbook> to list sessions, rampwright serve --demo for the screens in a browser.',
  ];
}

export function registerDemoCommand(program: Command): void {
  program
    .command('demo')
    .description('Commission two units on the virtual board from start to sign-off and log them (no hardware needed)')
    .option('--db <file|address>', 'logbook file (default: logbook.sqlite in your data folder); given a shared logbook\'s postgres:// address, the sessions are recorded into that default file and pushed there')
    .option('--push-to <address>', 'push the sessions to a shared logbook (postgres://...) afterwards')
    .option('--json', 'print the result as JSON')
    .action(async (options: DemoOptions) => {
      const target = localFirst(options.db, options.pushTo, defaultLogbookPath());
      const logbookPath = resolveLogbookLocation(target.db);
      const startedMs = Date.now();
      const context = await openBenchContext({ logbookPath, virtualPaced: false });
      let reports: DemoReport[];
      try {
        reports = await runDemoStories(context);
      } finally {
        await context.close();
      }
      const elapsedS = (Date.now() - startedMs) / 1000;
      const pushLines = target.pushTo === undefined ? [] : await pushAfterSession(logbookPath, target.pushTo);
      if (options.json) {
        const units = reports.map((report, index) => ({
          story: demoStories[index]?.story ?? null,
          session: report.session,
          signOffGate: report.signOffGate,
          faults: report.faults,
          steps: report.steps.map((step) => ({ step: step.step, status: step.status, verdict: step.verdict, readings: step.readings.map(({ key, value: reading, unit, expected, verdict }) => ({ key, value: reading, unit, expected, verdict })) })),
          firstPlan: { status: report.firstPlan.status, summary: report.firstPlan.summary },
          measuredParts: report.measuredParts,
          change: report.change && { kind: report.change.kind, part: report.change.part, partRef: report.change.partRef, method: report.change.method, fromOhm: report.change.fromOhm, toOhm: report.change.toOhm, fromFarad: report.change.fromFarad, toFarad: report.change.toFarad, addOhm: report.change.addOhm, series: report.change.series, predictedPeakV: report.change.predictedPeakV, reason: report.change.reason },
          rampPeakBeforeV: report.rampPeakBeforeV,
          rampPeakAfterV: report.rampPeakAfterV,
          transfer: report.transferFit,
        }));
        process.stdout.write(jsonOutput({ logbook: logbookDisplayLocation(logbookPath), design: reports[0]?.designName ?? null, units, safety: safetyNoteLines, ...(target.pushTo === undefined ? {} : { pushed: pushLines }) }));
        return;
      }
      process.stdout.write(`${[...safetyNoteLines, '', ...demoSummaryLines(reports, logbookDisplayLocation(logbookPath), elapsedS), ...pushLines].join('\n')}\n`);
    });
}
