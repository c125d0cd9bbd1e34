/**
 * `rampwright trim --design <file> --capture <file>`: measure the capture, say whether a part is off (measure and
 * replace it) or the parts stack up (a bias trim), and list the changes in standard values that bring the ramp to
 * its target (app/board/trimPlan.ts). The capture is read block by block (main/capture) into the analysis engine (app/bench).
 */
import type { Command } from 'commander';
import type { ESeriesName } from '../../../app/board/eSeries';
import { formatVolt } from '../../../app/board/formatValues';
import type { RampReadings } from '../../../app/board/rampReadings';
import { parseMeasuredParts } from '../../../app/board/measuredParts';
import type { PartOverrides } from '../../../app/board/parts';
import { planTrim, type TrimPlan } from '../../../app/board/trimPlan';
import { createCaptureAnalyzer } from '../../../app/bench/captureAnalyzer';
import type { CaptureReadings } from '../../../app/bench/readings';
import { InputError } from '../../../app/errors';
import { loadBoardDesign } from '../../board/loadBoardDesign';
import { openCaptureFile } from '../../capture/readCaptureFile';
import { addCaptureOptions, captureReadOptions, type CaptureCommandOptions } from '../captureOptions';
import { createProgressBar } from '../progressBar';
import { jsonOutput } from '../jsonOutput';

interface TrimOptions extends CaptureCommandOptions {
  design: string;
  capture: string;
  series: string;
  json?: boolean;
  part: string[];
}

const allowedSeries = ['E12', 'E24', 'E96'] as const;

/** The ramp readings the trim plan needs, or an InputError saying which reading the capture lacks. */
export function rampReadingsOf(readings: CaptureReadings, capturePath: string): RampReadings {
  const ramp = readings.ramp;
  if (ramp.peakV === null || ramp.floorV === null || ramp.slopeVPerMs === null) {
    throw new InputError('no complete ramp found (is the ramp test point connected, and the capture a few mains cycles long?)', capturePath);
  }
  return { floorV: ramp.floorV, peakV: ramp.peakV, slopeVPerMs: ramp.slopeVPerMs, startDelayDeg: ramp.startDelayDeg ?? undefined, clipped: ramp.clipped };
}

function printHuman(plan: TrimPlan, ramp: RampReadings): void {
  const lines = [
    `Measured ramp: floor ${(ramp.floorV * 1000).toFixed(1)} mV, peak ${formatVolt(ramp.peakV)}, slope ${ramp.slopeVPerMs.toFixed(3)} V/ms${ramp.clipped ? ', clipped' : ''}`,
    plan.summary,
  ];
  plan.suggestions.forEach((suggestion, index) => lines.push(`  ${index + 1}. ${suggestion.reason}`));
  if (plan.controlLimit) lines.push(`Control limit: ${plan.controlLimit.reason}`);
  // The reasoning after the advice, each thing once (the plan's notes).
  for (const note of plan.notes) lines.push(`Note: ${note}`);
  process.stdout.write(`${lines.join('\n')}\n`);
}

export function registerTrimCommand(program: Command): void {
  const command = program
    .command('trim')
    .description('Measure a capture against its board design and say which resistor to change, to which standard value')
    .requiredOption('--design <file>', 'board design (*.board.json)')
    .requiredOption('--capture <file>', 'capture (.csv, or COMTRADE .cfg/.dat)')
    .option('--series <name>', 'E-series to pick values from: E12, E24 or E96', 'E24')
    .option('--part <designator=value>', 'a part value measured on the board, by its designator as marked (R7=5k1, C3=560n); repeat for more', (entry: string, entries: string[]) => [...entries, entry], [])
    .option('--json', 'print the plan as JSON');
  addCaptureOptions(command).action(async (options: TrimOptions) => {
    const series = options.series.toUpperCase();
    if (!(allowedSeries as readonly string[]).includes(series)) throw new InputError(`"${options.series}" is not one of E12, E24, E96`, '--series');
    const design = await loadBoardDesign(options.design);
    const read = captureReadOptions(options, design);
    // Checked before the capture is read, so a mistyped value is named at once.
    const measured: PartOverrides = parseMeasuredParts(design, options.part);
    const analyzer = createCaptureAnalyzer({ rectifier: design.rectifier, syncPhaseDeg: design.syncPhaseDeg, keepPerCycle: false });
    const progress = createProgressBar(process.stderr, { enabled: !options.json, label: 'Reading' });
    try {
      const capture = await openCaptureFile(options.capture, { ...read, onProgress: progress.update });
      for await (const block of capture.blocks) analyzer.push(block);
    } finally {
      progress.done();
    }
    const readings = analyzer.finish();
    // A capture of another board type would give a confident but wrong plan: the mains frequency tells them apart.
    if (readings.frequencyHz !== null && Math.abs(readings.frequencyHz - design.mainsHz) > 3) {
      throw new InputError(`the capture's mains is ${readings.frequencyHz.toFixed(1)} Hz but ${options.design} is a ${design.mainsHz} Hz design: wrong design file?`, options.capture);
    }
    const ramp = rampReadingsOf(readings, options.capture);
    const plan = planTrim(design, ramp, { series: series as ESeriesName, fitted: measured, measured });
    if (options.json) {
      process.stdout.write(jsonOutput({ ...plan, design: options.design, capture: options.capture, measuredParts: measured, ramp: readings.ramp }));
    } else {
      printHuman(plan, ramp);
    }
  });
}
