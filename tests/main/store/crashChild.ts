/**
 * The process the crash test kills: it records a synthetic session as fast as it can and prints, every few cycles,
 * which cycle it has just handed to the writer and when (`gen <seq> <epoch ms>`), so the test knows which cycles
 * existed one second before the kill. Built with esbuild and run by crash.test.ts; not a test itself.
 */
import type { CycleReading } from '../../../app/bench/readings';
import type { BoardDesign } from '../../../app/board/design';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';

const [dbPath, designJson] = process.argv.slice(2);

function reading(seq: number): CycleReading {
  return {
    t: seq, halfCycle: 'positive', periodS: 0.02, alphaDeg: 60 + (seq % 60), controlV: 2 + (seq % 7) * 0.1, pulses: 1, wrongHalfCyclePulses: 0,
    rampPeakV: 7.3 + (seq % 5) * 0.01, rampFloorV: 0.1, slopeVPerMs: 0.73, startDelayDeg: 1, nonlinearityPct: 0.4, clipped: false, resetUs: 300,
  };
}

async function main(): Promise<void> {
  const logbook = await openSqliteLogbook(dbPath);
  const writer = await logbook.startSession({ unitSerial: 'RW-CRASH-01', design: JSON.parse(designJson) as BoardDesign, operator: 'crash test' });
  process.stdout.write(`ready ${writer.sessionId}\n`);
  let seq = 0;
  // 8 cycles every millisecond or so: far faster than a 50 Hz board, so every batch holds hundreds of rows.
  setInterval(() => {
    for (let i = 0; i < 8; i += 1) {
      writer.addCycle(reading(seq));
      seq += 1;
    }
    process.stdout.write(`gen ${seq - 1} ${Date.now()}\n`);
    if (seq % 4000 === 0) writer.addTransferPoint({ t: seq, controlV: 2, alphaDeg: 90 });
  }, 1);
}

void main();
