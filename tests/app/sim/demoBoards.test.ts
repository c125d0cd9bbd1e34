/** Every fault on every demo board of fixtures/boards (our own designs): finite signals, and the fault takes hold. */
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseBoardDesign } from '../../../app/board/parseBoardDesign';
import { predictRamp } from '../../../app/board/rampModel';
import { boardFaultNames } from '../../../app/sim/faults';
import { createVirtualBoard } from '../../../app/sim/virtualBoard';

const folder = new URL('../../../fixtures/boards/', import.meta.url);
const designs = readdirSync(folder)
  .filter((name) => name.endsWith('.board.json'))
  .map((name) => parseBoardDesign(JSON.parse(readFileSync(new URL(name, folder), 'utf8')), name));

describe('virtual board on the demo boards', () => {
  it('has demo boards to run', () => expect(designs.length).toBeGreaterThan(0));

  for (const design of designs) {
    it(`${design.name}: every board fault gives finite samples, and clipped-ramp clips`, () => {
      for (const fault of boardFaultNames) {
        if (fault === 'wrong-half-cycle-pulses' && design.rectifier !== 'half-wave') continue;
        const board = createVirtualBoard(design, { faults: [fault], sampleRateHz: 10_000 });
        const block = board.nextBlock(2000);
        for (const signal of [block.sync, block.ramp, block.gate, block.control!]) expect(signal.every(Number.isFinite)).toBe(true);
        if (fault === 'clipped-ramp') expect(board.fitted.prediction.clipped).toBe(true);
        if (fault === 'capacitor-low') expect(board.fitted.prediction.peakV).toBeGreaterThan(predictRamp(design).peakV);
        if (fault === 'wrong-emitter-resistor') expect(board.fitted.prediction.peakV).toBeLessThan(predictRamp(design).peakV);
      }
    });
  }
});
