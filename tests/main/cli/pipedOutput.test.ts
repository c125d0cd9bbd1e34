// Every command's stdout reaches a pipe whole before the process exits with its code. The probe cut
// `analyze --json | wc -c` at 64 KiB (exit 0): the process exited while the pipe still held the rest. Here the
// command line runs as its own process, its stdout a shell pipe into a second process that starts reading late
// (so the pipe is full when the command finishes), and the reader parses what arrived.
import { spawn } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { chargerDesign, cycleReading, tempFolder, type TempFolder } from '../store/storeFixtures';
import { runCli } from './cliRun';

let folder: TempFolder;
let capturePath = '';
let dbPath = '';

/** What the reading process saw: bytes, whether they parsed as JSON, and the exit codes of both processes. */
interface PipedRun {
  commandCode: number | null;
  readerCode: number | null;
  report: { bytes: number; parsed: boolean; keys: string[]; sessions: number };
  stderr: string;
}

/**
 * Runs `rampwright <args> | reader` in bash: a real pipe (64 KiB on Linux; Node's own child pipes are socket
 * pairs with larger buffers, which would hide the fault). The reader waits `delayMs`, then reads all of stdin.
 */
function pipeThroughReader(args: string[], delayMs = 700): Promise<PipedRun> {
  const readerSource = `
    setTimeout(() => {
      const chunks = [];
      process.stdin.on('data', (chunk) => chunks.push(chunk));
      process.stdin.on('end', () => {
        const text = Buffer.concat(chunks).toString('utf8');
        let parsed = null;
        try { parsed = JSON.parse(text); } catch {}
        process.stdout.write(JSON.stringify({ bytes: Buffer.byteLength(text), parsed: parsed !== null, keys: parsed ? Object.keys(parsed) : [], sessions: parsed && Array.isArray(parsed.sessions) ? parsed.sessions.length : 0 }));
      });
    }, ${delayMs});`;
  const script = '"$NODE" --import tsx main/cli/rampwright.ts "$@" | "$NODE" -e "$READER"; echo "exit codes: ${PIPESTATUS[0]} ${PIPESTATUS[1]}" >&2';
  const shell = spawn('bash', ['-c', script, 'bash', ...args], { cwd: process.cwd(), stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, NODE: process.execPath, READER: readerSource } });
  let stderr = '';
  shell.stderr.setEncoding('utf8').on('data', (chunk: string) => (stderr += chunk));
  let readerOut = '';
  shell.stdout.setEncoding('utf8').on('data', (chunk: string) => (readerOut += chunk));
  return new Promise((resolve) => {
    shell.on('close', () => {
      const codes = /exit codes: (\d+) (\d+)\n$/.exec(stderr);
      resolve({
        commandCode: codes ? Number(codes[1]) : null,
        readerCode: codes ? Number(codes[2]) : null,
        report: JSON.parse(readerOut) as PipedRun['report'],
        stderr: stderr.replace(/exit codes: \d+ \d+\n$/, ''),
      });
    });
  });
}

beforeAll(async () => {
  folder = tempFolder('rampwright-pipe-');
  // 40 s at 2.5 kS/s: 2000 cycles, whose per-cycle readings make a JSON result of about half a megabyte.
  capturePath = folder.file('long.csv');
  const sim = await runCli(['sim', '--design', 'fixtures/boards/charger-ch50h.board.json', '--out', capturePath, '--seconds', '40', '--rate', '2500']);
  expect(sim.code).toBe(0);
  // 300 sessions, as in the probe.
  dbPath = folder.file('logbook.sqlite');
  const logbook = await openSqliteLogbook(dbPath);
  const design = chargerDesign();
  for (let index = 0; index < 300; index += 1) {
    const writer = await logbook.startSession({ unitSerial: `RW-${String(index).padStart(4, '0')}`, design, operator: 'bench 1', startedAt: new Date(Date.UTC(2026, 0, 1, 8, index)) });
    writer.addCycle(cycleReading(0, { alphaDeg: 80 + (index % 20) }));
    await writer.close();
  }
  await logbook.close();
}, 120_000);
afterAll(() => folder.remove());

describe('output delivered whole to a pipe', () => {
  it('analyze --json: a half-megabyte result arrives whole through a late reader, and the command exits 0', async () => {
    const run = await pipeThroughReader(['analyze', capturePath, '--design', 'fixtures/boards/charger-ch50h.board.json', '--json']);
    expect(run.stderr).toBe('');
    expect(run.commandCode).toBe(0);
    expect(run.readerCode).toBe(0);
    expect(run.report.bytes).toBeGreaterThan(4 * 65536); // well past one pipe buffer
    expect(run.report.parsed).toBe(true);
    expect(run.report.keys).toEqual(expect.arrayContaining(['frequencyHz', 'ramp', 'pulse', 'checks']));
  }, 90_000);

  it('log --json: 300 sessions arrive whole through a late reader', async () => {
    const run = await pipeThroughReader(['log', '--db', dbPath, '--json']);
    expect(run.stderr).toBe('');
    expect(run.commandCode).toBe(0);
    expect(run.report.parsed).toBe(true);
    expect(run.report.sessions).toBe(300);
    expect(run.report.bytes).toBeGreaterThan(65536);
  }, 90_000);

  it('a reader that closes early (| head) ends the output quietly: no stack trace, the command keeps its exit code', async () => {
    const script = '"$NODE" --import tsx main/cli/rampwright.ts "$@" | head -c 100 > /dev/null; echo "exit code: ${PIPESTATUS[0]}" >&2';
    const shell = spawn('bash', ['-c', script, 'bash', 'log', '--db', dbPath, '--json'], { cwd: process.cwd(), stdio: ['ignore', 'ignore', 'pipe'], env: { ...process.env, NODE: process.execPath } });
    let stderr = '';
    shell.stderr.setEncoding('utf8').on('data', (chunk: string) => (stderr += chunk));
    await new Promise((resolve) => shell.on('close', resolve));
    expect(stderr).toBe('exit code: 0\n');
  }, 90_000);
});
