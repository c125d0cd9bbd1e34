/**
 * Analysis-engine throughput and memory (a benchmark, not a test: it prints figures).
 * - Synthetic: a 60 s capture of a full-wave 50 Hz board at 50 kS/s x 4 channels (sync, ramp, gate, control) with
 *   noise, fed block by block to the capture analyzer: samples per second, wall and CPU time, ratio to real time.
 * - Through the capture readers: the same minute written as CSV and as COMTRADE BINARY, read back and analysed.
 * - Memory: heap after 1 min and after 10 min of streaming (per-interval list off, as a live session runs it):
 *   flat means an hour costs what a minute does.
 * Run all benchmarks with `npm run bench` (node --expose-gc), this one with `npm run bench -- analysis`.
 */
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { createCaptureAnalyzer } from '../../app/bench/captureAnalyzer';
import type { SampleBlock } from '../../app/capture/samples';
import { readCaptureFile } from '../../main/capture/readCaptureFile';
import { writeCaptureFile } from '../../main/capture/writeCaptureFile';

const sampleRateHz = 50_000;
const mainsHz = 50;
const blockSamples = 4096;
const channels = 4;

/** One second of a board (a whole number of mains cycles, so it repeats seamlessly), with 5 mV noise. */
function oneSecond(): { sync: Float64Array; ramp: Float64Array; gate: Float64Array; control: Float64Array } {
  let seed = 12345;
  const uniform = (): number => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648;
  };
  const noise = (): number => 0.005 * Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  const sync = new Float64Array(sampleRateHz);
  const ramp = new Float64Array(sampleRateHz);
  const gate = new Float64Array(sampleRateHz);
  const control = new Float64Array(sampleRateHz);
  for (let i = 0; i < sampleRateHz; i++) {
    const timeS = i / sampleRateHz;
    const halfCycle = (timeS * mainsHz * 2) % 1;
    sync[i] = 5 * Math.sin(2 * Math.PI * mainsHz * timeS) + noise();
    ramp[i] = (halfCycle < 0.015 || halfCycle > 0.985 ? 0.2 : 0.2 + 8 * (halfCycle - 0.015)) + noise();
    gate[i] = (halfCycle > 0.5 && halfCycle < 0.52 ? 12 : 0) + noise();
    control[i] = 4.2 + noise();
  }
  return { sync, ramp, gate, control };
}

const second = oneSecond();

function* syntheticBlocks(durationS: number): Generator<SampleBlock> {
  const total = durationS * sampleRateHz;
  for (let first = 0; first < total; first += blockSamples) {
    const length = Math.min(blockSamples, total - first);
    const offset = first % sampleRateHz;
    const take = (source: Float64Array): Float64Array => {
      if (offset + length <= sampleRateHz) return source.subarray(offset, offset + length);
      const out = new Float64Array(length);
      for (let i = 0; i < length; i++) out[i] = source[(offset + i) % sampleRateHz];
      return out;
    };
    yield { startS: first / sampleRateHz, sampleRateHz, sync: take(second.sync), ramp: take(second.ramp), gate: take(second.gate), control: take(second.control), afterGap: false };
  }
}

function collectGarbage(): void {
  const gc = (globalThis as { gc?: () => void }).gc;
  if (gc) gc();
}

function heapMiB(): number {
  collectGarbage();
  return process.memoryUsage().heapUsed / (1 << 20);
}

function line(label: string, value: string): void {
  console.log(`  ${label.padEnd(44)} ${value}`);
}

async function timeAnalysis(label: string, durationS: number, blocks: AsyncIterable<SampleBlock> | Iterable<SampleBlock>): Promise<void> {
  const analyzer = createCaptureAnalyzer({ rectifier: 'full-wave', keepPerCycle: true });
  const cpuBefore = process.cpuUsage();
  const started = performance.now();
  let samples = 0;
  for await (const block of blocks) {
    samples += block.sync.length;
    analyzer.push(block);
  }
  const readings = analyzer.finish();
  const wallS = (performance.now() - started) / 1000;
  const cpu = process.cpuUsage(cpuBefore);
  const cpuS = (cpu.user + cpu.system) / 1e6;
  // On a shared machine wall time includes waiting for the CPU; CPU time is what one core spends.
  line(`${label}: wall time for ${durationS} s`, `${wallS.toFixed(2)} s, ${(durationS / wallS).toFixed(0)}x real time`);
  line(`${label}: CPU time (one core)`, `${cpuS.toFixed(2)} s, ${(durationS / cpuS).toFixed(0)}x real time`);
  line(`${label}: throughput`, `${((samples * channels) / wallS / 1e6).toFixed(1)} M samples/s (${channels} channels), ${(samples / wallS / 1e6).toFixed(2)} M per channel`);
  line(`${label}: check`, `${readings.cycles} cycles, ${readings.pulse.count} pulses, f ${readings.frequencyHz?.toFixed(3)} Hz, peak ${readings.ramp.peakV?.toFixed(3)} V`);
}

async function streamingMemory(minutes: number): Promise<number> {
  const analyzer = createCaptureAnalyzer({ rectifier: 'full-wave', keepPerCycle: false });
  for (const block of syntheticBlocks(minutes * 60)) analyzer.push(block);
  const heap = heapMiB();
  analyzer.finish();
  return heap;
}

export async function run(): Promise<void> {
  const durationS = 60;
  console.log(`Analysis of a ${durationS} s capture at ${sampleRateHz / 1000} kS/s x ${channels} channels (goal: at least 100x real time on one core)`);
  // Warm the JIT on a few seconds first, as a long session would be.
  const warm = createCaptureAnalyzer({ rectifier: 'full-wave' });
  for (const block of syntheticBlocks(5)) warm.push(block);
  warm.finish();
  await timeAnalysis('synthetic blocks', durationS, syntheticBlocks(durationS));

  const folder = mkdtempSync(join(tmpdir(), 'rampwright-bench-analysis-'));
  try {
    for (const [kind, file] of [['CSV', 'minute.csv'], ['COMTRADE BINARY', 'minute.cfg']] as const) {
      const path = join(folder, file);
      await writeCaptureFile(path, syntheticBlocks(durationS));
      const bytes = statSync(file.endsWith('.cfg') ? path.replace(/\.cfg$/, '.dat') : path).size;
      line(`${kind} file`, `${(bytes / (1 << 20)).toFixed(0)} MiB`);
      await timeAnalysis(`${kind} read + analysis`, durationS, readCaptureFile(path));
    }
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }

  const baseline = heapMiB();
  const oneMinute = await streamingMemory(1);
  const tenMinutes = await streamingMemory(10);
  line('heap before streaming', `${baseline.toFixed(1)} MiB`);
  line('heap after 1 min of streaming (analyzer alive)', `${oneMinute.toFixed(1)} MiB`);
  line('heap after 10 min of streaming (analyzer alive)', `${tenMinutes.toFixed(1)} MiB (${tenMinutes - oneMinute >= 0 ? '+' : ''}${(tenMinutes - oneMinute).toFixed(2)} MiB)`);
  line('peak resident memory of the process', `${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MiB`);
  if (!(globalThis as { gc?: () => void }).gc) console.log('  (run with node --expose-gc for heap figures after collection)');
}
