/**
 * The firmware when its link cannot carry everything: a 20 kHz pulse train on the gate input (a gate drive that
 * fires in bursts, or a noisy edge input) makes far more edge lines than the 1 Mbaud link carries (15 ms of it). Its buffers then
 * fill, and what it does is defined: it drops whole data blocks and single edges, counts both, and never sends a
 * damaged line. Every edge is accounted for (sent or counted lost), every lost block shows as a sequence gap.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createLoggerDecoder } from '../../../app/logger/decoder';
import { encodeCommand, parseEdgesBody } from '../../../app/logger/encode';
import { createFirmwareLogger, type FirmwareLogger } from '../../../main/firmware/firmwareLogger';
import { chipClockHz } from '../../../main/firmware/loggerChip';
import { halfWaveBoard } from '../../app/sim/simFixtures';
import { buildFirmware } from './firmwareBuild';
import { runScript, type SessionRun } from './sessionScript';

/** Between two of the board's own gate pulses (at 3.3 ms + k x 20 ms, 0.2 ms long): 15 ms, a change every 25 us. */
const burst = { fromS: 0.105, toS: 0.12, periodCycles: 400 };
const burstEdges: number[] = [];
const window = { fromS: 0.05, toS: 0.95 };

let logger: FirmwareLogger;
let run: SessionRun;
let zeroCycle = Number.NaN;

beforeAll(() => {
  logger = createFirmwareLogger(buildFirmware().image, halfWaveBoard(), { keepInputEdges: true, seed: 9 });
  logger.chip.onSampleHold = (cycle) => {
    if (Number.isNaN(zeroCycle)) zeroCycle = cycle;
  };
  const first = runScript(logger, [{ atS: 0.01, send: encodeCommand({ command: 'edges', on: true }) }], burst.fromS);
  // The burst: INT1 changes every 400 cycles (25 us), a 20 kHz pulse train, 40 000 edges a second; it ends low.
  const startCycle = Math.round(burst.fromS * chipClockHz) + 1000;
  for (let cycle = startCycle, high = true; cycle < burst.toS * chipClockHz || !high; cycle += burst.periodCycles, high = !high) {
    logger.chip.schedulePortD(3, high, cycle);
    burstEdges.push(cycle);
  }
  const rest = runScript(logger, [], 1.1);
  run = { lines: [...first.lines, ...rest.lines], simulatedS: first.simulatedS + rest.simulatedS, wallS: first.wallS + rest.wallS };
}, 300_000);

describe('logger firmware with more to send than its link carries', () => {
  it('never sends a damaged line', () => {
    const decoder = createLoggerDecoder();
    for (const entry of run.lines) decoder.pushLine(entry.line);
    const health = decoder.health();
    expect(health.crcFailures + health.garbageLines + health.badDataLines + health.badEdgeLines + health.oversizeLines).toBe(0);
  });

  it('counts every data block it dropped, and each shows as a gap in the sequence; none after the burst', () => {
    const decoder = createLoggerDecoder();
    for (const entry of run.lines) decoder.pushLine(entry.line);
    const status = run.lines.filter((entry) => entry.line.startsWith('S ')).at(-1)?.line ?? '';
    const overruns = Number(/overruns=(\d+)/.exec(status)?.[1]);
    console.log(`pulse train on the gate input: ${overruns} data blocks and ${/edgeslost=(\d+)/.exec(status)?.[1]} edges dropped and counted (${status.slice(0, status.indexOf('*'))})`);
    expect(overruns).toBeGreaterThan(0);
    expect(decoder.health().blocksLost).toBe(overruns);
    expect(decoder.health().loggerOverruns).toBe(overruns);
    const sequences = run.lines.filter((entry) => entry.atS > 0.3 && entry.line.startsWith('D ')).map((entry) => parseInt(entry.line.slice(2, 10), 16));
    sequences.slice(1).forEach((sequence, index) => expect(sequence).toBe(sequences[index] + 1));
  });

  it('sends or counts every edge: those stamped plus those dropped are those that came', () => {
    const status = run.lines.filter((entry) => entry.line.startsWith('S ')).at(-1)?.line ?? '';
    const lost = Number(/edgeslost=(\d+)/.exec(status)?.[1]);
    expect(lost).toBeGreaterThan(0);
    const inWindow = (cycle: number): boolean => cycle >= window.fromS * chipClockHz && cycle < window.toS * chipClockHz;
    const stamped = run.lines
      .filter((entry) => entry.line.startsWith('T '))
      .flatMap((entry) => parseEdgesBody(entry.line.slice(0, entry.line.lastIndexOf('*'))) ?? [])
      .filter((edge) => inWindow(zeroCycle + edge.ticks)).length;
    const came = logger.inputEdges().filter((edge) => inWindow(edge.cycle)).length + burstEdges.filter(inWindow).length;
    expect(stamped + lost).toBe(came);
  });
});
