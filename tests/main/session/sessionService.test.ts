// The session service over the virtual board and a real SQLite logbook: readings, verdicts, a stored session,
// trim and re-check, and refusals a technician understands. The virtual board is pumped (faster than real time).
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { predictRamp } from '../../../app/board/rampModel';
import { lowCapacitorFactor } from '../../../app/sim/fittedBoard';
import { BenchCallError, type BenchClient, type LiveFrame } from '../../../app/contract';
import type { BenchContext } from '../../../main/session/benchContext';
import { demoDefaults } from '../../../main/session/commissioningDemo';
import { openTestBench } from './benchClientKit';

let folder = '';
let context: BenchContext;
let client: BenchClient;
const liveFrames: LiveFrame[] = [];

beforeEach(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-session-'));
  // Every result is checked against the contract's schemas too: a mismatch comes back as a bug.
  ({ context, client } = await openTestBench(join(folder, 'logbook.sqlite')));
  liveFrames.length = 0;
  client.subscribe('live', (frame) => liveFrames.push(frame));
});

afterEach(async () => {
  await context.close();
  rmSync(folder, { recursive: true, force: true });
});

const pump = (seconds: number) => context.service.virtual()!.pump(seconds);

async function refusal(promise: Promise<unknown>): Promise<BenchCallError> {
  const error = await promise.then(() => null, (caught: unknown) => caught);
  expect(error).toBeInstanceOf(BenchCallError);
  return error as BenchCallError;
}

