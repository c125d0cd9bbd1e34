import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readCaptureFile, readComtradeConfigFile } from '../../../main/capture/readCaptureFile';
import { writeCaptureFile, type CaptureWriteFormat } from '../../../main/capture/writeCaptureFile';
import type { SampleBlock } from '../../../app/capture/samples';
import { InputError } from '../../../app/errors';
import { joinBlocks } from '../../app/formats/readAll';

const python = '/usr/bin/python3';
const numpyAvailable = spawnSync(python, ['-c', 'import numpy'], { stdio: 'ignore' }).status === 0;

/** 60 Hz board, 12 kS/s, three blocks: a sync sine, a ramp, gate pulses, a control level, one missing sample. */
function boardBlocks(): SampleBlock[] {
  const sampleRateHz = 12000;
  return [0, 1, 2].map((blockIndex) => {
    const length = 200;
    const sync = new Float64Array(length);
    const ramp = new Float64Array(length);
    const gate = new Float64Array(length);
    const control = new Float64Array(length);
    for (let index = 0; index < length; index++) {
      const timeS = (blockIndex * length + index) / sampleRateHz;
      const halfCycle = (timeS * 120) % 1;
      sync[index] = 14 * Math.sin(2 * Math.PI * 60 * timeS);
      ramp[index] = 0.3 + 9.6 * halfCycle;
      gate[index] = halfCycle > 0.4 && halfCycle < 0.45 ? 11.5 : 0.02;
      control[index] = 3.8 + 0.001 * index;
    }
    if (blockIndex === 1) ramp[17] = Number.NaN;
    return { startS: (blockIndex * 200) / sampleRateHz, sampleRateHz, sync, ramp, gate, control, afterGap: false };
  });
}

async function collect(path: string): Promise<SampleBlock[]> {
  const blocks: SampleBlock[] = [];
  for await (const block of readCaptureFile(path)) blocks.push(block);
  return blocks;
}

describe('writeCaptureFile', () => {
  let folder: string;
  beforeAll(() => {
    folder = mkdtempSync(join(tmpdir(), 'rampwright-write-capture-'));
  });
  afterAll(() => rmSync(folder, { recursive: true, force: true }));

  it('writes CSV that reads back to the very same samples', async () => {
    const path = join(folder, 'board.csv');
    const written = await writeCaptureFile(path, boardBlocks());
    expect(written).toEqual({ paths: [path], samples: 600 });
    const read = joinBlocks(await collect(path));
    const expected = joinBlocks(boardBlocks());
    expect(read.sync).toEqual(expected.sync);
    expect(read.ramp).toEqual(expected.ramp);
    expect(read.control).toEqual(expected.control);
    expect(readFileSync(path, 'utf8').split('\n')[0]).toBe('t,sync,ramp,gate,control');
  });

  for (const format of ['comtrade-ascii', 'comtrade-binary', 'comtrade-binary32', 'comtrade-float32'] as CaptureWriteFormat[]) {
    it(`writes ${format} as a .cfg/.dat pair that reads back within a / 2, from an async source`, async () => {
      const path = join(folder, `board-${format}.cfg`);
      async function* source() {
        for (const block of boardBlocks()) yield block;
      }
      const written = await writeCaptureFile(path, source(), { format, stationName: 'Bench 3, east', lineFrequencyHz: 60, revision: 2013 });
      expect(written.paths).toEqual([path, join(folder, `board-${format}.dat`)]);
      const config = await readComtradeConfigFile(path);
      expect(config.stationName).toBe('Bench 3  east');
      expect(config.lineFrequencyHz).toBe(60);
      expect(config.sampleRates).toEqual([{ rateHz: 12000, endSample: 600 }]);
      const read = joinBlocks(await collect(path));
      const expected = joinBlocks(boardBlocks());
      (['sync', 'ramp', 'gate', 'control'] as const).forEach((role, channelIndex) => {
        const a = config.analogChannels[channelIndex].multiplier;
        (expected[role] as number[]).forEach((value, index) => {
          const back = (read[role] as number[])[index];
          if (Number.isNaN(value)) return expect(back).toBeNaN();
          // Resolution bound of the chosen scaling (a / 2), or float32 rounding (|v| 2^-24), plus double rounding.
          const bound = format === 'comtrade-float32' ? Math.abs(value) * 2 ** -24 : a / 2 + 1e-13;
          expect(Math.abs(back - value)).toBeLessThanOrEqual(bound);
        });
      });
      expect(readdirSync(folder).filter((name) => name.endsWith('.spool') || name.endsWith('.partial'))).toEqual([]);
    });
  }

  it('writes gaps as timestamps (nrates 0) and reads them back as gaps', async () => {
    const blocks = boardBlocks();
    blocks[2] = { ...blocks[2], startS: blocks[2].startS + 0.01, afterGap: true };
    const path = join(folder, 'gappy.cfg');
    await writeCaptureFile(path, blocks, { format: 'comtrade-binary' });
    const config = await readComtradeConfigFile(path);
    expect(config.sampleRates).toEqual([]);
    const read = await collect(path);
    expect(read.map((block) => block.afterGap)).toEqual([false, true]);
    // The second stretch starts 400 samples + 10 ms in: 400 / 12000 + 0.01 s, within one timestamp unit.
    expect(Math.abs(read[1].startS - (400 / 12000 + 0.01))).toBeLessThanOrEqual(config.timeMultiplier * 1e-6);
  });

  it('leaves nothing under the target name when the source fails part way', async () => {
    async function* failing() {
      yield boardBlocks()[0];
      throw new InputError('logger unplugged');
    }
    for (const name of ['failed.csv', 'failed.cfg']) {
      await expect(writeCaptureFile(join(folder, name), failing())).rejects.toThrow('logger unplugged');
    }
    const left = readdirSync(folder).filter((name) => name.startsWith('failed') || name.startsWith('.failed'));
    expect(left).toEqual([]);
  });

  it('refuses an empty capture, a control signal that comes and goes, and an unknown extension', async () => {
    await expect(writeCaptureFile(join(folder, 'empty.csv'), [])).rejects.toThrow(`${join(folder, 'empty.csv')}: there are no samples to write`);
    await expect(writeCaptureFile(join(folder, 'empty.cfg'), [])).rejects.toThrow(`${join(folder, 'empty.cfg')}: there are no samples to write`);
    const blocks = boardBlocks();
    blocks[1] = { ...blocks[1], control: null };
    await expect(writeCaptureFile(join(folder, 'mixed.cfg'), blocks)).rejects.toThrow('lacks the control signal');
    await expect(writeCaptureFile(join(folder, 'mixed.csv'), blocks)).rejects.toThrow('lacks the control signal');
    await expect(writeCaptureFile(join(folder, 'board.xlsx'), boardBlocks())).rejects.toThrow('cannot tell the capture format');
    expect(existsSync(join(folder, 'mixed.csv'))).toBe(false);
  });

  it('names the path when the folder does not exist or the target is a folder', async () => {
    for (const name of ['missing-folder/board.csv', 'missing-folder/board.cfg']) {
      const path = join(folder, name);
      await expect(writeCaptureFile(path, boardBlocks())).rejects.toThrow(`${path}: cannot write the capture: the folder does not exist`);
    }
    await expect(writeCaptureFile(folder, boardBlocks(), { format: 'csv' })).rejects.toThrow(InputError);
    expect(existsSync(`${folder}.partial`)).toBe(false);
  });
});

