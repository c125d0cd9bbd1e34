/**
 * One of several processes the concurrent-open test starts at the same instant on the same new logbook file: it
 * waits for the agreed start time, opens the logbook (creating it), records a session of one cycle and prints
 * `ok <session id>`, or `failed <message>`. Run by concurrentOpen.test.ts with tsx; not a test itself.
 */
import type { BoardDesign } from '../../../app/board/design';
import { openLogbook } from '../../../main/store/openLogbook';

const [dbPath, designJson, startAtText, unit] = process.argv.slice(2);

async function main(): Promise<void> {
  const design = JSON.parse(designJson) as BoardDesign;
  await new Promise((resolve) => setTimeout(resolve, Math.max(0, Number(startAtText) - Date.now())));
  const logbook = await openLogbook(dbPath);
  const writer = await logbook.startSession({ unitSerial: unit, design, operator: 'concurrent open' });
  writer.addCycle({
    t: 0, halfCycle: 'positive', periodS: 0.02, alphaDeg: 75, controlV: 3, pulses: 1, wrongHalfCyclePulses: 0,
    rampPeakV: 7.3, rampFloorV: 0.1, slopeVPerMs: 0.73, startDelayDeg: 1, nonlinearityPct: 0.4, clipped: false, resetUs: 300,
  });
  const row = await writer.close();
  await logbook.close();
  process.stdout.write(`ok ${row.id}\n`);
}

main().catch((error: unknown) => {
  process.stdout.write(`failed ${error instanceof Error ? error.message : String(error)}\n`);
  process.exitCode = 1;
});
