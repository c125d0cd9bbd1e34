/**
 * One signal, three files: our CSV, an instrument-style CSV (a header block, CH1..CH4, time in ms, semicolons and
 * a decimal comma, a 10:1 probe left at 1:1 on the ramp, an inverted gate probe) and a COMTRADE record whose
 * channels have other ids. With a channel map, `analyze` gives the same readings from all three.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SampleBlock } from '../../../app/capture/samples';
import { writeCaptureFile } from '../../../main/capture/writeCaptureFile';
import { synthesize } from '../../app/bench/syntheticBoard';
import { runCli as run } from './cliRun';

let folder = '';
let blocks: SampleBlock[] = [];

// A full-wave 50 Hz unit of our own: ramp 0.15 V + 0.78 V/ms, control swept 2 -> 5 V moving alpha 38 -> 122 deg.
const board = {
  rectifier: 'full-wave' as const, frequencyHz: 50, sampleRateHz: 20000, durationS: 2, startPhaseDeg: 37,
  rampFloorV: 0.15, slopeVPerMs: 0.78, resetUs: 240, pulseWidthUs: 180, noiseV: 0.004, bits: 14,
  transfer: { offsetDeg: -18, gainDegPerV: 28, controlFromV: 2, controlToV: 5 },
};

/** Decimal comma, as the instrument prints: shortest text of the value with its point replaced. */
const comma = (value: number): string => String(value).replace('.', ',');

function instrumentCsv(): string {
  const lines = [
    'Recorder;bench logger RW-4 (our scenario)',
    'Date;14.03.2026 10:21:09',
    'Record length;40000',
    'Sample interval;5,0E-05;s',
    'Probe CH2;10:1 (instrument left at 1:1)',
    '',
    'Time (ms);CH1 (V);CH2 (V);CH3 (V);CH4 (V);',
  ];
  for (const block of blocks) {
    for (let index = 0; index < block.sync.length; index++) {
      const timeMs = (block.startS + index / block.sampleRateHz) * 1000;
      const control = block.control as Float64Array;
      lines.push(`${comma(Number(timeMs.toFixed(6)))};${comma(block.sync[index])};${comma(block.ramp[index] / 10)};${comma(-block.gate[index])};${comma(control[index])};`);
    }
  }
  return `\uFEFF${lines.join('\r\n')}\r\n`;
}

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-channel-map-'));
  blocks = synthesize(board).blocks;
  await writeCaptureFile(join(folder, 'ours.csv'), blocks);
  writeFileSync(join(folder, 'instrument.csv'), instrumentCsv());
  await writeCaptureFile(join(folder, 'recorder.cfg'), blocks, { format: 'comtrade-float32', revision: 2013 });
  // The recorder names its channels its own way: VA, IB, IC, VN instead of sync, ramp, gate, control.
  const config = readFileSync(join(folder, 'recorder.cfg'), 'latin1');
  const renamed = config.replace(',sync,', ',VA,').replace(',ramp,', ',IB,').replace(',gate,', ',IC,').replace(',control,', ',VN,');
  expect(renamed).not.toBe(config);
  writeFileSync(join(folder, 'recorder.cfg'), renamed, 'latin1');
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

async function readingsOf(args: string[]) {
  const result = await run(['analyze', ...args, '--json']);
  expect(result.stderr).toBe('');
  expect(result.code).toBe(0);
  return JSON.parse(result.stdout);
}

