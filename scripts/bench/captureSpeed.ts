/**
 * Reading long captures, side by side with a pandas + numpy script (a benchmark: it prints figures, it asserts nothing).
 * - The same 60 s CSV (50 kS/s, 4 channels) is read by `rampwright analyze` (the built command line, a process of its
 *   own) and by scripts/bench/pandasCapture.py (pandas' C parser, numpy vectorised; Debian's python3-pandas and
 *   python3-numpy), each computing the mains frequency, the mean firing angle and the median ramp peak. Runs
 *   alternate, three each; the best wall time of each is compared (the machine is shared: the best run is the one
 *   least disturbed), and the medians are printed too. Two files: our writer's shortest exact volts (17 digits) and
 *   volts to 0.1 mV as a 16-bit recorder prints them.
 * - A 10-minute capture (about 1.2 GB of CSV) is analysed with the peak resident memory of the process.
 * Files go to a temporary folder and are removed. Needs `npm run build` first (the benchmark runs dist/rampwright.js).
 * RAMPWRIGHT_BENCH_QUICK=1 leaves out the 10-minute file.
 */
import { spawnSync } from 'node:child_process';
import { closeSync, existsSync, mkdtempSync, openSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { writeSyntheticCsv } from './support/syntheticCapture';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const cli = join(root, 'dist', 'rampwright.js');
const pandasScript = join(root, 'scripts', 'bench', 'pandasCapture.py');
const python = '/usr/bin/python3';
const timeCommand = '/usr/bin/time';

interface Run {
  wallS: number;
  /** User + system CPU seconds of the process and its threads, when /usr/bin/time is there. */
  cpuS: number | null;
  maxResidentMiB: number | null;
  stdout: string;
}

function line(label: string, value: string): void {
  console.log(`  ${label.padEnd(46)} ${value}`);
}

/** Runs a command, timing the whole process (start-up included) and, with /usr/bin/time, its CPU and peak memory. */
function timed(command: string, args: string[], folder: string): Run {
  const report = join(folder, 'time.txt');
  const output = join(folder, 'stdout.txt');
  const withTime = existsSync(timeCommand);
  // Output to a file, as a user would redirect it: the whole of it, whatever the pipe's buffering.
  const outputFd = openSync(output, 'w');
  const started = performance.now();
  const result = withTime
    ? spawnSync(timeCommand, ['-o', report, '-f', '%U %S %M', command, ...args], { encoding: 'utf8', stdio: ['ignore', outputFd, 'pipe'] })
    : spawnSync(command, args, { encoding: 'utf8', stdio: ['ignore', outputFd, 'pipe'] });
  const wallS = (performance.now() - started) / 1000;
  closeSync(outputFd);
  if (result.status !== 0) throw new Error(`${command} ${args.join(' ')} failed: ${result.stderr}`);
  let cpuS: number | null = null;
  let maxResidentMiB: number | null = null;
  if (withTime) {
    const [user, system, residentKiB] = readFileSync(report, 'utf8').trim().split(/\s+/).slice(-3).map(Number);
    cpuS = user + system;
    maxResidentMiB = residentKiB / 1024;
  }
  return { wallS, cpuS, maxResidentMiB, stdout: readFileSync(output, 'utf8') };
}

const median = (values: number[]): number => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];
const seconds = (value: number | null): string => (value === null ? '-' : `${value.toFixed(2)} s`);

