/**
 * A realistic session of our own for the record and exchange tests: the virtual board (app/sim) runs the demo
 * charger design with a slow control sweep, the capture analyzer measures it, and everything goes into a fresh
 * logbook the way the session service writes it: cycles, transfer points, the readings, one kept capture, a trim
 * and link events. Invented unit serial RW-7731.
 */
import type { SampleBlock } from '../../../app/capture/samples';
import { createCaptureAnalyzer } from '../../../app/bench/captureAnalyzer';
import type { BoardDesign } from '../../../app/board/design';
import { synthesiseCapture } from '../../../app/sim';
import { stepReports } from '../../../main/session/steps';
import type { Logbook, SessionSignOff } from '../../../main/store/logbookTypes';
import { chargerDesign } from '../store/storeFixtures';

export function mergeBlocks(blocks: readonly SampleBlock[]): SampleBlock {
  const length = blocks.reduce((sum, block) => sum + block.sync.length, 0);
  const join = (pick: (block: SampleBlock) => Float64Array) => {
    const out = new Float64Array(length);
    let offset = 0;
    for (const block of blocks) {
      out.set(pick(block), offset);
      offset += block.sync.length;
    }
    return out;
  };
  return {
    startS: blocks[0].startS,
    sampleRateHz: blocks[0].sampleRateHz,
    sync: join((block) => block.sync),
    ramp: join((block) => block.ramp),
    gate: join((block) => block.gate),
    control: blocks.every((block) => block.control) ? join((block) => block.control as Float64Array) : null,
    afterGap: false,
  };
}

export interface RecordedSession {
  sessionId: number;
  design: BoardDesign;
  capture: SampleBlock;
}

export async function recordSweepSession(logbook: Logbook, options: { unitSerial?: string; startedAt?: Date; seconds?: number; seed?: number; steps?: boolean; signOff?: SessionSignOff; bench?: string } = {}): Promise<RecordedSession> {
  const design = chargerDesign();
  const blocks = [...synthesiseCapture(design, { durationS: options.seconds ?? 1.2, sampleRateHz: 10_000, seed: options.seed ?? 7, controlSweep: { fromV: 2, toV: 6, periodS: 2.4 } })];
  const analyzer = createCaptureAnalyzer({ rectifier: design.rectifier, syncPhaseDeg: design.syncPhaseDeg, keepPerCycle: true });
  const writer = await logbook.startSession({ unitSerial: options.unitSerial ?? 'RW-7731', design, operator: 'A. Tester', notes: 'sweep for the record', startedAt: options.startedAt ?? new Date('2026-11-20T08:30:00Z'), bench: options.bench });
  for (const block of blocks) {
    for (const cycle of analyzer.push(block)) {
      writer.addCycle(cycle);
      if (cycle.alphaDeg !== null && cycle.controlV !== null) writer.addTransferPoint({ t: cycle.t, controlV: cycle.controlV, alphaDeg: cycle.alphaDeg });
    }
  }
  const readings = analyzer.finish();
  writer.setReadings(readings);
  const capture = mergeBlocks(blocks.slice(0, Math.max(1, Math.floor(blocks.length / 3))));
  writer.addCapture(capture, 'ramp check');
  // Measured before the trim (our scenario): the emitter resistor 2 % low, the ramp capacitor 6 % low.
  writer.addPartMeasurement({ part: 'rEmitter', value: 6650, designValue: 6800 });
  writer.addPartMeasurement({ part: 'cRamp', value: 4.42e-7, designValue: 4.7e-7 });
  writer.addTrim({ part: 'R14', fromOhm: 6800, toOhm: 7500, method: 'trim plan', reason: 'ramp peak 4 % high: emitter resistor one E24 step up' });
  // The steps as the session service records them (main/session/steps.ts), unless the caller wants a session from
  // before steps were kept.
  if (options.steps ?? true) {
    const inputs = { design, window: readings, transferFit: readings.transfer, extremes: { alphaMinDeg: readings.pulse.alphaMinDeg, alphaMaxDeg: readings.pulse.alphaMaxDeg, controlMinV: readings.transfer?.controlMinV ?? null, controlMaxV: readings.transfer?.controlMaxV ?? null, cycles: readings.firingIntervals, cyclesBelowRange: 0 }, recorded: {}, recheckNeeded: false, trimsApplied: 1, signedOff: options.signOff !== undefined };
    // The sign-off step is among the recorded steps only of a session that was signed off.
    const reports = stepReports(inputs).filter((report) => report.step !== 'sign-off' || options.signOff !== undefined);
    writer.setStepsJson(JSON.stringify(reports.map((report) => ({ ...report, status: 'done' }))));
  }
  writer.addLinkEvent('opened', 'virtual board', 1);
  writer.addLinkEvent('crc-failures', '3 lines failed their CRC', 3);
  const row = await writer.close('closed', options.signOff);
  return { sessionId: row.id, design, capture };
}
