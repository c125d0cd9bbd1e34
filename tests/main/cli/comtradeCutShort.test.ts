// A COMTRADE .dat cut short: the probe cut a binary .dat at a record boundary (half the file read as a 0.25 s
// capture, exit 0) and an ASCII .dat in the middle of a number (accepted). Both are refused now, saying how many
// samples of the configuration's endsamp are missing; a whole file still reads.
import { readFileSync, truncateSync, writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readCaptureFile } from '../../../main/capture/readCaptureFile';
import { writeCaptureFile } from '../../../main/capture/writeCaptureFile';
import { tempFolder, type TempFolder } from '../store/storeFixtures';
import { runCli } from './cliRun';

let folder: TempFolder;
const design = 'fixtures/boards/charger-ch50h.board.json';

beforeAll(async () => {
  folder = tempFolder('rampwright-cut-');
  // Half a second of the virtual board at 10 kS/s: 5000 samples, endsamp 5000 in the .cfg.
  const sim = await runCli(['sim', '--design', design, '--out', folder.file('whole.cfg'), '--seconds', '0.5', '--rate', '10000']);
  expect(sim.code).toBe(0);
  const blocks = [];
  for await (const block of readCaptureFile(folder.file('whole.cfg'))) blocks.push(block);
  await writeCaptureFile(folder.file('ascii.cfg'), blocks, { format: 'comtrade-ascii' });
});
afterAll(() => folder.remove());

/** Copies a .cfg/.dat pair under a new name, the .dat cut to `keep(bytes)` bytes. */
function cutCopy(from: string, to: string, keep: (dat: Buffer) => number): string {
  writeFileSync(folder.file(`${to}.cfg`), readFileSync(folder.file(`${from}.cfg`)));
  const dat = readFileSync(folder.file(`${from}.dat`));
  writeFileSync(folder.file(`${to}.dat`), dat);
  truncateSync(folder.file(`${to}.dat`), keep(dat));
  return folder.file(`${to}.cfg`);
}

describe('COMTRADE .dat cut short', () => {
  it('a whole binary and ASCII record reads as 0.5 s', async () => {
    for (const name of ['whole', 'ascii']) {
      const result = await runCli(['analyze', folder.file(`${name}.cfg`), '--design', design, '--json']);
      expect(result.code, result.stderr).toBe(0);
      expect((JSON.parse(result.stdout) as { durationS: number }).durationS).toBeCloseTo(0.5, 3);
    }
  });

  it('binary cut at a record boundary (half the file): exit 2, the missing samples and seconds named', async () => {
    // BINARY with 4 analog channels: 4 + 4 + 4 x 2 = 16 bytes a record; half the file is 2500 whole records.
    const cut = cutCopy('whole', 'binary-half', (dat) => dat.length / 2);
    const result = await runCli(['analyze', cut, '--design', design]);
    expect(result.code).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr).toContain('binary-half.dat');
    expect(result.stderr).toMatch(/ends after sample 2500, but the configuration's last sample \(endsamp\) is 5000: 2500 samples \(0\.25 s of signal\) are missing/);
  });

  it('ASCII cut in the middle of a number: exit 2, the unterminated last line refused', async () => {
    const cut = cutCopy('ascii', 'ascii-mid-number', (dat) => {
      // Stop inside the last field of a row near the middle, two characters into the number.
      const rowEnd = dat.indexOf('\n', Math.floor(dat.length / 2));
      const lastComma = dat.lastIndexOf(',', rowEnd);
      return lastComma + 3;
    });
    const result = await runCli(['analyze', cut, '--design', design]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/ascii-mid-number\.dat, line \d+: the last line has no line end: the file was cut short, perhaps in the middle of a number/);
  });

  it('ASCII cut at a line end: exit 2 with the count of missing samples', async () => {
    const cut = cutCopy('ascii', 'ascii-at-line', (dat) => {
      let position = 0;
      for (let line = 0; line < 1000; line += 1) position = dat.indexOf('\n', position) + 1;
      return position;
    });
    const result = await runCli(['analyze', cut, '--design', design]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/ends after sample 1000, .* is 5000: 4000 samples \(0\.4 s of signal\) are missing/);
  });
});
