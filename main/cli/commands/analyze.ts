/**
 * `rampwright analyze <capture>`: reads a capture file block by block (CSV or COMTRADE), runs the analysis engine
 * and prints the readings, with the checks against a board design when one is given. A thin adapter: the
 * measurements are app/bench's, the file reading main/capture's.
 */
import type { Verdict } from '../../../app/contract/readings';
import type { Command } from 'commander';
import { createCaptureAnalyzer } from '../../../app/bench/captureAnalyzer';
import { judgeReadings, type ReadingCheck } from '../../../app/bench/judge';
import type { CaptureReadings, Rectifier } from '../../../app/bench/readings';
import type { BoardDesign } from '../../../app/board/design';
import { InputError } from '../../../app/errors';
import { loadBoardDesign } from '../../board/loadBoardDesign';
import { openCaptureFile, type ReadCaptureOptions } from '../../capture/readCaptureFile';
import { addCaptureOptions, captureReadOptions, type CaptureCommandOptions } from '../captureOptions';
import { createProgressBar } from '../progressBar';
import { jsonOutput } from '../jsonOutput';

interface AnalyzeCommandOptions extends CaptureCommandOptions {
  design?: string;
  json?: boolean;
  rectifier?: string;
}

export interface AnalyzeResult {
  readings: CaptureReadings;
  checks: ReadingCheck[] | null;
  design: BoardDesign | null;
  rectifierSource: 'option' | 'design' | 'default';
  /** How the file was read: columns or channels, units, timing, roles. */
  readAs: string | null;
}

function rectifierOption(text: string | undefined): Rectifier | undefined {
  if (text === undefined) return undefined;
  if (text === 'half-wave' || text === 'full-wave') return text;
  throw new InputError(`must be half-wave or full-wave (got "${text}")`, '--rectifier');
}

export interface AnalyzeOptions {
  designPath?: string;
  sampleRateHz?: number;
  rectifier?: Rectifier;
  /** How to read the file (channel map, CSV dialect); the design's map is added as the default. */
  read?: ReadCaptureOptions;
  onProgress?: (bytesRead: number, totalBytes: number) => void;
}

/** The work of the command without printing: tests and other adapters call it. */
export async function analyzeCapture(path: string, options: AnalyzeOptions = {}): Promise<AnalyzeResult> {
  const design = options.designPath ? await loadBoardDesign(options.designPath) : null;
  const rectifier = options.rectifier ?? design?.rectifier ?? 'full-wave';
  const rectifierSource = options.rectifier ? 'option' : design ? 'design' : 'default';
  const analyzer = createCaptureAnalyzer({ rectifier, syncPhaseDeg: design?.syncPhaseDeg ?? 0, keepPerCycle: true });
  const capture = await openCaptureFile(path, {
    sampleRateHz: options.sampleRateHz,
    ...options.read,
    defaultMap: options.read?.defaultMap ?? design?.channelMap,
    onProgress: options.onProgress,
  });
  let samples = 0;
  for await (const block of capture.blocks) {
    samples += block.sync.length;
    analyzer.push(block);
  }
  if (samples === 0) throw new InputError('the capture holds no samples', path);
  const readings = analyzer.finish();
  return { readings, checks: design ? judgeReadings(readings, design) : null, design, rectifierSource, readAs: capture.readAs() };
}

function fixed(value: number | null, digits: number, unit: string): string {
  return value === null ? '-' : `${value.toFixed(digits)}${unit ? ` ${unit}` : ''}`;
}

/** Every verdict state in words with a mark; "not measured yet" is neither a tick nor a cross. */
const verdictText: Record<Verdict, string> = {
  'in-tolerance': '[ok]   in tolerance',
  marginal: '[!]    marginal',
  'out-of-tolerance': '[x]    out of tolerance',
  'not-measured': '[ ]    not measured yet',
};

