/**
 * Exports from the logbook to files: a stored capture to COMTRADE and back through our reader (identical within
 * the scaling's resolution, a/2 per IEEE C37.111's value = a x + b with integer x), to CSV and back (exact: the CSV
 * writer prints each double's shortest exact form), and transfer points and readings as CSV.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SampleBlock } from '../../../app/capture/samples';
import { readCaptureFile, readComtradeConfigFile } from '../../../main/capture';
import { exportSessionFile } from '../../../main/exchange/exportFiles';
import { openRecordSources, type OpenedRecordSources } from '../../../main/record/openRecordSources';
import { mergeBlocks, recordSweepSession, type RecordedSession } from '../record/recordFixture';
import { tempFolder, type TempFolder } from '../store/storeFixtures';

let folder: TempFolder;
let sources: OpenedRecordSources;
let session: RecordedSession;

async function readAll(path: string): Promise<SampleBlock> {
  const blocks: SampleBlock[] = [];
  for await (const block of readCaptureFile(path)) blocks.push(block);
  return mergeBlocks(blocks);
}

beforeAll(async () => {
  folder = tempFolder('rampwright-export-');
  sources = await openRecordSources(folder.file('logbook.sqlite'), { create: true });
  session = await recordSweepSession(sources.logbook);
}, 60_000);

afterAll(async () => {
  await sources.close();
  folder.remove();
});

describe('exports', () => {
  for (const kind of ['captures-comtrade', 'captures-comtrade-ascii'] as const) {
    it(`${kind}: re-read by our reader, every sample within half the channel's scaling step a/2`, async () => {
      const written = await exportSessionFile(sources, session.sessionId, folder.file(`${kind}.cfg`), kind);
      expect(written.map((path) => path.slice(-4))).toEqual(['.cfg', '.dat']);
      const config = await readComtradeConfigFile(written[0]);
      expect(config.fileType).toBe(kind === 'captures-comtrade' ? 'BINARY' : 'ASCII');
      expect(config.lineFrequencyHz).toBe(50);
      const back = await readAll(written[0]);
      const original = session.capture;
      expect(back.sync.length).toBe(original.sync.length);
      expect(back.sampleRateHz).toBeCloseTo(original.sampleRateHz, 6);
      for (const role of ['sync', 'ramp', 'gate', 'control'] as const) {
        const channel = config.analogChannels.find((candidate) => candidate.id === role);
        expect(channel, role).toBeDefined();
        const halfStep = channel!.multiplier / 2;
        const a = original[role] as Float64Array;
        const b = back[role] as Float64Array;
        let worst = 0;
        for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
        // Rounding to the nearest integer code is at most half a code; a tiny allowance for the float arithmetic of a x + b.
        expect(worst, role).toBeLessThanOrEqual(halfStep * (1 + 1e-9));
        expect(worst, role).toBeGreaterThan(0); // int16 codes really were rounded: the check is not vacuous
      }
    });
  }

  it('captures-csv: re-read exactly', async () => {
    const [path] = await exportSessionFile(sources, session.sessionId, folder.file('capture.csv'), 'captures-csv');
    const back = await readAll(path);
    expect(Array.from(back.ramp)).toEqual(Array.from(session.capture.ramp));
    expect(Array.from(back.control as Float64Array)).toEqual(Array.from(session.capture.control as Float64Array));
  });

  it('transfer points and readings as CSV with units in the header', async () => {
    const [transfer] = await exportSessionFile(sources, session.sessionId, folder.file('transfer.csv'), 'transfer-csv');
    const lines = readFileSync(transfer, 'utf8').trim().split('\n');
    expect(lines[0]).toBe('t_s,control_v,alpha_deg');
    const points = (await sources.logbook.transferCurve(session.sessionId));
    expect(lines.length - 1).toBe(points.length);
    expect(lines[5].split(',').map(Number)).toEqual([points[4].t, points[4].controlV, points[4].alphaDeg]);
    // The readings as recorded at each step (the session kept its steps), with their bands and verdicts.
    const [readings] = await exportSessionFile(sources, session.sessionId, folder.file('readings.csv'), 'readings-csv');
    const text = readFileSync(readings, 'utf8');
    expect(text.split('\n')[0]).toBe('step,reading,label,value,design,low,high,unit,verdict,note');
    const row = text.split('\n').find((line) => line.startsWith('ramp,rampPeakV,'))!.split(',');
    expect(row.slice(0, 3)).toEqual(['ramp', 'rampPeakV', 'Ramp peak']);
    expect(Number(row[4])).toBe(7.3);
    // The design's band: 7.3 V +- 3 % (charger-ch50h.board.json), printed as the doubles they are.
    expect(Number(row[5])).toBeCloseTo(7.3 * 0.97, 12);
    expect(Number(row[6])).toBeCloseTo(7.3 * 1.03, 12);
    expect(row[7]).toBe('V');
    expect(['in-tolerance', 'marginal', 'out-of-tolerance']).toContain(row[8]);
    // A reading for information carries no verdict at all.
    expect(text.split('\n').find((line) => line.startsWith('ramp,slopeVPerMs,'))!.split(',')[8]).toBe('');
  });
});
