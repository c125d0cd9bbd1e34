import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeCaptureFile } from '../../../main/capture/writeCaptureFile';
import { synthesize } from '../../app/bench/syntheticBoard';
import { runCli as run } from './cliRun';

let folder = '';

// A half-wave 50 Hz unit of our own: alpha 75 deg, ramp 0.1 V + 0.9 V/ms over 9.8 ms, control swept 1 -> 6 V.
const board = {
  rectifier: 'half-wave' as const, frequencyHz: 50, sampleRateHz: 20000, durationS: 1, startPhaseDeg: 200,
  rampFloorV: 0.1, slopeVPerMs: 0.9, resetUs: 200, pulseWidthUs: 250, noiseV: 0.003, bits: 14,
  transfer: { offsetDeg: 20, gainDegPerV: 20, controlFromV: 1, controlToV: 6 },
};
const designJson = {
  name: 'Bench case K7 (half-wave)', mainsHz: 50, rectifier: 'half-wave', supplyV: 15, rampTargetV: 8.9, alphaMaxDeg: 160, syncResetUs: 200, gatePulseUs: 250,
  parts: { rEmitter: { ohm: 7500 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 } },
};

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-analyze-'));
  const { blocks } = synthesize(board);
  await writeCaptureFile(join(folder, 'unit.csv'), blocks);
  await writeCaptureFile(join(folder, 'unit.cfg'), blocks, { format: 'comtrade-binary' });
  writeFileSync(join(folder, 'unit.board.json'), JSON.stringify(designJson));
  // The same samples without a time column, for --rate.
  const rows = ['sync,ramp,gate'];
  for (const block of blocks) for (let i = 0; i < block.sync.length; i++) rows.push(`${block.sync[i]},${block.ramp[i]},${block.gate[i]}`);
  writeFileSync(join(folder, 'untimed.csv'), `${rows.join('\n')}\n`);
  writeFileSync(join(folder, 'empty.csv'), 't,sync,ramp,gate\n');
  writeFileSync(join(folder, 'bad.board.json'), JSON.stringify({ ...designJson, mainsHz: 400 }));
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('rampwright analyze', () => {
  it('--json prints the issue fields with the measured values', async () => {
    const { code, stdout } = await run(['analyze', join(folder, 'unit.csv'), '--json', '--rectifier', 'half-wave']);
    expect(code).toBe(0);
    const readings = JSON.parse(stdout);
    expect(readings.frequencyHz).toBeCloseTo(50, 3);
    expect(readings.cycles).toBe(49);
    // Ramp: 0.1 + 0.9 * (10 - 0.2) ms = 8.92 V; floor 0.1 V; start 100 us = 1.8 deg.
    expect(readings.ramp.peakV).toBeCloseTo(8.92, 1);
    expect(readings.ramp.floorV).toBeCloseTo(0.1, 2);
    expect(readings.ramp.slopeVPerMs).toBeCloseTo(0.9, 2);
    expect(readings.ramp.startDelayDeg).toBeCloseTo(1.8, 1);
    expect(readings.ramp.clipped).toBe(false);
    expect(typeof readings.ramp.nonlinearityPct).toBe('number');
    expect(readings.pulse.count).toBe(readings.perCycle.length);
    expect(readings.pulse.missing).toBe(0);
    expect(readings.pulse.wrongHalfCycle).toBe(0);
    expect(readings.pulse.widthUs).toBeCloseTo(250, -1);
    expect(readings.transfer.gainDegPerV).toBeCloseTo(20, 1);
    expect(readings.transfer.offsetDeg).toBeCloseTo(20, 0);
    expect(readings.transfer.points).toBe(readings.perCycle.length);
    expect(Object.keys(readings.perCycle[0]).sort()).toEqual(['alphaDeg', 'controlV', 'rampPeakV', 't']);
  });

  it('COMTRADE binary gives the same readings as CSV, to the 16-bit scaling', async () => {
    const csv = JSON.parse((await run(['analyze', join(folder, 'unit.csv'), '--json', '--rectifier', 'half-wave'])).stdout);
    const comtrade = JSON.parse((await run(['analyze', join(folder, 'unit.cfg'), '--json', '--rectifier', 'half-wave'])).stdout);
    expect(comtrade.cycles).toBe(csv.cycles);
    expect(comtrade.pulse.count).toBe(csv.pulse.count);
    // int16 over each channel's range: under a millivolt per step on 10 V, so readings agree closely.
    expect(comtrade.ramp.peakV).toBeCloseTo(csv.ramp.peakV, 2);
    expect(comtrade.pulse.alphaDeg).toBeCloseTo(csv.pulse.alphaDeg, 1);
  });

  it('a CSV without time column is analysed at --rate', async () => {
    const { code, stdout } = await run(['analyze', join(folder, 'untimed.csv'), '--json', '--rate', '20000', '--rectifier', 'half-wave']);
    expect(code).toBe(0);
    const readings = JSON.parse(stdout);
    expect(readings.frequencyHz).toBeCloseTo(50, 3);
    expect(readings.sampleRateHz).toBe(20000);
  });

  it('human output: a readings table with units, and checks against the design', async () => {
    const { code, stdout } = await run(['analyze', join(folder, 'unit.csv'), '--design', join(folder, 'unit.board.json')]);
    expect(code).toBe(0);
    expect(stdout).toMatch(/frequency\s+50\.00\d Hz/);
    expect(stdout).toMatch(/peak\s+8\.9\d\d V/);
    expect(stdout).toMatch(/slope\s+0\.9\d\d V\/ms/);
    expect(stdout).toContain('half-wave');
    expect(stdout).toContain('Checks against Bench case K7 (half-wave)');
    expect(stdout).toMatch(/in tolerance\s+Ramp peak/);
    expect(stdout).toMatch(/in tolerance\s+Missing pulses/);
  });

  it('bad input exits 2 with a message naming what is wrong', async () => {
    const missing = await run(['analyze', join(folder, 'nothing.csv')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('nothing.csv');
    const rate = await run(['analyze', join(folder, 'unit.csv'), '--rate', 'fast']);
    expect(rate.code).toBe(2);
    expect(rate.stderr).toContain('--rate');
    const rectifier = await run(['analyze', join(folder, 'unit.csv'), '--rectifier', 'three-phase']);
    expect(rectifier.code).toBe(2);
    expect(rectifier.stderr).toContain('--rectifier');
    const empty = await run(['analyze', join(folder, 'empty.csv')]);
    expect(empty.code).toBe(2);
    expect(empty.stderr).toContain('no samples');
    const design = await run(['analyze', join(folder, 'unit.csv'), '--design', join(folder, 'bad.board.json')]);
    expect(design.code).toBe(2);
    expect(design.stderr).toContain('mainsHz');
    expect(design.stdout).toBe('');
  });
});
