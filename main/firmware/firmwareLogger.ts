/**
 * The real logger firmware on the simulated chip, wired to the virtual board. The board's test-point voltages, on
 * a 100 kHz grid and interpolated between its points, reach the ADC pins through the front end (frontEnd.ts); the
 * sync comparator drives INT0 at the cycle the sync crosses its switching level (interpolated between grid
 * points), and the gate input drives INT1 at the board's exact pulse edges (a comparator on an ideal step switches
 * at the step). What the firmware sends comes back as protocol lines; host commands go in through its receiver at
 * the link's byte rate. Time is signal time since power-up: chip cycle / 16 MHz, the board's sample clock.
 */
import type { BoardDesign } from '../../app/board/design';
import type { SignalRole } from '../../app/capture/samples';
import { createVirtualBoard, type VirtualBoard, type VirtualBoardOptions } from '../../app/sim/virtualBoard';
import { gateComparator, inputNetworks, pinVolts, syncComparator } from './frontEnd';
import { chipClockHz, createLoggerChip, type LoggerChip } from './loggerChip';

/** Grid of the analog signals (Hz): one point every 160 cycles. The ADC reads between points by interpolation. */
export const analogGridHz = 100_000;
const cyclesPerPoint = chipClockHz / analogGridHz;
/** Signal generated and run per step (grid points): 2 ms. */
const chunkPoints = 200;

export interface ComparatorEdge {
  role: 'sync' | 'gate';
  direction: 'rising' | 'falling';
  /** Chip cycle at which the input changed. */
  cycle: number;
}

export interface FirmwareLoggerOptions extends Omit<VirtualBoardOptions, 'sampleRateHz' | 'adcBits' | 'samplingJitterS'> {
  /** Keep every edge input change for checking (tests); default false. */
  keepInputEdges?: boolean;
}

export interface FirmwareLogger {
  readonly chip: LoggerChip;
  /** The board as the analog source. */
  readonly board: VirtualBoard;
  /** Runs to signal time `timeS`; returns the complete lines the firmware sent (LF removed). */
  runUntil(timeS: number): string[];
  /** Sends one host command line (an LF is added). */
  sendLine(line: string): void;
  timeS(): number;
  /** Edge input changes so far (only with keepInputEdges). */
  inputEdges(): readonly ComparatorEdge[];
}

export function createFirmwareLogger(image: Uint8Array, design: BoardDesign, options: FirmwareLoggerOptions = {}): FirmwareLogger {
  const chip = createLoggerChip(image);
  // The front end filters the board's wide-band noise: the analog source has little of it; quantisation is the ADC's.
  const board = createVirtualBoard(design, { noiseV: 0.001, ...options, sampleRateHz: analogGridHz, adcBits: 16 });
  const roles: SignalRole[] = inputNetworks.map((network) => network.role as SignalRole);
  // Point 0 of each signal is the last point of the step before; points 1..chunkPoints are new.
  const points: Record<SignalRole, Float64Array> = {
    sync: new Float64Array(chunkPoints + 1),
    ramp: new Float64Array(chunkPoints + 1),
    gate: new Float64Array(chunkPoints + 1),
    control: new Float64Array(chunkPoints + 1),
  };
  let firstStep = true;
  let pointZeroCycle = 0;
  let syncHigh = false;
  let partial = '';
  const kept: ComparatorEdge[] = [];

  chip.setAnalogInput((channel, cycle) => {
    if (channel >= roles.length) return 0;
    const values = points[roles[channel]];
    const position = Math.min(chunkPoints, Math.max(0, (cycle - pointZeroCycle) / cyclesPerPoint));
    const index = Math.min(chunkPoints - 1, Math.floor(position));
    const fraction = position - index;
    return pinVolts(inputNetworks[channel], values[index] + fraction * (values[index + 1] - values[index]));
  });

  function edge(role: ComparatorEdge['role'], high: boolean, cycle: number): void {
    const pin = role === 'sync' ? syncComparator.portDPin : gateComparator.portDPin;
    chip.schedulePortD(pin, high, cycle);
    if (options.keepInputEdges) kept.push({ role, direction: high ? 'rising' : 'falling', cycle });
  }

  function scheduleSync(): void {
    const { thresholdV, hysteresisV } = syncComparator;
    const values = points.sync;
    for (let index = 1; index <= chunkPoints; index++) {
      const levelV = syncHigh ? thresholdV - hysteresisV : thresholdV + hysteresisV;
      const value = values[index];
      if (syncHigh ? value >= levelV : value <= levelV) continue;
      syncHigh = !syncHigh;
      const previous = values[index - 1];
      const fraction = previous !== value ? (levelV - previous) / (value - previous) : 1;
      edge('sync', syncHigh, Math.round(pointZeroCycle + (index - 1 + fraction) * cyclesPerPoint));
    }
  }

  /** One step: the next chunkPoints of signal, their edges scheduled, the chip run up to the last new point. */
  function step(): void {
    const startS = board.timeS();
    const block = board.nextBlock(chunkPoints + (firstStep ? 1 : 0));
    const offset = firstStep ? 0 : 1;
    for (const role of roles) {
      const values = points[role];
      const fresh = block[role] ?? new Float64Array(block.sync.length);
      if (!firstStep) values[0] = values[chunkPoints];
      values.set(fresh, offset);
    }
    if (firstStep) {
      syncHigh = points.sync[0] > syncComparator.thresholdV;
      chip.schedulePortD(syncComparator.portDPin, syncHigh, 0);
    }
    pointZeroCycle = Math.round((firstStep ? startS : startS - 1 / analogGridHz) * chipClockHz);
    firstStep = false;
    scheduleSync();
    for (const gate of board.gateEdgesBetween(pointZeroCycle / chipClockHz, board.timeS() - 1 / analogGridHz)) {
      edge('gate', gate.rising, Math.max(chip.cpu.cycles, Math.round(gate.timeS * chipClockHz)));
    }
    chip.runUntil(pointZeroCycle + chunkPoints * cyclesPerPoint);
  }

  return {
    chip,
    board,
    runUntil(timeS) {
      const untilCycle = Math.round(timeS * chipClockHz);
      while (chip.cpu.cycles + chunkPoints * cyclesPerPoint <= untilCycle) step();
      const lines = (partial + chip.takeOutput()).split('\n');
      partial = lines.pop() ?? '';
      return lines;
    },
    sendLine(line) {
      chip.receive(`${line}\n`);
    },
    timeS: () => chip.cpu.cycles / chipClockHz,
    inputEdges: () => kept,
  };
}
