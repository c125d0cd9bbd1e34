/**
 * The parallel CSV path (parser threads) against the streaming reader: the same blocks, sample for sample, and the
 * same refusals with the same line numbers, for our CSV and an instrument dialect; and it can be cancelled.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseChannelMap } from '../../../app/capture/channelMap';
import type { SampleBlock } from '../../../app/capture/samples';
import { InputError } from '../../../app/errors';
import { CaptureCancelled, openCaptureFile, type ReadCaptureOptions } from '../../../main/capture/readCaptureFile';
import { writeCaptureFile } from '../../../main/capture/writeCaptureFile';
import { synthesize } from '../../app/bench/syntheticBoard';

let folder = '';
const board = { rectifier: 'full-wave' as const, frequencyHz: 50, sampleRateHz: 10000, durationS: 1.5, rampFloorV: 0.2, slopeVPerMs: 0.8, alphaDeg: 80, pulseWidthUs: 300, noiseV: 0.003, bits: 14 };

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-parallel-csv-'));
  const { blocks } = synthesize(board);
  await writeCaptureFile(join(folder, 'ours.csv'), blocks);
  // An instrument's dialect with a blank row and a row of separators inside, and a gap of 3 samples at 0.6 s.
  const lines = ['Recorder;bench unit (our scenario)', 'Time (ms);CH1;CH2;CH3;;'];
  let index = 0;
  for (const block of blocks) {
    for (let k = 0; k < block.sync.length; k++, index++) {
      if (index >= 6000 && index < 6003) continue;
      if (index === 2500) lines.push('');
      if (index === 9000) lines.push(';;;;;');
      const timeMs = ((block.startS + k / block.sampleRateHz) * 1000).toFixed(4);
      lines.push(`${timeMs};${block.sync[k]};${block.ramp[k]};${block.gate[k]};;`.replace(/\./g, ','));
    }
  }
  writeFileSync(join(folder, 'instrument.csv'), `${lines.join('\r\n')}\r\n`);
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

async function blocksOf(path: string, options: ReadCaptureOptions): Promise<SampleBlock[]> {
  const capture = await openCaptureFile(path, options);
  const blocks: SampleBlock[] = [];
  for await (const block of capture.blocks) blocks.push({ ...block, sync: block.sync.slice(), ramp: block.ramp.slice(), gate: block.gate.slice(), control: block.control?.slice() ?? null });
  return blocks;
}

async function failureOf(path: string, options: ReadCaptureOptions): Promise<Error> {
  try {
    await blocksOf(path, options);
  } catch (error) {
    return error as Error;
  }
  throw new Error('expected a failure');
}

const threaded: ReadCaptureOptions = { parallel: true, threads: 2, parallelChunkBytes: 5000 };

describe('parallel CSV reading', () => {
  it('gives the streaming reader\'s blocks for our CSV', async () => {
    const path = join(folder, 'ours.csv');
    const streamed = await blocksOf(path, { parallel: false });
    const parallel = await blocksOf(path, threaded);
    expect(parallel.length).toBe(streamed.length);
    expect(parallel).toEqual(streamed);
  });

  it('gives the streaming reader\'s blocks for an instrument dialect with blank rows and a gap', async () => {
    const path = join(folder, 'instrument.csv');
    const options = { channelMap: parseChannelMap('sync=CH1,ramp=CH2,gate=CH3') };
    const streamed = await blocksOf(path, { ...options, parallel: false });
    const parallel = await blocksOf(path, { ...options, ...threaded });
    expect(streamed.filter((block) => block.afterGap)).toHaveLength(1);
    expect(parallel).toEqual(streamed);
  });

  it('refuses what the streaming reader refuses, naming the same line', async () => {
    const path = join(folder, 'faults.csv');
    const rows = Array.from({ length: 3000 }, (_, index) => `${(index * 1e-4).toFixed(4)},1,2,3`);
    for (const [fault, at] of [['0.2000,1,2x,3', 2001], ['0.0100,1,2,3', 2501], ['0.2500,1,2', 2901]] as const) {
      const text = ['t,sync,ramp,gate', ...rows.slice(0, at - 2), fault, ...rows.slice(at - 1)].join('\n');
      writeFileSync(path, text);
      const streamed = await failureOf(path, { parallel: false });
      const parallel = await failureOf(path, threaded);
      expect(streamed).toBeInstanceOf(InputError);
      expect(streamed.message).toContain(`line ${at}:`);
      expect(parallel.message).toBe(streamed.message);
    }
  });

  it('stops when cancelled', async () => {
    const controller = new AbortController();
    const capture = await openCaptureFile(join(folder, 'ours.csv'), { ...threaded, signal: controller.signal });
    let seen = 0;
    let failure: unknown = null;
    try {
      for await (const block of capture.blocks) {
        seen += block.sync.length;
        controller.abort();
      }
    } catch (error) {
      failure = error;
    }
    expect(failure).toBeInstanceOf(CaptureCancelled);
    expect(seen).toBeGreaterThan(0);
    expect(seen).toBeLessThan(board.sampleRateHz * board.durationS);
  });
});
