/**
 * `rampwright trim` end to end: boards of our own with parts off are simulated by ngspice (outside reference),
 * written as CSV captures, measured by the analysis engine through the command, and the first suggestion applied in
 * a second ngspice run must bring the ramp within 5 % of the target (issue 3). On a held-out board (sized here, in
 * no fixture) with its ramp capacitor 30 % low, the plan names the capacitor first, to be replaced (issue 11).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sizeBoard } from '../../../../app/board/sizeBoard';
import { sizingTargetsSchema } from '../../../../app/board/sizingTargets';
import type { TrimPlan } from '../../../../app/board/trimPlan';
import { readDeckRamp, referenceBoards } from '../../../reference/boardCases';
import { type FiringBoardTraces, simulateFiringBoard } from '../../../reference/firingBoardDeck';
import { ngspiceAvailable } from '../../../reference/ngspice';
import { runCli } from '../cliRun';

const board = referenceBoards.fullWave50;
let folder = '';

function writeCsv(path: string, traces: FiringBoardTraces): void {
  const rows = ['t,sync,ramp,gate,control'];
  for (let index = 0; index < traces.timeS.length; index += 1) {
    rows.push(`${traces.timeS[index].toFixed(7)},${traces.sync[index].toFixed(5)},${traces.ramp[index].toFixed(5)},${traces.gate[index].toFixed(4)},${traces.control[index].toFixed(4)}`);
  }
  writeFileSync(path, `${rows.join('\n')}\n`);
}

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-trim-'));
  writeFileSync(join(folder, 'board-a.board.json'), JSON.stringify(board));
});
afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('rampwright trim', () => {
  it('bad options and files exit 2 naming what is wrong', async () => {
    const badSeries = await runCli(['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'x.csv'), '--series', 'E48']);
    expect(badSeries.code).toBe(2);
    expect(badSeries.stderr).toContain('--series');
    const noDesign = await runCli(['trim', '--design', join(folder, 'none.board.json'), '--capture', join(folder, 'x.csv')]);
    expect(noDesign.code).toBe(2);
    expect(noDesign.stderr).toContain('none.board.json');
    writeFileSync(join(folder, 'flat.csv'), `t,sync,ramp,gate\n${Array.from({ length: 2000 }, (_, index) => `${index * 1e-4},0,0,0`).join('\n')}\n`);
    const flat = await runCli(['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'flat.csv')]);
    expect(flat.code).toBe(2);
    expect(flat.stderr).toContain('flat.csv');
  });

  it.skipIf(!ngspiceAvailable())('plans from an ngspice capture, and the first suggestion works in ngspice', async () => {
    const fitted = { cRamp: 5.6e-7 };
    // 16 cycles: the analysis learns its levels over the first 0.2 s. 10 us steps: 100 kS/s.
    const traces = simulateFiringBoard(board, { controlV: 3, cycles: 16, partOverrides: fitted, stepS: 1e-5 });
    writeCsv(join(folder, 'board-a.csv'), traces);
    const result = await runCli(['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'board-a.csv'), '--series', 'E24', '--json']);
    expect(result.stderr).toBe('');
    expect(result.code).toBe(0);
    const plan = JSON.parse(result.stdout) as TrimPlan;
    expect(plan.status).toBe('trim');
    const best = plan.suggestions[0];
    expect(best).toMatchObject({ part: 'rEmitter', series: 'E24' });
    expect(['replace', 'parallel', 'series']).toContain(best.method);
    expect(typeof best.predictedPeakV).toBe('number');
    expect(plan.estimate.chargingCurrentA).toBeGreaterThan(0);
    expect(plan.estimate.vebV).toBeGreaterThan(0);

    const added = best.addOhm ?? NaN;
    const newOhm = best.method === 'replace' ? (best.toOhm ?? NaN) : best.method === 'parallel' ? (7500 * added) / (7500 + added) : 7500 + added;
    const after = simulateFiringBoard(board, { controlV: 100, cycles: 3, partOverrides: { ...fitted, rEmitter: newOhm } });
    const reading = readDeckRamp(after, board, 4);
    expect(Math.abs(reading.peakV / board.rampTargetV - 1)).toBeLessThan(0.05);

    const human = await runCli(['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'board-a.csv')]);
    expect(human.code).toBe(0);
    expect(human.stdout).toContain('Measured ramp');
    expect(human.stdout).toContain('R7');

    // A measured value with its prefix slipped, a part the board does not have, and a bare number: exit 2, named.
    const slipped = await runCli(['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'board-a.csv'), '--part', 'R7=5.1']);
    expect(slipped.code).toBe(2);
    expect(slipped.stderr).toContain('--part');
    expect(slipped.stderr).toContain('more than 10 times off');
    const unknown = await runCli(['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'board-a.csv'), '--part', 'R99=5k1']);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toContain('"R99" is not a part of the design');
    const bare = await runCli(['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'board-a.csv'), '--part', '5k1']);
    expect(bare.code).toBe(2);
    expect(bare.stderr).toContain('is not DESIGNATOR=VALUE');

    // The 60 Hz heater design against this 50 Hz capture: refused, not planned.
    const wrongDesign = await runCli(['trim', '--design', join(__dirname, '../../../../fixtures/boards/heater-ht60f.board.json'), '--capture', join(folder, 'board-a.csv')]);
    expect(wrongDesign.code).toBe(2);
    expect(wrongDesign.stderr).toContain('wrong design file');
  });

  it.skipIf(!ngspiceAvailable())('a wrong emitter resistor measured and told with --part: the plan starts from it and its first change works in ngspice', async () => {
    // The board has 5.1 kohm where the design says 7.5 kohm (R7): the ramp is about 45 % tall.
    const fitted = { rEmitter: 5100 };
    const traces = simulateFiringBoard(board, { controlV: 3, cycles: 16, partOverrides: fitted, stepS: 1e-5 });
    writeCsv(join(folder, 'board-a-r7.csv'), traces);
    const args = ['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'board-a-r7.csv'), '--json'];

    // Not told: the ramp alone cannot tell which part is off; R7 is among the parts the plan says to measure.
    const blind = JSON.parse((await runCli(args)).stdout) as TrimPlan;
    expect(blind.status).toBe('repair');
    expect(blind.suggestions.filter((suggestion) => suggestion.kind === 'repair').map((suggestion) => suggestion.part)).toContain('rEmitter');

    // Told by designator with the prefix as decimal point: the plan starts from 5.1 kohm.
    const told = await runCli([...args, '--part', 'R7=5k1']);
    expect(told.stderr).toBe('');
    expect(told.code).toBe(0);
    const plan = JSON.parse(told.stdout) as TrimPlan & { measuredParts: Record<string, number> };
    expect(plan.measuredParts).toEqual({ rEmitter: 5100 });
    const best = plan.suggestions[0];
    // Back to the design value: the planner found that R7 itself is the fault.
    expect(best).toMatchObject({ kind: 'repair', part: 'rEmitter', method: 'replace', fromOhm: 5100, toOhm: 7500 });
    const reading = readDeckRamp(simulateFiringBoard(board, { controlV: 100, cycles: 3, partOverrides: { rEmitter: best.toOhm ?? NaN } }), board, 4);
    // Issue 3: within 5 % of the target, checked in ngspice (outside reference).
    expect(Math.abs(reading.peakV / board.rampTargetV - 1)).toBeLessThan(0.05);

    const human = await runCli(['trim', '--design', join(folder, 'board-a.board.json'), '--capture', join(folder, 'board-a-r7.csv'), '--part', 'R7=5.1k']);
    expect(human.code).toBe(0);
    expect(human.stdout).toContain('Planned for the board as built: emitter resistor R7 taken as 5k1.');
    expect(human.stdout).toContain('Replace the emitter resistor R7 with 7k5: measured 5k1');
  });

  it.skipIf(!ngspiceAvailable())('a held-out board with its ramp capacitor 30 % low: trim --json names the capacitor first, to be replaced', async () => {
    // Sized here from targets of our own: 60 Hz full-wave, 18 V, 330 nF, E24; every part as designed but C.
    const heldOut = { ...sizeBoard(sizingTargetsSchema.parse({ name: 'Held-out board H (60 Hz full-wave)', mainsHz: 60, rectifier: 'full-wave', supplyV: 18, rampTargetV: 7.5, cRampFarad: 3.3e-7, syncPhaseDeg: 5 })).design };
    heldOut.parts = { ...heldOut.parts, cRamp: { ...heldOut.parts.cRamp, ref: 'C9' }, rEmitter: { ...heldOut.parts.rEmitter, ref: 'R21' } };
    writeFileSync(join(folder, 'held-out.board.json'), JSON.stringify(heldOut));
    const fitted = { cRamp: heldOut.parts.cRamp.farad * 0.7 };
    writeCsv(join(folder, 'held-out.csv'), simulateFiringBoard(heldOut, { controlV: 3, cycles: 16, partOverrides: fitted, stepS: 1e-5 }));
    const result = await runCli(['trim', '--design', join(folder, 'held-out.board.json'), '--capture', join(folder, 'held-out.csv'), '--json']);
    expect(result.stderr).toBe('');
    expect(result.code).toBe(0);
    const plan = JSON.parse(result.stdout) as TrimPlan;
    expect(plan.status).toBe('repair');
    expect(plan.suggestions[0]).toMatchObject({ kind: 'repair', part: 'cRamp', method: 'replace', toFarad: heldOut.parts.cRamp.farad });
    // Replaced with its design value in ngspice, the ramp lands on target as predicted.
    const after = readDeckRamp(simulateFiringBoard(heldOut, { controlV: 100, cycles: 3 }), heldOut, 4);
    expect(Math.abs(after.peakV / heldOut.rampTargetV - 1)).toBeLessThan(0.05);
    expect(Math.abs(plan.suggestions[0].predictedPeakV / after.peakV - 1)).toBeLessThan(0.01);
    // In words: the capacitor by its designator, its value as marked, which part to measure first and why.
    const human = await runCli(['trim', '--design', join(folder, 'held-out.board.json'), '--capture', join(folder, 'held-out.csv')]);
    expect(human.stdout).toContain('measure the ramp capacitor C9 and replace it with 330n');
    expect(human.stdout).toMatch(/Note: Measure the ramp capacitor C9 first \(.*emitter resistor R21.*\): capacitors drift and fail far more often than resistors/);
    // Its sync lags the mains 5 deg by design and its ramp starts on time: no false alarm about the sync circuit.
    expect(human.stdout).not.toContain('sync and reset');
    // After the capacitor is replaced the control limit is the design's own: no resistor change to hide the fault.
    expect(plan.controlLimit).toBeNull();
  });
});