async function sideBySide(folder: string, label: string, voltDecimals: number | undefined): Promise<void> {
  const path = join(folder, `minute-${voltDecimals ?? 'shortest'}.csv`);
  const bytes = await writeSyntheticCsv(path, 60, voltDecimals);
  console.log(`\n  ${label}: 60 s at 50 kS/s x 4 channels, ${(bytes / (1 << 20)).toFixed(0)} MiB`);
  const ours: Run[] = [];
  const theirs: Run[] = [];
  for (let round = 0; round < 3; round++) {
    theirs.push(timed(python, [pandasScript, path], folder));
    ours.push(timed(process.execPath, [cli, 'analyze', path, '--json'], folder));
  }
  const oursBest = Math.min(...ours.map((run) => run.wallS));
  const theirsBest = Math.min(...theirs.map((run) => run.wallS));
  line('rampwright analyze: wall (best, median of 3)', `${seconds(oursBest)}, ${seconds(median(ours.map((run) => run.wallS)))}; CPU ${seconds(median(ours.map((run) => run.cpuS ?? 0)))} (both threads)`);
  line('pandas + numpy script: wall (best, median of 3)', `${seconds(theirsBest)}, ${seconds(median(theirs.map((run) => run.wallS)))}; CPU ${seconds(median(theirs.map((run) => run.cpuS ?? 0)))}`);
  const inside = JSON.parse(theirs[theirs.length - 1].stdout.trim()) as { frequencyHz: number; alphaMeanDeg: number; rampPeakMedianV: number; readS: number; computeS: number };
  line('  of which the script reads / computes', `${seconds(inside.readS)} / ${seconds(inside.computeS)} (its own clock, imports excluded)`);
  line('RATIO rampwright / pandas (best wall)', `${(oursBest / theirsBest).toFixed(2)} (target at most 0.5)`);
  line('ratio of the medians', `${(median(ours.map((run) => run.wallS)) / median(theirs.map((run) => run.wallS))).toFixed(2)}`);
  const readings = JSON.parse(ours[ours.length - 1].stdout) as { frequencyHz: number; pulse: { alphaDeg: number }; ramp: { peakV: number } };
  line('frequency: rampwright / script', `${readings.frequencyHz.toFixed(4)} Hz / ${inside.frequencyHz.toFixed(4)} Hz`);
  line('mean alpha: rampwright / script', `${readings.pulse.alphaDeg.toFixed(2)} deg / ${inside.alphaMeanDeg.toFixed(2)} deg (50 % edge from the crossing)`);
  line('median ramp peak: rampwright / script', `${readings.ramp.peakV.toFixed(3)} V / ${inside.rampPeakMedianV.toFixed(3)} V (fitted end of charge / largest sample)`);
  rmSync(path, { force: true });
}

/**
 * The 10-minute capture through a pseudo-terminal (`script` from util-linux), as a technician runs it: the progress
 * bar draws, and /usr/bin/time gives the peak resident memory. Without `script`, a plain run.
 */
async function longCapture(folder: string): Promise<void> {
  const path = join(folder, 'ten-minutes.csv');
  const bytes = await writeSyntheticCsv(path, 600, 4);
  console.log(`\n  10-minute capture: ${(bytes / (1 << 30)).toFixed(2)} GiB of CSV (volts to 0.1 mV)`);
  const onTerminal = existsSync('/usr/bin/script');
  const command = [process.execPath, cli, 'analyze', path].map((word) => JSON.stringify(word)).join(' ');
  const run = onTerminal ? timed('/usr/bin/script', ['-qfec', command, '/dev/null'], folder) : timed(process.execPath, [cli, 'analyze', path], folder);
  const frames = (run.stdout.match(/Reading \[/g) ?? []).length;
  const cycles = /(\d+) cycles/.exec(run.stdout)?.[1] ?? '?';
  line('rampwright analyze: wall, CPU', `${seconds(run.wallS)}, ${seconds(run.cpuS)} (${(600 / run.wallS).toFixed(0)}x real time)`);
  line('peak resident memory of the process', run.maxResidentMiB === null ? '- (no /usr/bin/time)' : `${run.maxResidentMiB.toFixed(0)} MiB (target under 300 MiB)`);
  line('progress bar on the terminal', onTerminal ? `${frames} redraws seen through a pseudo-terminal` : '(no script command: not shown)');
  line('check', `${cycles} cycles`);
  rmSync(path, { force: true });
}

export async function run(): Promise<void> {
  console.log('Reading a long CSV capture: rampwright analyze against a pandas + numpy script, same file, same machine, same run');
  if (!existsSync(cli)) {
    console.log('  (dist/rampwright.js is missing: run npm run build first)');
    return;
  }
  if (spawnSync(python, ['-c', 'import pandas, numpy']).status !== 0) {
    console.log(`  (${python} cannot import pandas and numpy: apt-get install python3-pandas python3-numpy)`);
    return;
  }
  const folder = mkdtempSync(join(tmpdir(), 'rampwright-bench-capture-'));
  try {
    await sideBySide(folder, 'our CSV, shortest exact volts', undefined);
    await sideBySide(folder, 'volts to 0.1 mV (as a 16-bit recorder prints them)', 4);
    if (process.env.RAMPWRIGHT_BENCH_QUICK !== '1') await longCapture(folder);
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