// Outside check: numpy decodes the same .dat bytes with a structured dtype built from the record layout of
// IEEE C37.111 (REFERENCES.md: uint32 sample number, uint32 timestamp, analogs, little-endian) and scales with
// a * x + b read by Python from the .cfg lines; our reader must give the same volts.
describe.skipIf(!numpyAvailable)('binary .dat cross-checked against numpy.frombuffer', () => {
  let folder: string;
  beforeAll(() => {
    folder = mkdtempSync(join(tmpdir(), 'rampwright-numpy-'));
  });
  afterAll(() => rmSync(folder, { recursive: true, force: true }));

  const numpyDecode = `
import json, sys, numpy
cfg = open(sys.argv[1], encoding="latin1").read().splitlines()
analogs = int(cfg[1].split(",")[1].rstrip("A"))
channels = [line.split(",") for line in cfg[2:2 + analogs]]
filetype = cfg[2 + analogs + 5].strip()
kind = {"BINARY": "<i2", "BINARY32": "<i4", "FLOAT32": "<f4"}[filetype]
dtype = numpy.dtype([("n", "<u4"), ("t", "<u4")] + [(c[1], kind) for c in channels])
records = numpy.frombuffer(open(sys.argv[2], "rb").read(), dtype=dtype)
missing = {"BINARY": -32768, "BINARY32": -2147483648, "FLOAT32": None}[filetype]
out = {"n": records["n"].tolist(), "t": records["t"].tolist()}
for c in channels:
    raw = records[c[1]].astype(numpy.float64)
    volts = float(c[5]) * raw + float(c[6])
    if missing is not None:
        volts[records[c[1]] == missing] = numpy.nan
    out[c[1]] = [None if numpy.isnan(v) else float(v) for v in volts]
print(json.dumps(out))
`;

  for (const format of ['comtrade-binary', 'comtrade-binary32', 'comtrade-float32'] as CaptureWriteFormat[]) {
    it(`${format}: our reader and numpy agree sample for sample`, async () => {
      const path = join(folder, `cross-${format}.cfg`);
      await writeCaptureFile(path, boardBlocks(), { format });
      const result = spawnSync(python, ['-c', numpyDecode, path, join(folder, `cross-${format}.dat`)], { encoding: 'utf8' });
      expect(result.status, result.stderr).toBe(0);
      const numpy = JSON.parse(result.stdout) as Record<string, (number | null)[]>;
      const ours = joinBlocks(await collect(path));
      expect(numpy.n).toEqual(Array.from({ length: 600 }, (_, index) => index + 1));
      // Timestamps in microseconds (timemult 1): sample k at round(k / 12000 s) us.
      expect(numpy.t).toEqual(Array.from({ length: 600 }, (_, index) => Math.round((index / 12000) * 1e6)));
      for (const role of ['sync', 'ramp', 'gate', 'control'] as const) {
        const values = ours[role] as number[];
        // Same IEEE double operations (a * x + b) on the same integers: equal to the last bit.
        expect(values.map((value) => (Number.isNaN(value) ? null : value))).toEqual(numpy[role]);
      }
    });
  }
});