describe('session service on the virtual board', () => {
  it('measures the demo board with a low ramp capacitor, judges it, and records a closed session', async () => {
    const { design } = await client.getDesign({ name: demoDefaults.designName });
    const opened = await client.startSession({ unitSerial: 'TEST-0001', designName: design.name, operator: 'Tess' });
    await client.connect({ kind: 'virtual', designName: design.name, faults: ['capacitor-low'], seed: 7 });
    pump(1.5);

    const state = await client.benchState();
    expect(state.session?.id).toBe(opened.id);
    expect(state.link.state).toBe('streaming');
    expect(state.link.sampleRateHz).toBe(25_000);
    const sync = state.steps.find((step) => step.step === 'sync')!;
    const frequency = sync.readings.find((reading) => reading.key === 'frequencyHz')!;
    // The virtual board runs at the design's 50 Hz; issue 2's accuracy bound for frequency is 0.05 Hz.
    expect(frequency.value).toBeCloseTo(50, 1);
    expect(Math.abs(frequency.value! - 50)).toBeLessThan(0.05);
    expect(sync.verdict).toBe('in-tolerance');

    const ramp = state.steps.find((step) => step.step === 'ramp')!;
    const peak = ramp.readings.find((reading) => reading.key === 'rampPeakV')!;
    // The board model with the capacitor 30 % low (the fault's own factor) is the outside value here;
    // 1.5 % is the analysis accuracy bound for ramp peak (issue 2, checked against ngspice there).
    const expectedPeakV = predictRamp(design, { partOverrides: { cRamp: design.parts.cRamp.farad * lowCapacitorFactor } }).peakV;
    expect(Math.abs(peak.value! - expectedPeakV) / expectedPeakV).toBeLessThan(0.015);
    expect(peak.expected).toBe(design.rampTargetV);
    expect(peak.verdict).toBe('out-of-tolerance');
    expect(ramp.verdict).toBe('out-of-tolerance');

    const recorded = await client.checkStep({ step: 'ramp' });
    expect(recorded.status).toBe('done');
    const row = await client.stopSession({ notes: 'bench test' });
    expect(row).toMatchObject({ id: opened.id, unit: 'TEST-0001', status: 'closed' });
    expect(row.cycles).toBeGreaterThan(50);

    const listed = await client.listSessions({ unitSerial: 'TEST-0001' });
    expect(listed.sessions.map((session) => session.id)).toEqual([opened.id]);
    const detail = await client.sessionDetail({ sessionId: opened.id });
    expect(detail.row.status).toBe('closed');
    expect(detail.notes).toContain('bench test');
    expect(detail.steps.find((step) => step.step === 'ramp')?.verdict).toBe('out-of-tolerance');
  });

  it('sends throttled live frames with at most 20 folded cycles, degree-indexed, gate pulses kept', async () => {
    const { design } = await client.getDesign({ name: demoDefaults.designName });
    const transferBatches: number[] = [];
    client.subscribe('transfer', (batch) => transferBatches.push(batch.points.length));
    await client.connect({ kind: 'virtual', designName: design.name, faults: [], seed: 3 });
    pump(1.5);
    // The pump runs faster than the 50 ms frame interval, so the last batch waits on the throttle's timer: let it
    // fire (a later timer of the same loop runs after it) before counting.
    await new Promise((resolve) => setTimeout(resolve, 100));
    expect(liveFrames.length).toBeGreaterThan(0);
    // Transfer points travel in batches with the live frames, not one event per cycle: 1.5 s at 50 Hz is about
    // 70 firing cycles after the analyzer's 0.2 s warm-up.
    expect(transferBatches.length).toBeLessThanOrEqual(liveFrames.length + 1);
    expect(transferBatches.reduce((sum, count) => sum + count, 0)).toBeGreaterThan(50);
    const frame = liveFrames[liveFrames.length - 1];
    expect(frame.fold.length).toBeGreaterThan(0);
    expect(frame.fold.length).toBeLessThanOrEqual(20);
    for (const cycle of frame.fold) {
      expect(Math.min(...cycle.ramp.deg)).toBeGreaterThanOrEqual(0);
      expect(Math.max(...cycle.ramp.deg)).toBeLessThanOrEqual(360);
      // Min-max decimation keeps the gate pulse (300 us, 5.4 degrees) at its full height: the board's supply is
      // the pulse level (virtual board default), within its 5 mV noise and 12-bit quantisation.
      expect(Math.max(...cycle.gate.v)).toBeGreaterThan(design.supplyV - 0.1);
      expect(cycle.firingDeg).toHaveLength(1);
      expect(cycle.zeroCrossingsDeg[0]).toBeCloseTo(0, 6);
    }
    // Fold points per cycle are bounded by the buckets (2 per bucket), whatever the sample rate.
    expect(frame.fold[0].sync.deg.length).toBeLessThanOrEqual(480);
  });

  it('numbers its state changes so a screen can tell a live frame made before a recorded step from one made after', async () => {
    const { design } = await client.getDesign({ name: demoDefaults.designName });
    await client.startSession({ unitSerial: 'TEST-0009', designName: design.name, operator: 'Tess' });
    await client.connect({ kind: 'virtual', designName: design.name, faults: [], seed: 5 });
    pump(1.5);
    await new Promise((resolve) => setTimeout(resolve, 100));
    const before = await client.benchState();
    const framesBefore = liveFrames.length;
    expect(framesBefore).toBeGreaterThan(0);
    expect(liveFrames[framesBefore - 1].stateSerial).toBe(before.stateSerial);
    const signOffCard = (steps: LiveFrame['steps']) => steps.find((step) => step.step === 'sign-off')!.readings.find((reading) => reading.key === 'syncVerdict')!.note;
    expect(signOffCard(liveFrames[framesBefore - 1].steps)).toBe('not recorded');

    await client.checkStep({ step: 'sync' });
    const after = await client.benchState();
    // The recording is a state change: a frame carrying the older count is older than this state and shows the
    // sync step not recorded on the sign-off card, which the screen must not lay over the state.
    expect(after.stateSerial).toBeGreaterThan(before.stateSerial);
    expect(signOffCard(after.steps)).toBe('recorded');
    pump(0.5);
    await new Promise((resolve) => setTimeout(resolve, 100));
    const newer = liveFrames.slice(framesBefore);
    expect(newer.length).toBeGreaterThan(0);
    for (const frame of newer) {
      expect(frame.stateSerial).toBe(after.stateSerial);
      expect(signOffCard(frame.steps)).toBe('recorded');
    }
    // Asking for the state changes nothing.
    expect((await client.benchState()).stateSerial).toBe(after.stateSerial);
  });

  it('fits the first suggestion (the low ramp capacitor replaced) to the virtual board and the re-checked ramp lands on target', async () => {
    const { design } = await client.getDesign({ name: demoDefaults.designName });
    await client.startSession({ unitSerial: 'TEST-0002', designName: design.name, operator: 'Tess' });
    await client.connect({ kind: 'virtual', designName: design.name, faults: ['capacitor-low'], seed: 11 });
    pump(1.5);
    const plan = await client.trimPlan({});
    expect(plan.inTolerance).toBe(false);
    expect(plan.suggestions.length).toBeGreaterThan(0);
    const first = plan.suggestions[0];
    // A capacitor 30 % low is a part off, not a stack-up: measure and replace it with its design value.
    expect(first).toMatchObject({ kind: 'repair', part: 'cRamp', method: 'replace', toFarad: design.parts.cRamp.farad });
    expect(plan.status).toBe('repair');
    expect(first.predictedRamp?.deg.length).toBeGreaterThan(10);

    const applied = await client.applyTrim({ part: first.part, fromFarad: first.fromFarad, toFarad: first.toFarad, method: first.method, reason: first.reason });
    expect(applied.recheckNeeded).toBe(true);
    expect((await client.benchState()).currentStep).toBe('ramp');
    // "I fitted this" once per plan: a second record before the ramp is checked again is refused, nothing written.
    const twice = await refusal(client.applyTrim({ part: first.part, fromOhm: first.fromOhm, toOhm: first.toOhm, method: first.method, addOhm: first.addOhm, reason: first.reason }));
    expect(twice.code).toBe('not-ready');
    expect(twice.message).toMatch(/already recorded and the ramp not checked since/);
    pump(1.5);
    const recheck = await client.checkStep({ step: 'ramp' });
    const peak = recheck.readings.find((reading) => reading.key === 'rampPeakV')!;
    // Issue 3's check of advice that works: the trimmed ramp lands within 5 % of the target.
    expect(Math.abs(peak.value! - design.rampTargetV) / design.rampTargetV).toBeLessThan(0.05);
    const state = await client.benchState();
    expect(state.recheckNeeded).toBe(false);
    expect(state.steps.find((step) => step.step === 'trim')?.status).toBe('done');

    const kept = await client.keepCapture({ seconds: 1 });
    // One second of samples at 25 kS/s, cut at the logger's 120-sample lines: within one line of 1 s.
    expect(Math.abs(kept.seconds - 1)).toBeLessThanOrEqual(120 / 25_000 + 1e-9);
    // The sign-off gate, in the service: sync, transfer and limits were never recorded, so a plain sign-off is
    // refused listing them, a reason too short to say anything is refused, and a written reason signs it off with
    // exceptions that the logbook keeps word for word.
    const gate = (await client.benchState()).signOffGate;
    expect(gate.clear).toBe(false);
    expect(gate.exceptions).toEqual([
      { step: 'sync', problem: 'not-recorded', readings: [] },
      { step: 'transfer', problem: 'not-recorded', readings: [] },
      { step: 'limits', problem: 'not-recorded', readings: [] },
    ]);
    const refused = await refusal(client.signOff({}));
    expect(refused.code).toBe('not-ready');
    expect(refused.message).toMatch(/sign-off refused: Check sync: not recorded; Record transfer curve: not recorded; Check limits and pulses: not recorded/);
    expect((await client.benchState()).session).not.toBeNull();
    const tooShort = await refusal(client.signOff({ exceptionsReason: '  ok  ' }));
    expect(tooShort.code).toBe('input');
    expect(tooShort.message).toMatch(/at least 3 words and 20 characters/);
    const reason = 'sync, transfer and limits checked on the\n drive cabinet after fitting';
    const row = await client.signOff({ exceptionsReason: reason });
    expect(row).toMatchObject({ status: 'closed', outcome: 'signed-off-with-exceptions', signOffReason: 'sync, transfer and limits checked on the drive cabinet after fitting' });
    expect(row.signOffExceptions).toEqual(gate.exceptions);
    expect((await client.benchState()).session).toBeNull();
    const detail = await client.sessionDetail({ sessionId: row.id });
    // Recall shows each step as it was recorded: the re-checked ramp exactly, not the readings of the last moment.
    expect(detail.steps.find((step) => step.step === 'ramp')).toEqual(recheck);
    expect(detail.steps.map((step) => step.step)).toEqual(['sync', 'ramp', 'trim', 'sign-off'].filter((step) => detail.steps.some((report) => report.step === step)));
    expect(detail.trims).toHaveLength(1);
    // The capacitor's values are kept in its own unit, farad.
    expect(detail.trims[0]).toMatchObject({ part: 'cRamp', toOhm: design.parts.cRamp.farad });
    expect(detail.captures).toHaveLength(1);
    expect(detail.row.outcome).toBe('signed-off-with-exceptions');
    // Link events read as words in the logbook, not as raw data.
    expect(detail.linkEvents.find((event) => event.kind === 'opened')?.detail).toBe('link to the virtual board (Charger firing board CH-50H (demo), fault: capacitor-low) opened');
  });

  it('the transfer and limits steps agree: the default sweep passes both, and cycles below the design\'s range are left out', async () => {
    const { design } = await client.getDesign({ name: demoDefaults.designName });
    await client.startSession({ unitSerial: 'TEST-0006', designName: design.name, operator: 'Tess' });
    await client.connect({ kind: 'virtual', designName: design.name, faults: [], seed: 13 });
    pump(1.5);
    // Held control: the limits are not measured yet, and cannot be recorded.
    expect((await client.benchState()).steps.find((step) => step.step === 'limits')?.verdict).toBe('not-measured');
    expect((await refusal(client.checkStep({ step: 'limits' }))).message).toMatch(/not measured yet.*turn the control to both ends/);
    const { controlRange } = await client.transferPoints({});
    expect(controlRange).not.toBeNull();
    // Swept from well below the design's low end (the old default started at the ramp floor) to the top.
    await client.setVirtualControl({ mode: 'sweep', fromV: 0.1, toV: controlRange!.highV, periodS: 4 });
    await client.clearTransfer();
    pump(4.5);
    const transfer = await client.checkStep({ step: 'transfer' });
    const limits = await client.checkStep({ step: 'limits' });
    // Both judge the same range: alpha at its low end is the design's smallest alpha (10 deg on CH-50H) on the
    // transfer line, and the limits' smallest alpha comes from inside the range, so neither fails the other.
    expect(transfer.readings.find((reading) => reading.key === 'alphaAtControlLowDeg')).toMatchObject({ expected: expect.closeTo(design.alphaMinDeg, 6), verdict: 'in-tolerance' });
    const smallest = limits.readings.find((reading) => reading.key === 'alphaMinDeg')!;
    expect(smallest.value!).toBeGreaterThan(design.alphaMinDeg - design.tolerances.alphaDeg);
    expect(smallest.verdict).not.toBe('out-of-tolerance');
    expect(limits.note).toMatch(/cycles fired below the design's control range \(under 0\.31 V\) were left out/);
  });

  it('re-measures an open link against the design of a session started on it, without losing the stream', async () => {
    await client.connect({ kind: 'virtual', designName: demoDefaults.designName, faults: [], seed: 5 });
    pump(0.5);
    const heater = (await client.listDesigns()).designs.find((summary) => summary.mainsHz === 60)!;
    await client.startSession({ unitSerial: 'TEST-0005', designName: heater.name, operator: 'Tess' });
    pump(1.5);
    const state = await client.benchState();
    // The board on the bench runs at 50 Hz (its own design); the session's design says 60 Hz: the reading stays the
    // measured 50 Hz and is judged against 60 Hz (1 % tolerance) as out of tolerance.
    const frequency = state.steps.find((step) => step.step === 'sync')!.readings.find((reading) => reading.key === 'frequencyHz')!;
    expect(Math.abs(frequency.value! - 50)).toBeLessThan(0.05);
    expect(frequency.expected).toBe(60);
    expect(frequency.verdict).toBe('out-of-tolerance');
    // The decoder kept its greeting: nothing arrived "before a greeting" or otherwise unreadable.
    expect(state.link.badLines).toBe(0);
    expect(state.link.state).toBe('streaming');
  });

  it('refuses what cannot be done now, with words a technician reads', async () => {
    expect((await refusal(client.checkStep({ step: 'sync' }))).code).toBe('not-ready');
    expect((await refusal(client.trimPlan({}))).message).toMatch(/no link is open/);
    const unknownFault = await refusal(client.connect({ kind: 'virtual', designName: demoDefaults.designName, faults: ['gremlins'] }));
    expect(unknownFault).toMatchObject({ kind: 'expected', code: 'input' });
    expect(unknownFault.message).toContain('gremlins');
    expect((await refusal(client.getDesign({ name: 'No Such Board' }))).code).toBe('not-found');
    expect((await refusal(client.sessionDetail({ sessionId: 999 }))).code).toBe('not-found');
    await client.startSession({ unitSerial: 'TEST-0003', designName: demoDefaults.designName, operator: 'Tess' });
    expect((await refusal(client.startSession({ unitSerial: 'TEST-0004', designName: demoDefaults.designName, operator: 'Tess' }))).message).toMatch(/still open/);
    expect((await refusal(client.exportSession({ sessionId: 1, format: 'pdf' }))).code).toBe('not-available');
    const malformed = await refusal(client.setHold({ held: 'yes' as unknown as boolean }));
    expect(malformed.code).toBe('invalid-payload');
  });

  it('saves and validates designs, listing the examples and the new version', async () => {
    const { design } = await client.getDesign({ name: demoDefaults.designName });
    const examples = await client.listDesigns();
    expect(examples.designs.map((summary) => summary.name)).toContain(demoDefaults.designName);
    const bad = await client.validateDesign({ design: { ...design, rampTargetV: -1 } });
    expect(bad.ok).toBe(false);
    expect(bad.problems.map((problem) => problem.field)).toContain('rampTargetV');
    const changed = { ...design, name: 'Bench copy CH-50H', rampTargetV: 7.0 };
    const saved = await client.saveDesign({ design: changed });
    expect(saved.summary).toMatchObject({ name: 'Bench copy CH-50H', version: 1, rampTargetV: 7 });
    expect(saved.saved).toBe(true);
    // Saved again unchanged: nothing is saved and the answer says so.
    const unchanged = await client.saveDesign({ design: changed });
    expect(unchanged).toMatchObject({ saved: false, summary: { version: 1 } });
    const again = await client.saveDesign({ design: { ...changed, rampTargetV: 7.2 } });
    expect(again.summary.version).toBe(2);
    expect((await client.getDesign({ name: 'Bench copy CH-50H', version: 1 })).design.rampTargetV).toBe(7);
  });
});
