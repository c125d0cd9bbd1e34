/** Shared makings for the logbook tests: a board design of our own, cycle readings, temporary logbook files. */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { CycleReading } from '../../../app/bench/readings';
import { boardDesignSchema, type BoardDesign } from '../../../app/board/design';

export function chargerDesign(): BoardDesign {
  const text = readFileSync(new URL('../../../fixtures/boards/charger-ch50h.board.json', import.meta.url), 'utf8');
  return boardDesignSchema.parse(JSON.parse(text));
}

export function cycleReading(t: number, values: Partial<CycleReading> = {}): CycleReading {
  return {
    t,
    halfCycle: 'positive',
    periodS: 0.02,
    alphaDeg: 90,
    controlV: null,
    pulses: 1,
    wrongHalfCyclePulses: 0,
    rampPeakV: 7.3,
    rampFloorV: 0.1,
    slopeVPerMs: 0.73,
    startDelayDeg: 1,
    nonlinearityPct: 0.5,
    clipped: false,
    resetUs: 300,
    ...values,
  };
}

export interface TempFolder {
  path: string;
  file(name: string): string;
  remove(): void;
}

export function tempFolder(prefix = 'rampwright-store-'): TempFolder {
  const path = mkdtempSync(join(tmpdir(), prefix));
  return { path, file: (name) => join(path, name), remove: () => rmSync(path, { recursive: true, force: true }) };
}