function formatMeasured(check: ReadingCheck): string {
  if (typeof check.measured === 'boolean') return check.measured ? 'yes' : 'no';
  if (check.measured === null) return '-';
  return `${Number.isInteger(check.measured) ? check.measured : check.measured.toFixed(2)}${check.unit ? ` ${check.unit}` : ''}`;
}

function formatExpected(check: ReadingCheck): string {
  if (typeof check.expected === 'boolean') return check.expected ? 'yes' : 'no';
  if (check.expected === null) return '';
  const prefix = check.limit === 'at-most' ? 'at most ' : check.limit === 'at-least' ? 'at least ' : '';
  // A limit with no tolerance past it is just the limit ("at least 120 us"), not "exactly".
  const tolerance = check.toleranceAbs === null ? '' : check.toleranceAbs === 0 ? (prefix ? '' : ' exactly') : ` +- ${check.toleranceAbs.toFixed(2)}`;
  const value = Number.isInteger(check.expected) ? String(check.expected) : check.expected.toFixed(2);
  return `design ${prefix}${value}${check.unit ? ` ${check.unit}` : ''}${tolerance}`;
}

export function formatAnalysis(path: string, result: AnalyzeResult): string {
  const r = result.readings;
  const rows: Array<[string, string, string]> = [];
  const row = (group: string, label: string, value: string): void => {
    rows.push([group, label, value]);
  };
  row('Sync', 'frequency', fixed(r.frequencyHz, 3, 'Hz'));
  row('', 'drift', fixed(r.frequencyDriftHz, 3, 'Hz over the capture'));
  row('', 'period jitter', fixed(r.periodJitterUs, 1, 'us'));
  row('Ramp', 'floor', fixed(r.ramp.floorV, 3, 'V'));
  row('', 'start', r.ramp.startDelayDeg === null ? '-' : `${r.ramp.startDelayDeg.toFixed(1)} deg after the zero crossing`);
  row('', 'slope', fixed(r.ramp.slopeVPerMs, 3, 'V/ms'));
  row('', 'peak', r.ramp.peakV === null ? '-' : `${r.ramp.peakV.toFixed(3)} V (median; ${fixed(r.ramp.peakMinV, 3, '')} to ${fixed(r.ramp.peakMaxV, 3, 'V')})`);
  row('', 'nonlinearity', fixed(r.ramp.nonlinearityPct, 2, '% of peak'));
  row('', 'clipping', r.ramp.chargingIntervals === 0 ? '-' : r.ramp.clipped ? `yes (${r.ramp.clippedIntervals} of ${r.ramp.chargingIntervals} ramps)` : r.ramp.clippedIntervals > 0 ? `no (${r.ramp.clippedIntervals} of ${r.ramp.chargingIntervals} ramps)` : 'no');
  row('', 'reset', fixed(r.ramp.resetUs, 0, 'us'));
  row('Gate', 'pulses', `${r.pulse.count} (missing ${r.pulse.missing}, wrong half-cycle ${r.pulse.wrongHalfCycle}, more than one ${r.pulse.multiplePulses})`);
  row('', 'alpha', r.pulse.alphaDeg === null ? '-' : `${r.pulse.alphaDeg.toFixed(2)} deg mean, jitter ${fixed(r.pulse.alphaStdDeg, 2, 'deg')}, ${fixed(r.pulse.alphaMinDeg, 2, '')} to ${fixed(r.pulse.alphaMaxDeg, 2, 'deg')}`);
  row('', 'width', fixed(r.pulse.widthUs, 0, 'us'));
  row('', 'amplitude', fixed(r.pulse.amplitudeV, 2, 'V'));
  if (r.balance) {
    const signedFixed = (value: number | null, digits: number, unit: string) => (value === null ? '-' : `${value >= 0 ? '+' : ''}${value.toFixed(digits)} ${unit}`);
    row('Balance', 'alpha', `${signedFixed(r.balance.alphaDeg, 2, 'deg')} (positive minus negative half-cycle)`);
    row('', 'ramp peak', `${signedFixed(r.balance.rampPeakV, 3, 'V')} (positive minus negative half-cycle)`);
  }
  if (r.pulse.controlV !== null) row('Control', 'at firing', fixed(r.pulse.controlV, 3, 'V mean'));
  if (r.transfer) {
    row('Transfer', 'gain', `${r.transfer.gainDegPerV.toFixed(2)} deg/V, offset ${r.transfer.offsetDeg.toFixed(2)} deg`);
    row('', 'linearity', `${r.transfer.maxDeviationDeg.toFixed(2)} deg max deviation over ${r.transfer.points} points`);
    row('', 'control range', `${r.transfer.controlMinV.toFixed(3)} to ${r.transfer.controlMaxV.toFixed(3)} V`);
  }
  const groupWidth = Math.max(...rows.map((entry) => entry[0].length));
  const labelWidth = Math.max(...rows.map((entry) => entry[1].length));
  const rectifierNote = result.rectifierSource === 'default' ? ' (assumed; give --rectifier or --design)' : '';
  const lines = [
    `Capture ${path}`,
    ...(result.readAs ? [`  ${result.readAs}`] : []),
    `  ${fixed(r.durationS, 2, 's')} at ${fixed(r.sampleRateHz, 0, 'S/s')}, ${r.cycles} cycles, ${r.firingIntervals} firing intervals, ${r.rectifier}${rectifierNote}${r.gaps > 0 ? `, ${r.gaps} gap(s)` : ''}`,
    '',
    ...rows.map(([group, label, value]) => `  ${group.padEnd(groupWidth)}  ${label.padEnd(labelWidth)}  ${value}`),
  ];
  if (r.cycles < 2) lines.push('', 'Note: fewer than 2 complete mains cycles in the capture; record at least a second for readings to rely on.');
  if (r.invalidSamples > 0) lines.push('', `Note: ${r.invalidSamples === 1 ? '1 sample was' : `${r.invalidSamples} samples were`} not a number and treated as lost.`);
  if (result.checks && result.design) {
    lines.push('', `Checks against ${result.design.name}`);
    const labelColumn = Math.max(...result.checks.map((check) => check.label.length));
    for (const check of result.checks) {
      const verdict = verdictText[check.verdict];
      lines.push(`  ${verdict.padEnd(24)}  ${check.label.padEnd(labelColumn)}  ${formatMeasured(check).padEnd(12)}  ${formatExpected(check)}`);
    }
  }
  return `${lines.join('\n')}\n`;
}

