/**
 * The reading progress bar: drawn on a terminal only. The command runs in a real pseudo-terminal (`script` from
 * util-linux gives it one), then through a pipe and with --json, where no bar may appear.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeCaptureFile } from '../../../main/capture/writeCaptureFile';
import { createProgressBar, progressLine } from '../../../main/cli/progressBar';
import { synthesize } from '../../app/bench/syntheticBoard';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..', '..');
let folder = '';
let capture = '';

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-progress-'));
  capture = join(folder, 'unit.csv');
  // Two seconds at 50 kS/s: about 8 MiB of CSV, read in 1 MiB chunks.
  const { blocks } = synthesize({ rectifier: 'full-wave', frequencyHz: 50, sampleRateHz: 50000, durationS: 2, rampFloorV: 0.2, slopeVPerMs: 0.7, alphaDeg: 70, pulseWidthUs: 150, noiseV: 0.003 });
  await writeCaptureFile(capture, blocks);
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

const cli = (args: string) => `${JSON.stringify(process.execPath)} --import tsx main/cli/rampwright.ts ${args}`;

describe('progress bar', () => {
  it('has the label, the bar, the share and the sizes', () => {
    const half = progressLine('Reading', 512 << 20, 1 << 30, 30, 80);
    expect(half).toMatch(/^Reading \[#+\.+\]  50%  512 MiB of 1024 MiB, 0:30 left$/);
    // Half the bar filled, and the line fits the terminal's 80 columns.
    const bar = /\[(#+)(\.+)\]/.exec(half) as RegExpExecArray;
    expect(bar[1].length).toBe(bar[2].length);
    expect(half.length).toBeLessThanOrEqual(80);
    expect(progressLine('Reading', 0, 1000, 0, 80)).toMatch(/^Reading \[\.+\]   0%/);
  });

  it('draws nothing when the stream is not a terminal, or when not asked', () => {
    const written: string[] = [];
    const stream = { isTTY: false, write: (text: string) => written.push(text) > 0 };
    const bar = createProgressBar(stream, { enabled: true, label: 'Reading' });
    bar.update(5, 10);
    bar.done();
    const terminal = { isTTY: true, columns: 80, write: (text: string) => written.push(text) > 0 };
    const silent = createProgressBar(terminal, { enabled: false, label: 'Reading' });
    silent.update(5, 10);
    silent.done();
    expect(written).toEqual([]);
  });

  it('redraws at most every 100 ms, always at the end, and clears its line', () => {
    const written: string[] = [];
    let nowMs = 0;
    const bar = createProgressBar({ isTTY: true, columns: 60, write: (text: string) => written.push(text) > 0 }, { enabled: true, label: 'Reading', now: () => nowMs });
    bar.update(1, 10);
    nowMs = 50;
    bar.update(2, 10);
    nowMs = 120;
    bar.update(3, 10);
    nowMs = 130;
    bar.update(10, 10);
    bar.done();
    expect(written.map((text) => /(\d+)%/.exec(text)?.[1] ?? 'clear')).toEqual(['10', '30', '100', 'clear']);
    expect(written[written.length - 1]).toBe('\r\x1b[K');
  });

  it('is shown on a terminal (a pseudo-terminal from script), and not through a pipe or with --json', () => {
    const onTerminal = spawnSync('script', ['-qfec', cli(`analyze ${JSON.stringify(capture)}`), '/dev/null'], { cwd: root, encoding: 'utf8', timeout: 60000 });
    expect(onTerminal.status).toBe(0);
    expect(onTerminal.stdout).toMatch(/Reading \[#+\.*\] +\d+%/);
    expect(onTerminal.stdout).toContain('100%');
    expect(onTerminal.stdout).toContain('\r\x1b[K');
    expect(onTerminal.stdout).toMatch(/Sync +frequency +50\.000 Hz/);
    const piped = spawnSync(process.execPath, ['--import', 'tsx', 'main/cli/rampwright.ts', 'analyze', capture], { cwd: root, encoding: 'utf8', timeout: 60000 });
    expect(piped.status).toBe(0);
    expect(piped.stdout).toMatch(/Sync +frequency +50\.000 Hz/);
    expect(`${piped.stdout}${piped.stderr}`).not.toContain('Reading [');
    const json = spawnSync('script', ['-qfec', cli(`analyze ${JSON.stringify(capture)} --json`), '/dev/null'], { cwd: root, encoding: 'utf8', timeout: 60000 });
    expect(json.status).toBe(0);
    expect(json.stdout).not.toContain('Reading [');
    expect(JSON.parse(json.stdout.replace(/\r\n/g, '\n')).cycles).toBeGreaterThan(90);
  });
});
