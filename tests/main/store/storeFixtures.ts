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

/** Step reports as the bench records them, with only the readings the logbook's figures are taken from. */
export function recordedStepsJson(figures: { rampPeakV?: number; slopeVPerMs?: number; gainDegPerV?: number; offsetDeg?: number; alphaMinDeg?: number; alphaMaxDeg?: number }): string {
  const reading = (key: string, value: number | undefined, unit: string) => ({ key, label: key, unit, value: value ?? null, expected: null, low: null, high: null, verdict: null, note: null });
  const step = (name: string, readings: ReturnType<typeof reading>[]) => ({ step: name, status: 'done', verdict: 'in-tolerance', readings, cycles: 50, note: null });
  return JSON.stringify([
    step('ramp', [reading('rampPeakV', figures.rampPeakV, 'V'), reading('slopeVPerMs', figures.slopeVPerMs, 'V/ms')]),
    step('transfer', [reading('gainDegPerV', figures.gainDegPerV, 'deg/V'), reading('offsetDeg', figures.offsetDeg, 'deg')]),
    step('limits', [reading('alphaMaxDeg', figures.alphaMaxDeg, 'deg'), reading('alphaMinDeg', figures.alphaMinDeg, 'deg')]),
  ]);
}
