/**
 * The firing-board deck itself (the reference other suites trust): sync, reset, comparator and pulse stage do
 * what the design says. Checked on the traces ngspice returns, against the design's own numbers.
 */
import { describe, expect, it } from 'vitest';
import { boardDesignSchema } from '../../../app/board/design';
import { buildFiringBoardDeck, simulateFiringBoard } from '../../reference/firingBoardDeck';
import { ngspiceAvailable } from '../../reference/ngspice';
import { referenceBoards } from '../../reference/boardCases';

function edges(timeS: Float64Array, values: Float64Array, levelV: number): { rising: number[]; falling: number[] } {
  const rising: number[] = [];
  const falling: number[] = [];
  for (let index = 1; index < timeS.length; index += 1) {
    const before = values[index - 1] - levelV;
    const after = values[index] - levelV;
    if (before * after > 0 || before === after) continue;
    const crossS = timeS[index - 1] + (before / (before - after)) * (timeS[index] - timeS[index - 1]);
    (after > before ? rising : falling).push(crossS);
  }
  return { rising, falling };
}

describe('firing-board deck', () => {
  it('builds a netlist with an explicit Early voltage and the nodes it names', () => {
    const deck = buildFiringBoardDeck(referenceBoards.fullWave50, { controlV: { fromV: 1, toV: 4 }, cycles: 4 });
    expect(deck.netlist).toMatch(/\.model QRAMP PNP\(IS=[^)]*VAF=60/);
    expect(deck.netlist).toContain('PWL(0 1.000000000 0.08000000000 4.000000000)');
    expect(deck.stopS).toBeCloseTo(0.08, 12);
    expect(deck.suggestedStepS).toBeLessThanOrEqual(5e-6);
    expect(Object.values(deck.nodes)).toEqual(['v(sync)', 'v(ramp)', 'v(gate)', 'v(control)', 'v(emit)']);
  });

  it.skipIf(!ngspiceAvailable())('full-wave: gate pulses of gatePulseUs, one per half-cycle, sync lagging by syncPhaseDeg', () => {
    const board = boardDesignSchema.parse({ ...referenceBoards.fullWave50, syncPhaseDeg: 6, gatePulseUs: 150 });
    const traces = simulateFiringBoard(board, { controlV: 2.5, cycles: 3 });
    // Sync zero crossings where the deck puts them: 6 deg after the mains crossings, every 10 ms (0.05 deg = 2.8 us).
    const sync = edges(traces.timeS, traces.sync, 0);
    const crossings = [...sync.rising, ...sync.falling].sort((first, second) => first - second);
    crossings.forEach((crossingS, index) => expect(Math.abs(crossingS - (6 / 360 / 50 + index * 0.01))).toBeLessThan(3e-6));
    const gate = edges(traces.timeS, traces.gate, 2.5);
    // The first half-cycle starts from the operating point; afterwards one pulse per half-cycle.
    expect(gate.rising.length).toBeGreaterThanOrEqual(5);
    gate.rising.forEach((risingS, index) => {
      // 50 % width within 2 us of the design's 150 us (print step 5 us, linear interpolation on both edges).
      expect(Math.abs(gate.falling[index] - risingS - 150e-6)).toBeLessThan(2e-6);
    });
    const spacings = gate.rising.slice(1).map((risingS, index) => risingS - gate.rising[index]);
    // Within 3 us (0.054 deg): the solver's step (up to the 5 us print step) falls anywhere on the comparator's
    // edge, so one edge may land up to about half a step off; the half-cycles average it out.
    for (const spacingS of spacings) expect(Math.abs(spacingS - 0.01)).toBeLessThan(3e-6);
  });

  it.skipIf(!ngspiceAvailable())('half-wave: the ramp is held at its floor through the negative half-cycle and fires only in the positive one', () => {
    const board = referenceBoards.halfWave60;
    const traces = simulateFiringBoard(board, { controlV: 2, cycles: 3 });
    const periodS = 1 / 60;
    for (let index = 0; index < traces.timeS.length; index += 1) {
      const phase = (traces.timeS[index] % periodS) / periodS;
      // Negative half-cycle, away from the reset edges: the ramp sits at its millivolt floor.
      if (phase > 0.52 && phase < 0.98) expect(traces.ramp[index]).toBeLessThan(0.05);
    }
    const gate = edges(traces.timeS, traces.gate, 2.5);
    expect(gate.rising.length).toBe(3);
    for (const risingS of gate.rising) expect((risingS % periodS) / periodS).toBeLessThan(0.5);
  });
});
