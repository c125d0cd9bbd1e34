import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readCaptureFile, readComtradeConfigFile } from '../../../main/capture/readCaptureFile';
import { captureSummary } from '../../../main/capture/captureSummary';
import { parseChannelMap } from '../../../app/capture/channelMap';
import type { SampleBlock } from '../../../app/capture/samples';
import { InputError } from '../../../app/errors';
import { captureFixtureFolder } from '../../app/formats/fixtureBytes';
import { joinBlocks } from '../../app/formats/readAll';

async function collect(path: string, options: Parameters<typeof readCaptureFile>[1] = {}): Promise<SampleBlock[]> {
  const blocks: SampleBlock[] = [];
  for await (const block of readCaptureFile(path, options)) blocks.push(block);
  return blocks;
}

async function errorOf(promise: Promise<unknown>): Promise<InputError> {
  try {
    await promise;
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return error as InputError;
  }
  throw new Error('expected an InputError');
}

const fixture = (name: string) => join(captureFixtureFolder, name);

describe('readCaptureFile', () => {
  let folder: string;
  beforeAll(() => {
    folder = mkdtempSync(join(tmpdir(), 'rampwright-read-capture-'));
  });
  afterAll(() => rmSync(folder, { recursive: true, force: true }));

  it('reads a CSV in 7-byte chunks to the same samples as the fixture holds', async () => {
    const capture = joinBlocks(await collect(fixture('unit-rw0142.csv'), { chunkBytes: 7 }));
    // Values as written in fixtures/captures/unit-rw0142.csv.
    expect(capture.sync).toEqual([0, 1, 2, 3, 4, 5]);
    expect(capture.gate).toEqual([0, 0, 0, 12, 12, 0]);
    expect(capture.blocks[0].sampleRateHz).toBeCloseTo(20000, 6);
  });

  it('opens a COMTRADE pair from either file, in small chunks', async () => {
    for (const name of ['unit-rw0142-binary-2013.cfg', 'unit-rw0142-binary-2013.dat']) {
      const capture = joinBlocks(await collect(fixture(name), { chunkBytes: 5 }));
      // Hand-worked in tests/app/formats/comtradeDataReader.test.ts: ramp = 0.001 x + 5.
      expect(capture.ramp.map((value) => Number(value.toFixed(9)))).toEqual([5, 6.5, 8, 0]);
    }
  });

  it('reads a single-file .cff in small chunks', async () => {
    const capture = joinBlocks(await collect(fixture('unit-rw0142-binary-2013.cff'), { chunkBytes: 9 }));
    // Same record as unit-rw0142-binary-2013.cfg/.dat: ramp = 0.001 x + 5.
    expect(capture.ramp.map((value) => Number(value.toFixed(9)))).toEqual([5, 6.5, 8, 0]);
  });

  it('passes the channel map and finds partners written in capitals', async () => {
    copyFileSync(fixture('unit-rw0207-binary32-1999.cfg'), join(folder, 'UNIT7.CFG'));
    copyFileSync(fixture('unit-rw0207-binary32-1999.dat'), join(folder, 'UNIT7.DAT'));
    const capture = joinBlocks(await collect(join(folder, 'UNIT7.CFG'), { channelMap: parseChannelMap('sync=TP1,ramp=TP2,gate=TP3') }));
    expect(capture.gate).toEqual([0, 1, 1, 0]);
  });

  it('reads a Latin-1 configuration (older recorders) as well as UTF-8', async () => {
    const text = readFileSync(fixture('unit-rw0142-ascii-1999.cfg'), 'utf8').replace('Harrow Lane test bench', "Banc d'essai été");
    writeFileSync(join(folder, 'latin.cfg'), Buffer.from(text, 'latin1'));
    writeFileSync(join(folder, 'utf8.cfg'), Buffer.from(text, 'utf8'));
    expect((await readComtradeConfigFile(join(folder, 'latin.cfg'))).stationName).toBe("Banc d'essai été");
    expect((await readComtradeConfigFile(join(folder, 'utf8.cfg'))).stationName).toBe("Banc d'essai été");
    copyFileSync(fixture('unit-rw0142-ascii-1999.dat'), join(folder, 'latin.dat'));
    expect(joinBlocks(await collect(join(folder, 'latin.cfg'))).gate).toEqual([0, 1, 1, 0, 0]);
  });

  it('gives clear errors: missing file, missing partner, unknown extension, .cff, a folder', async () => {
    expect((await errorOf(collect(join(folder, 'nothing.csv')))).message).toContain('nothing.csv: no such capture file');
    writeFileSync(join(folder, 'alone.cfg'), 'x');
    expect((await errorOf(collect(join(folder, 'alone.cfg')))).message).toContain('alone.cfg: the COMTRADE configuration has no .dat beside it');
    writeFileSync(join(folder, 'orphan.dat'), 'x');
    expect((await errorOf(collect(join(folder, 'orphan.dat')))).message).toContain('orphan.dat: the COMTRADE data has no .cfg beside it');
    expect((await errorOf(collect(join(folder, 'capture.txt')))).message).toContain('unknown capture type ".txt"');
    expect((await errorOf(collect(join(folder, 'capture.cff')))).message).toContain('capture.cff: no such capture file');
    mkdirSync(join(folder, 'folder.csv'));
    expect((await errorOf(collect(join(folder, 'folder.csv')))).message).toContain('is not a file');
  });

  it('reports a bad row with the file name and line', async () => {
    writeFileSync(join(folder, 'bad.csv'), 't,sync,ramp,gate\n0,1,2,3\n0.001,1,2\n');
    expect((await errorOf(collect(join(folder, 'bad.csv'), { chunkBytes: 3 }))).message).toBe(`${join(folder, 'bad.csv')}, line 3: the row has 3 fields but the header has 4`);
  });

  it('streams: the consumer may stop after the first block', async () => {
    const rows = Array.from({ length: 5000 }, (_, index) => `${index / 1000},1,2,3`).join('\n');
    writeFileSync(join(folder, 'long.csv'), `t,sync,ramp,gate\n${rows}\n`);
    let seen = 0;
    for await (const block of readCaptureFile(join(folder, 'long.csv'), { blockSamples: 100, chunkBytes: 1024 })) {
      seen += block.sync.length;
      break;
    }
    expect(seen).toBe(100);
  });

  it('summarises a capture: samples, duration, rate, channels, gaps', async () => {
    // unit-rw0311: five samples at 50 kS/s in two stretches (0-40 us, 100-120 us): 120 us + one period.
    const summary = await captureSummary(fixture('unit-rw0311-float32-2013.cfg'));
    expect(summary.samples).toBe(5);
    expect(summary.channels).toEqual(['sync', 'ramp', 'gate', 'control']);
    expect(summary.gaps).toBe(1);
    expect(summary.sampleRateHz).toBeCloseTo(50000, 6);
    expect(summary.durationS).toBeCloseTo(140e-6, 12);
  });
});