export function registerAnalyzeCommand(program: Command): void {
  const command = program
    .command('analyze')
    .description('Measure a capture: mains frequency, ramp floor/start/slope/peak/linearity/clipping, firing angle, pulses, transfer curve')
    .argument('<capture>', 'capture file: .csv (ours or an instrument\'s), a COMTRADE .cfg/.dat pair, or a .cff')
    .option('--design <file>', 'board design (*.board.json): rectifier, sync phase and channel map from it, and checks against it')
    .option('--json', 'print the readings as JSON')
    .option('--rectifier <kind>', 'half-wave or full-wave (default: from the design, else full-wave)');
  addCaptureOptions(command).action(async (capturePath: string, options: AnalyzeCommandOptions) => {
    const read = captureReadOptions(options, null);
    const rectifier = rectifierOption(options.rectifier);
    const progress = createProgressBar(process.stderr, { enabled: !options.json, label: 'Reading' });
    let result: AnalyzeResult;
    try {
      result = await analyzeCapture(capturePath, { designPath: options.design, rectifier, read, onProgress: progress.update });
    } finally {
      progress.done();
    }
    if (options.json) {
      const readings = { ...result.readings, readAs: result.readAs };
      process.stdout.write(jsonOutput(result.checks ? { ...readings, checks: result.checks } : readings));
    } else {
      process.stdout.write(formatAnalysis(capturePath, result));
    }
  });
}
