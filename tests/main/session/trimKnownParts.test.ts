// The trim plan for the board as built: part values the technician measured, and changes fitted this session,
// reach the planner; a second change is fitted together with the first. Virtual board, pumped; real SQLite logbook.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { predictRamp } from '../../../app/board/rampModel';
import { wrongEmitterFactor } from '../../../app/sim/fittedBoard';
import { BenchCallError, type BenchClient } from '../../../app/contract';
import { demoDefaults } from '../../../main/session/commissioningDemo';
import type { PartRole } from '../../../app/board/design';
import { partName } from '../../../app/board/partNames';
import { openTestBench, type TestBench } from './benchClientKit';

let folder = '';
let bench: TestBench;
let client: BenchClient;

beforeEach(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-known-'));
  bench = await openTestBench(join(folder, 'logbook.sqlite'));
  client = bench.client;
});

afterEach(async () => {
  await bench.context.close();
  rmSync(folder, { recursive: true, force: true });
});

const pump = (seconds: number) => bench.pump(seconds);

async function peakAfterRecheck(): Promise<number> {
  pump(1.5);
  const recheck = await client.checkStep({ step: 'ramp' });
  return recheck.readings.find((reading) => reading.key === 'rampPeakV')!.value!;
}

describe('trim plans for the board as built', () => {
  it('a wrong emitter resistor, measured and told: the plan starts from it and its first change lands on target', async () => {
    const { design } = await client.getDesign({ name: demoDefaults.designName });
    const emitter = design.parts.rEmitter;
    const actualOhm = emitter.ohm * wrongEmitterFactor;
    await client.startSession({ unitSerial: 'TEST-K001', designName: design.name, operator: 'Tess' });
    await client.connect({ kind: 'virtual', designName: design.name, faults: ['wrong-emitter-resistor'], seed: 21 });
    pump(1.5);

    // Not told: the ramp alone cannot tell which part is off, so the plan lists the parts to measure, this one among them.
    const blind = await client.trimPlan({});
    expect(blind.knownParts).toEqual([]);
    expect(blind.status).toBe('repair');
    expect(blind.suggestions.filter((suggestion) => suggestion.kind === 'repair').map((suggestion) => suggestion.part)).toContain('rEmitter');

    // Told by designator: the plan says what it took, and starts from the measured value.
    const plan = await client.trimPlan({ measuredParts: { [emitter.ref ?? 'rEmitter']: actualOhm } });
    expect(plan.knownParts).toEqual([{ part: 'rEmitter', partRef: emitter.ref ?? null, value: actualOhm, designValue: emitter.ohm, source: 'measured' }]);
    const first = plan.suggestions[0];
    // Measured outside its tolerance: replace it with its design value.
    expect(first).toMatchObject({ kind: 'repair', part: 'rEmitter', method: 'replace', fromOhm: actualOhm, toOhm: emitter.ohm });
    // Left out, the session keeps what it was told; told the same again, the logbook gets it once.
    expect((await client.trimPlan({})).knownParts).toHaveLength(1);
    await client.trimPlan({ measuredParts: { rEmitter: actualOhm } });

    await client.applyTrim({ part: first.part, fromOhm: first.fromOhm, toOhm: first.toOhm, method: first.method, addOhm: first.addOhm, reason: first.reason, alsoChange: null });
    // Issue 3's check of advice that works: within 5 % of the target once re-checked.
    const peakV = await peakAfterRecheck();
    expect(Math.abs(peakV - design.rampTargetV) / design.rampTargetV).toBeLessThan(0.05);

    // The next plan knows the position now holds the fitted value, not the measured wrong one.
    const after = await client.trimPlan({});
    expect(after.knownParts).toEqual([{ part: 'rEmitter', partRef: emitter.ref ?? null, value: first.toOhm, designValue: emitter.ohm, source: 'fitted' }]);
    for (const suggestion of after.suggestions.filter((row) => row.part === 'rEmitter')) expect(suggestion.fromOhm).toBe(first.toOhm);

    // The logbook keeps the measurement beside the design value, for the record and the next technician.
    const row = await client.stopSession({});
    const detail = await client.sessionDetail({ sessionId: row.id });
    expect(detail.partMeasurements.map(({ part, value, designValue }) => ({ part, value, designValue }))).toEqual([{ part: 'rEmitter', value: actualOhm, designValue: emitter.ohm }]);
  });

  it('an empty set forgets measured values but keeps fitted ones; bad values are refused naming the field', async () => {
    const { design } = await client.getDesign({ name: demoDefaults.designName });
    await client.startSession({ unitSerial: 'TEST-K002', designName: design.name, operator: 'Tess' });
    await client.connect({ kind: 'virtual', designName: design.name, faults: ['capacitor-low'], seed: 22 });
    pump(1.5);
    // The emitter resistor measured good, the capacitor 30 % low: the plan says to replace the capacitor.
    const measuredC = design.parts.cRamp.farad * 0.7;
    const told = await client.trimPlan({ measuredParts: { rEmitter: design.parts.rEmitter.ohm, cRamp: measuredC } });
    expect(told.knownParts.map((part) => part.part)).toEqual(['rEmitter', 'cRamp']);
    const first = told.suggestions[0];
    expect(first).toMatchObject({ kind: 'repair', part: 'cRamp', fromFarad: measuredC, toFarad: design.parts.cRamp.farad });
    await client.applyTrim({ part: first.part, fromFarad: first.fromFarad, toFarad: first.toFarad, method: first.method, reason: first.reason, alsoChange: null });
    pump(1.5);
    const known = (await client.trimPlan({})).knownParts;
    // In the design's part order: the emitter resistor before the capacitor; the capacitor now as fitted.
    expect(known.map((part) => [part.part, part.source])).toEqual([['rEmitter', 'measured'], ['cRamp', 'fitted']]);
    expect((await client.trimPlan({ measuredParts: {} })).knownParts.map((part) => [part.part, part.source])).toEqual([['cRamp', 'fitted']]);

    for (const [measuredParts, words] of [
      [{ rEmitter: design.parts.rEmitter.ohm / 1000 }, 'more than 10 times off'],
      [{ R99: 1000 }, '"R99" is not a part of the design'],
      [{ rEmitter: -5 }, 'must be a positive number'],
    ] as const) {
      const error = await client.trimPlan({ measuredParts }).then(() => null, (caught: unknown) => caught);
      expect(error).toBeInstanceOf(BenchCallError);
      expect((error as BenchCallError).code).toBe('input');
      expect((error as BenchCallError).message).toContain('measuredParts');
      expect((error as BenchCallError).message).toContain(words);
    }
    // A refused value loses nothing already known.
    expect((await client.trimPlan({})).knownParts.map((part) => part.part)).toEqual([first.part]);
  });

  it('a change with a second part records both, fits both to the board, and the plan knows both', async () => {
    // A variant of the demo design whose ramp target sits 0.4 V under the clipping level (under the planner's
    // 0.5 V headroom): only moving the divider, with a new emitter resistor, lifts the clipping level enough.
    const demo = (await client.getDesign({ name: demoDefaults.designName })).design;
    const targetV = Number((predictRamp(demo).clipV - 0.4).toFixed(2));
    const { design } = await client.saveDesign({ design: { ...demo, name: 'tall target variant', rampTargetV: targetV } });
    const opened = await client.startSession({ unitSerial: 'TEST-K003', designName: design.name, operator: 'Tess' });
    await client.connect({ kind: 'virtual', designName: design.name, faults: ['capacitor-low'], seed: 23 });
    pump(1.5);
    const plan = await client.trimPlan({ series: 'E96' });
    const paired = plan.suggestions.find((suggestion) => suggestion.alsoChange !== null);
    expect(paired, 'the plan offers a divider change with its emitter resistor').toBeDefined();
    const second = paired!.alsoChange!;
    expect(paired!.reason).toContain(partName(design, second.part as PartRole));
    const applied = await client.applyTrim({ part: paired!.part, fromOhm: paired!.fromOhm, toOhm: paired!.toOhm, method: paired!.method, addOhm: paired!.addOhm, reason: paired!.reason, alsoChange: { part: second.part, fromOhm: second.fromOhm, toOhm: second.toOhm } });
    expect(applied.trim).toMatchObject({ part: paired!.part, toOhm: paired!.toOhm });
    const peakV = await peakAfterRecheck();
    // The plan's own prediction for the pair must hold on the board (the virtual board runs the same model, with
    // noise and quantisation: 1.5 % is the analysis bound for ramp peak, issue 2).
    expect(Math.abs(peakV / paired!.predictedPeakV - 1)).toBeLessThan(0.015);
    const known = (await client.trimPlan({})).knownParts;
    expect(known.map((part) => part.part).sort()).toEqual([paired!.part, second.part].sort());
    const detail = await client.sessionDetail({ sessionId: opened.id });
    expect(detail.trims.map((trim) => [trim.part, trim.toOhm])).toEqual([[paired!.part, paired!.toOhm], [second.part, second.toOhm]]);
    // The same position twice is refused.
    const error = await client.applyTrim({ part: 'rEmitter', fromOhm: 1, toOhm: 2, method: 'replace', addOhm: null, reason: '', alsoChange: { part: 'rEmitter', fromOhm: 1, toOhm: 3 } }).then(() => null, (caught: unknown) => caught);
    expect((error as BenchCallError).message).toContain('another position');
  });
});
