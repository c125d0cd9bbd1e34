/**
 * Logger decoder throughput against the link it serves: protocol lines from the virtual logger (4 channels at
 * 25 kS/s, block 120, with link faults so the slow paths run too) decoded line by line and as raw text chunks.
 * Prints MB/s, the link's bytes per second (PROTOCOL.md link budget) and USB full-speed's bulk limit, and the ratios.
 * Run: npx tsx -e "import('./scripts/bench/logger.ts').then(m=>m.run())"
 */
import { performance } from 'node:perf_hooks';
import { boardDesignSchema } from '../../app/board/design';
import { createLoggerDecoder } from '../../app/logger/decoder';
import { virtualLoggerLines } from '../../app/sim/virtualLogger';

/** PROTOCOL.md link budget: 4 channels x 25 kS/s with block 120, data plus one status line a second. */
const linkBytesPerS = 271_073;
/** USB 2.0 full-speed bulk: 19 packets of 64 bytes per 1 ms frame (from memory, as in PROTOCOL.md). */
const usbFullSpeedBytesPerS = 1_216_000;

// A board of our own for the bench.
const design = boardDesignSchema.parse({
  name: 'Bench HW-50 throughput board',
  mainsHz: 50,
  rectifier: 'half-wave',
  supplyV: 15,
  rampTargetV: 5.5,
  alphaMaxDeg: 165,
  parts: { rEmitter: { ohm: 7500 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 } },
});

function bestOf(passes: number, work: () => void): number {
  let best = Infinity;
  for (let pass = 0; pass < passes; pass++) {
    const started = performance.now();
    work();
    best = Math.min(best, (performance.now() - started) / 1000);
  }
  return best;
}

function report(label: string, bytes: number, seconds: number): void {
  const bytesPerS = bytes / seconds;
  console.log(
    `${label.padEnd(34)} ${(bytesPerS / 1e6).toFixed(1).padStart(7)} MB/s   ` +
      `${(bytesPerS / linkBytesPerS).toFixed(0).padStart(5)} x the link   ${(bytesPerS / usbFullSpeedBytesPerS).toFixed(0).padStart(4)} x USB full-speed`,
  );
}

export async function run(): Promise<void> {
  const signalS = 20;
  const generated = performance.now();
  const clean = virtualLoggerLines(design, { durationS: signalS, seed: 3 });
  const faulty = virtualLoggerLines(design, { durationS: signalS, seed: 3, faults: ['drop-blocks', 'corrupt-blocks', 'garbage'] });
  const bytes = (lines: string[]) => lines.reduce((sum, line) => sum + line.length + 1, 0);
  console.log(`logger protocol: ${clean.length} lines, ${(bytes(clean) / 1e6).toFixed(2)} MB for ${signalS} s of signal (generated in ${((performance.now() - generated) / 1000).toFixed(1)} s)`);
  console.log(`link needs ${linkBytesPerS} B/s (PROTOCOL.md); USB full-speed bulk carries at most ${usbFullSpeedBytesPerS} B/s`);

  let blocks = 0;
  const lineTime = bestOf(5, () => {
    const decoder = createLoggerDecoder();
    blocks = 0;
    for (const line of clean) for (const event of decoder.pushLine(line)) if (event.kind === 'block') blocks++;
  });
  report('pushLine, clean link', bytes(clean), lineTime);

  const faultyTime = bestOf(5, () => {
    const decoder = createLoggerDecoder();
    for (const line of faulty) decoder.pushLine(line);
  });
  report('pushLine, drops/CRC/garbage', bytes(faulty), faultyTime);

  const text = `${clean.join('\n')}\n`;
  const chunkBytes = 4096;
  const textTime = bestOf(5, () => {
    const decoder = createLoggerDecoder();
    for (let at = 0; at < text.length; at += chunkBytes) decoder.pushText(text.slice(at, at + chunkBytes));
  });
  report(`pushText, ${chunkBytes}-byte chunks`, text.length, textTime);

  const realTimeRatio = signalS / lineTime;
  console.log(`decoded ${blocks} blocks: ${realTimeRatio.toFixed(0)} x real time on one core (${((100 * lineTime) / signalS).toFixed(2)} % of a core at full rate)`);
}
