/**
 * `rampwright demo [--db <file>] [--json]`: the main job on the virtual board. A unit whose ramp capacitor is low
 * is commissioned step by step (sync, ramp, trim plan and the first suggestion fitted and re-checked, transfer
 * sweep, limits, sign-off) through the bench API, faster than real time, into a logbook in the user's data folder.
 */
import { homedir } from 'node:os';
import { join } from 'node:path';
import { logbookDisplayLocation, resolveLogbookLocation } from '../../store/index';
import { localFirst, pushAfterSession } from './push';
import type { Command } from 'commander';
import type { StepReport, Verdict } from '../../../app/contract';
import { faultDescriptions, type FaultName } from '../../../app/sim';
import { openBenchContext } from '../../session/benchContext';
import { runCommissioningDemo, type DemoReport } from '../../session/commissioningDemo';
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

const verdictWords: Record<Verdict, string> = { 'in-tolerance': '[ok] in tolerance', marginal: '[~] marginal', 'out-of-tolerance': '[x] out of tolerance' };
const stepTitles: Record<StepReport['step'], string> = { sync: '1 Sync', ramp: '2 Ramp', trim: '3 Trim', transfer: '4 Transfer', limits: '5 Limits', 'sign-off': '6 Sign-off' };

function value(report: StepReport | undefined, key: string, digits: number): string {
  const reading = report?.readings.find((candidate) => candidate.key === key);
  return reading?.value === null || reading?.value === undefined ? '-' : reading.value.toFixed(digits);
}

function verdictText(verdict: Verdict | null): string {
  return verdict ? verdictWords[verdict] : '(nothing measured)';
}

export function demoSummaryLines(report: DemoReport, logbookPath: string, elapsedS: number): string[] {
  const steps = new Map(report.steps.map((step) => [step.step, step]));
  const first = report.trimPlan.suggestions[0];
  const sync = steps.get('sync');
  const ramp = steps.get('ramp');
  const transfer = steps.get('transfer');
  const limits = steps.get('limits');
  const rows: Array<[string, string, string]> = [
    [stepTitles.sync, verdictText(sync?.verdict ?? null), `mains ${value(sync, 'frequencyHz', 2)} Hz`],
    [stepTitles.ramp, verdictText(ramp?.verdict ?? null), `peak ${report.rampPeakBeforeV?.toFixed(2) ?? '-'} V before the trim (${report.rampVerdictBefore ? verdictWords[report.rampVerdictBefore] : 'not measured'}), ${report.rampPeakAfterV?.toFixed(2) ?? '-'} V after (target ${ramp?.readings.find((reading) => reading.key === 'rampPeakV')?.expected?.toFixed(2) ?? '-'} V)`],
    [stepTitles.trim, verdictText(steps.get('trim')?.verdict ?? null), first ? `fitted: ${first.reason}` : 'no trim needed'],
    [stepTitles.transfer, verdictText(transfer?.verdict ?? null), report.transferFit ? `gain ${report.transferFit.gainDegPerV.toFixed(2)} deg/V, offset ${report.transferFit.offsetDeg.toFixed(2)} deg, ${report.transferFit.points} points` : 'no sweep'],
    [stepTitles.limits, verdictText(limits?.verdict ?? null), `alpha ${value(limits, 'alphaMinDeg', 1)} to ${value(limits, 'alphaMaxDeg', 1)} deg, gate pulse ${value(limits, 'pulseWidthUs', 0)} us`],
    [stepTitles['sign-off'], report.session.status === 'closed' ? '[ok] signed off' : report.session.status, `session ${report.session.id} ${report.session.status}, ${report.session.cycles} cycles recorded`],
  ];
  const width = Math.max(...rows.map((row) => row[1].length));
  return [
    `Rampwright demo: commissioning unit ${report.session.unit} (${report.designName}) on the virtual board`,
    `Virtual board fault: ${report.faults.map((fault) => `${fault} (${faultDescriptions[fault as FaultName] ?? 'our scenario'})`).join('; ')}`,
    '',
    ...rows.map(([title, verdict, detail]) => `${title.padEnd(11)} ${verdict.padEnd(width)}  ${detail}`),
    '',
    `Logbook: ${logbookPath} (session ${report.session.id}, ${report.session.status})`,
    `Simulated ${report.signalSeconds.toFixed(1)} s of board signal in ${elapsedS.toFixed(1)} s.`,
    'Next: rampwright log --db <logbook> to list sessions, rampwright serve --demo for the screens in a browser.',
  ];
}

export function registerDemoCommand(program: Command): void {
  program
    .command('demo')
    .description('Commission a unit on the virtual board from start to sign-off and log it (no hardware needed)')
    .option('--db <file|address>', 'logbook file (default: logbook.sqlite in your data folder); given a shared logbook\'s postgres:// address, the session is recorded into that default file and pushed there')
    .option('--push-to <address>', 'push the session to a shared logbook (postgres://...) afterwards')
    .option('--json', 'print the result as JSON')
    .action(async (options: DemoOptions) => {
      const target = localFirst(options.db, options.pushTo, defaultLogbookPath());
      const logbookPath = resolveLogbookLocation(target.db);
      const startedMs = Date.now();
      const context = await openBenchContext({ logbookPath, virtualPaced: false });
      let report: DemoReport;
      try {
        report = await runCommissioningDemo(context);
      } finally {
        await context.close();
      }
      const elapsedS = (Date.now() - startedMs) / 1000;
      const pushLines = target.pushTo === undefined ? [] : await pushAfterSession(logbookPath, target.pushTo);
      if (options.json) {
        const steps = report.steps.map((step) => ({ step: step.step, status: step.status, verdict: step.verdict, readings: step.readings.map(({ key, value: reading, unit, expected, verdict }) => ({ key, value: reading, unit, expected, verdict })) }));
        const trim = report.trimPlan.suggestions[0] ?? null;
        process.stdout.write(
          jsonOutput(
            {
              logbook: logbookDisplayLocation(logbookPath),
              session: report.session,
              design: report.designName,
              faults: report.faults,
              steps,
              trim: trim && { part: trim.part, partRef: trim.partRef, method: trim.method, fromOhm: trim.fromOhm, toOhm: trim.toOhm, addOhm: trim.addOhm, series: trim.series, predictedPeakV: trim.predictedPeakV, reason: trim.reason },
              rampPeakBeforeV: report.rampPeakBeforeV,
              rampPeakAfterV: report.rampPeakAfterV,
              transfer: report.transferFit,
              safety: safetyNoteLines,
              ...(target.pushTo === undefined ? {} : { pushed: pushLines }),
            },
          ),
        );
        return;
      }
      process.stdout.write(`${[...safetyNoteLines, '', ...demoSummaryLines(report, logbookDisplayLocation(logbookPath), elapsedS), ...pushLines].join('\n')}\n`);
    });
}