describe('analyze with a channel map: the same readings from three ways of writing one signal', () => {
  it('our CSV, an instrument CSV and a COMTRADE record with other channel names agree', async () => {
    const ours = await readingsOf([join(folder, 'ours.csv')]);
    const instrument = await readingsOf([join(folder, 'instrument.csv'), '--map', 'sync=CH1,ramp=CH2:x10,gate=CH3:invert,control=CH4']);
    const recorder = await readingsOf([join(folder, 'recorder.cfg'), '--map', 'sync=VA,ramp=2,gate=IC,control=A4']);
    // The file was read as written, and says so.
    expect(instrument.readAs).toContain('names on line 7');
    expect(instrument.readAs).toContain('separator semicolon, decimal comma');
    expect(instrument.readAs).toContain('time in ms from the header (Time (ms))');
    expect(instrument.readAs).toContain('ramp=CH2 (V) x10, gate=CH3 (V) inverted');
    expect(recorder.readAs).toContain('sync=analog 1 "VA", ramp=analog 2 "IB", gate=analog 3 "IC", control=analog 4 "VN"');
    expect(ours.cycles).toBe(99);
    // Tolerances: the instrument CSV holds the same doubles (ramp / 10 x 10 may differ in the last bit) and times to
    // 1 ns as ours: readings agree to 1e-6. FLOAT32 keeps volts to half a float32 ulp (6e-8 relative): to 1e-4.
    for (const [other, digits] of [[instrument, 6], [recorder, 4]] as const) {
      expect(other.cycles).toBe(ours.cycles);
      expect(other.pulse.count).toBe(ours.pulse.count);
      expect(other.frequencyHz).toBeCloseTo(ours.frequencyHz, digits);
      expect(other.pulse.alphaDeg).toBeCloseTo(ours.pulse.alphaDeg, digits);
      expect(other.pulse.widthUs).toBeCloseTo(ours.pulse.widthUs, digits - 2);
      expect(other.ramp.peakV).toBeCloseTo(ours.ramp.peakV, digits);
      expect(other.ramp.floorV).toBeCloseTo(ours.ramp.floorV, digits);
      expect(other.ramp.slopeVPerMs).toBeCloseTo(ours.ramp.slopeVPerMs, digits);
      expect(other.transfer.gainDegPerV).toBeCloseTo(ours.transfer.gainDegPerV, digits);
    }
    // And they are the board's: 50 Hz, ramp 0.15 + 0.78 V/ms x (10 - 0.24) ms = 7.76 V, gain 28 deg/V.
    expect(ours.frequencyHz).toBeCloseTo(50, 2);
    expect(ours.ramp.peakV).toBeCloseTo(7.76, 1);
    expect(ours.transfer.gainDegPerV).toBeCloseTo(28, 0);
  });

  it('the human output says how the instrument file was read', async () => {
    const { code, stdout } = await run(['analyze', join(folder, 'instrument.csv'), '--map', 'sync=CH1,ramp=CH2:x10,gate=CH3:invert,control=CH4']);
    expect(code).toBe(0);
    expect(stdout.split('\n')[1]).toMatch(/^ {2}read 5 columns \(names on line 7\), separator semicolon, decimal comma, time in ms from the header/);
  });

  it('without a map, the refusal names the file, the header line, the columns and the option (exit 2)', async () => {
    const { code, stderr } = await run(['analyze', join(folder, 'instrument.csv')]);
    expect(code).toBe(2);
    expect(stderr).toContain(`${join(folder, 'instrument.csv')}, line 7: no channel for sync, ramp, gate`);
    expect(stderr).toContain('Time (ms), CH1 (V), CH2 (V), CH3 (V), CH4 (V)');
    expect(stderr).toContain('--map sync=CH1,ramp=CH2,gate=CH3,control=CH4');
  });

  it('a design that stores the bench wiring needs no --map; --map still wins', async () => {
    const design = {
      name: 'Bench case M3 (full-wave)', mainsHz: 50, rectifier: 'full-wave', supplyV: 15, rampTargetV: 7.8, alphaMaxDeg: 150, syncResetUs: 240, gatePulseUs: 180,
      parts: { rEmitter: { ohm: 8200 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 } },
      channelMap: { sync: 'CH1', ramp: { channel: 'CH2', scale: 10 }, gate: { channel: 4, invert: true }, control: 'CH4' },
    };
    writeFileSync(join(folder, 'wired.board.json'), JSON.stringify(design));
    const fromDesign = await readingsOf([join(folder, 'instrument.csv'), '--design', join(folder, 'wired.board.json')]);
    expect(fromDesign.readAs).toContain("by the design's channel map");
    const ours = await readingsOf([join(folder, 'ours.csv'), '--design', join(folder, 'wired.board.json')]);
    // Our own CSV does not fit the design's map; its columns are named after the roles, and the line says so.
    expect(ours.readAs).toContain("the design's channel map does not fit this file");
    expect(fromDesign.pulse.alphaDeg).toBeCloseTo(ours.pulse.alphaDeg, 6);
    const swapped = await run(['analyze', join(folder, 'instrument.csv'), '--design', join(folder, 'wired.board.json'), '--map', 'sync=CH1,ramp=CH9,gate=CH3', '--json']);
    expect(swapped.code).toBe(2);
    expect(swapped.stderr).toContain('no channel "CH9" for ramp (--map ramp=CH9)');
  });
});
