/**
 * Capture-format throughput: a 60 s capture at 50 kS/s x 4 channels written to a temporary folder as CSV and as
 * COMTRADE BINARY, then read back through the streaming readers. Prints samples per second, wall time, the
 * ratio to real time, and the process's peak resident memory (flat memory means the file was never held whole).
 * Run: npx tsx -e "import('./scripts/bench/formats.ts').then(m=>m.run())"
 */
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import type { SampleBlock } from '../../app/capture/samples';
import { readCaptureFile } from '../../main/capture/readCaptureFile';
import { writeCaptureFile } from '../../main/capture/writeCaptureFile';

/** 60 s as issue 2 asks; RAMPWRIGHT_BENCH_CAPTURE_S=600 runs the 10-minute case to show memory stays flat. */
const durationS = Number(process.env.RAMPWRIGHT_BENCH_CAPTURE_S ?? 60) || 60;
const sampleRateHz = 50_000;
const blockSamples = 4096;
const mainsHz = 50;

/** A plausible full-wave board: sync sine, ramp reset at each zero crossing, gate pulse at 90 deg, slow control. */
function* syntheticCapture(): Generator<SampleBlock> {
  const total = durationS * sampleRateHz;
  for (let first = 0; first < total; first += blockSamples) {
    const length = Math.min(blockSamples, total - first);
    const block: SampleBlock = {
      startS: first / sampleRateHz,
      sampleRateHz,
      sync: new Float64Array(length),
      ramp: new Float64Array(length),
      gate: new Float64Array(length),
      control: new Float64Array(length),
      afterGap: false,
    };
    for (let index = 0; index < length; index++) {
      const timeS = (first + index) / sampleRateHz;
      const halfCycle = ((timeS * mainsHz * 2) % 1 + 1) % 1;
      block.sync[index] = 10 * Math.sin(2 * Math.PI * mainsHz * timeS);
      block.ramp[index] = 0.4 + 9 * halfCycle;
      block.gate[index] = halfCycle > 0.5 && halfCycle < 0.52 ? 12 : 0;
      (block.control as Float64Array)[index] = 4.5 + 0.5 * Math.sin(2 * Math.PI * 0.1 * timeS);
    }
    yield block;
  }
}

function peakResidentMiB(): number {
  // resourceUsage().maxRSS is in kilobytes (Node documentation).
  return process.resourceUsage().maxRSS / 1024;
}

async function timeRead(label: string, path: string): Promise<void> {
  const started = performance.now();
  const cpuStarted = process.cpuUsage();
  let samples = 0;
  let blocks = 0;
  let readingRssMiB = 0;
  let readingHeapMiB = 0;
  for await (const block of readCaptureFile(path)) {
    samples += block.sync.length;
    // Sampled every 64 blocks: the resident size while reading, which stays flat if the file is streamed.
    if (blocks++ % 64 === 0) {
      const usage = process.memoryUsage();
      readingRssMiB = Math.max(readingRssMiB, usage.rss / 2 ** 20);
      readingHeapMiB = Math.max(readingHeapMiB, (usage.heapUsed + usage.arrayBuffers) / 2 ** 20);
    }
  }
  const wallS = (performance.now() - started) / 1000;
  const cpuS = process.cpuUsage(cpuStarted).user / 1e6;
  const megabytes = statSync(path).size / 1e6;
  console.log(
    `${label.padEnd(18)} ${samples} samples x 4 channels in ${wallS.toFixed(2)} s: ` +
      `${(samples / wallS / 1e6).toFixed(2)} MS/s per channel set, ${(durationS / wallS).toFixed(0)}x real time, ` +
      `${megabytes.toFixed(0)} MB file; CPU ${cpuS.toFixed(2)} s (${(durationS / cpuS).toFixed(0)}x real time on one core); ` +
      `while reading: heap + buffers at most ${readingHeapMiB.toFixed(0)} MiB, RSS at most ${readingRssMiB.toFixed(0)} MiB ` +
      '(RSS keeps what the writing step took)',
  );
}

export async function run(): Promise<void> {
  const folder = mkdtempSync(join(tmpdir(), 'rampwright-bench-formats-'));
  try {
    console.log(`capture formats: ${durationS} s at ${sampleRateHz / 1000} kS/s x 4 channels, blocks of ${blockSamples}`);
    const csvPath = join(folder, 'bench.csv');
    const comtradePath = join(folder, 'bench.cfg');
    let started = performance.now();
    // 0.1 mV steps, about what a 16-bit logger on +-10 V resolves.
    await writeCaptureFile(csvPath, syntheticCapture(), { format: 'csv', csv: { voltFractionDigits: 4 } });
    console.log(`write CSV          ${((performance.now() - started) / 1000).toFixed(2)} s`);
    started = performance.now();
    await writeCaptureFile(comtradePath, syntheticCapture(), { format: 'comtrade-binary' });
    console.log(`write COMTRADE bin ${((performance.now() - started) / 1000).toFixed(2)} s`);
    console.log(`peak RSS after writing ${peakResidentMiB().toFixed(0)} MiB`);
    await timeRead('read CSV', csvPath);
    await timeRead('read COMTRADE bin', join(folder, 'bench.dat'));
    const usage = process.memoryUsage();
    console.log(`heap used ${(usage.heapUsed / 2 ** 20).toFixed(0)} MiB, rss now ${(usage.rss / 2 ** 20).toFixed(0)} MiB, peak RSS ${peakResidentMiB().toFixed(0)} MiB`);
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
