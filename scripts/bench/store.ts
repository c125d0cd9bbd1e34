/**
 * Logbook figures (printed, not asserted): insert rate of the session writer, the time one batch holds the thread
 * (what the serial reader could wait at worst), the delay from a cycle being handed over to it being committed, and
 * resident memory while an hour of 50 Hz cycles is written faster than real time (it should stay flat).
 */
import { mkdtempSync, rmSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import type { CycleReading } from '../../app/bench/readings';
import { boardDesignSchema } from '../../app/board/design';
import { openSqliteLogbook } from '../../main/store/sqliteLogbook';

const design = boardDesignSchema.parse(JSON.parse(readFileSync(new URL('../../fixtures/boards/charger-ch50h.board.json', import.meta.url), 'utf8')));

function reading(index: number): CycleReading {
  return {
    t: index * 0.02, halfCycle: 'positive', periodS: 0.02, alphaDeg: 90 + Math.sin(index / 50), controlV: 3 + (index % 100) * 0.01, pulses: 1, wrongHalfCyclePulses: 0,
    rampPeakV: 7.3 + 0.01 * Math.cos(index / 30), rampFloorV: 0.1, slopeVPerMs: 0.73, startDelayDeg: 1.2, nonlinearityPct: 0.4, clipped: false, resetUs: 300,
  };
}

const megabytes = (bytes: number): string => (bytes / 1048576).toFixed(1);
const gc = (): void => (globalThis as { gc?: () => void }).gc?.();

async function insertRate(folder: string): Promise<void> {
  const logbook = await openSqliteLogbook(join(folder, 'rate.sqlite'));
  const writer = await logbook.startSession({ unitSerial: 'BENCH-1', design, operator: 'bench' }, { flushIntervalMs: 3_600_000 });
  const cycles = 200_000;
  for (let i = 0; i < cycles; i += 1) writer.addCycle(reading(i));
  const started = performance.now();
  await writer.flush();
  const seconds = (performance.now() - started) / 1000;
  console.log(`  insert rate, one transaction of ${cycles} cycles: ${Math.round(cycles / seconds).toLocaleString('en')} cycles/s (${(seconds * 1000).toFixed(0)} ms)`);

  // Batches as a live session makes them: 10 cycles (200 ms at 50 Hz) per transaction.
  const batchMs: number[] = [];
  for (let batch = 0; batch < 2000; batch += 1) {
    for (let i = 0; i < 10; i += 1) writer.addCycle(reading(i));
    const begin = performance.now();
    await writer.flush();
    batchMs.push(performance.now() - begin);
  }
  batchMs.sort((a, b) => a - b);
  const at = (q: number): string => batchMs[Math.min(batchMs.length - 1, Math.floor(q * batchMs.length))].toFixed(3);
  console.log(`  10-cycle batch (one 200 ms tick at 50 Hz): median ${at(0.5)} ms, 99th percentile ${at(0.99)} ms, longest ${at(1)} ms`);
  await writer.close();
  await logbook.close();
}

async function commitDelay(folder: string): Promise<void> {
  const logbook = await openSqliteLogbook(join(folder, 'delay.sqlite'));
  const writer = await logbook.startSession({ unitSerial: 'BENCH-2', design, operator: 'bench' });
  const handedMs: number[] = [];
  const delaysMs: number[] = [];
  let committed = 0;
  const watch = setInterval(() => {
    const written = writer.stats().cyclesWritten;
    for (; committed < written; committed += 1) delaysMs.push(performance.now() - handedMs[committed]);
  }, 2);
  // Three seconds of a 50 Hz board in real time, default batching (200 ms).
  for (let i = 0; i < 150; i += 1) {
    handedMs.push(performance.now());
    writer.addCycle(reading(i));
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
  await new Promise((resolve) => setTimeout(resolve, 400));
  clearInterval(watch);
  delaysMs.sort((a, b) => a - b);
  console.log(
    `  cycle handed over -> committed (default 200 ms batching, ${delaysMs.length} cycles): median ${delaysMs[delaysMs.length >> 1].toFixed(0)} ms, longest ${delaysMs[delaysMs.length - 1].toFixed(0)} ms (bound: one batch interval plus a batch)`,
  );
  await writer.close();
  await logbook.close();
}

async function hourOfCycles(folder: string): Promise<void> {
  const logbook = await openSqliteLogbook(join(folder, 'hour.sqlite'));
  const writer = await logbook.startSession({ unitSerial: 'BENCH-3', design, operator: 'bench' }, { flushIntervalMs: 3_600_000 });
  const started = performance.now();
  console.log('  an hour of 50 Hz cycles, one batch per simulated second:');
  console.log('    simulated min   cycles    rss MB   heap MB');
  let index = 0;
  for (let second = 1; second <= 3600; second += 1) {
    for (let i = 0; i < 50; i += 1) {
      writer.addCycle(reading(index));
      index += 1;
    }
    await writer.flush();
    if (second % 600 === 0) {
      gc();
      const memory = process.memoryUsage();
      console.log(`    ${String(second / 60).padStart(13)}   ${String(index).padStart(6)}   ${megabytes(memory.rss).padStart(7)}   ${megabytes(memory.heapUsed).padStart(7)}`);
    }
  }
  const seconds = (performance.now() - started) / 1000;
  console.log(`  wrote 3600 s of cycles in ${seconds.toFixed(1)} s: ${(3600 / seconds).toFixed(0)}x real time`);
  await writer.close();
  await logbook.close();
}

export async function run(): Promise<void> {
  const folder = mkdtempSync(join(tmpdir(), 'rampwright-bench-store-'));
  try {
    // The hour first, so the big one-transaction queue of the insert-rate figure does not inflate its memory.
    await hourOfCycles(folder);
    await insertRate(folder);
    await commitDelay(folder);
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
