// `rampwright serve`: options checked with clear errors, the address printed with this run's token, the demo board
// connected, a clean stop on SIGTERM.
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../app/errors';
import { parsePort } from '../../../main/cli/commands/serve';
import { startBenchServe } from '../../../main/session/benchServe';

const folder = mkdtempSync(join(tmpdir(), 'rampwright-serve-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('serve options', () => {
  it('reads ports 0-65535 and refuses anything else, naming the option', () => {
    expect(parsePort('4870')).toBe(4870);
    expect(parsePort('0')).toBe(0);
    for (const text of ['65536', '-1', '80.5', 'http', '']) {
      expect(() => parsePort(text)).toThrow(InputError);
      expect(() => parsePort(text)).toThrow(/--port/);
    }
  });

  it('says a busy port is busy, naming --port, instead of failing as a bug', async () => {
    const first = await startBenchServe({ logbookPath: join(folder, 'busy-1.sqlite'), port: 0, staticRoot: null });
    try {
      const failure = await startBenchServe({ logbookPath: join(folder, 'busy-2.sqlite'), port: first.server.port, staticRoot: null }).catch((error: unknown) => error);
      expect(failure).toBeInstanceOf(InputError);
      expect(String((failure as Error).message)).toMatch(/--port: port \d+ is already in use/);
    } finally {
      await first.close();
    }
  });

  it('prints a token and the address carrying it, and refuses a call without it', async () => {
    const running = await startBenchServe({ logbookPath: join(folder, 'token.sqlite'), host: '127.0.0.2', port: 0, staticRoot: null });
    try {
      expect(running.server.token).toMatch(/^[A-Za-z0-9_-]{32}$/);
      expect(running.banner.join('\n')).toContain(`Access token: ${running.server.token}`);
      const refused = await fetch(`http://127.0.0.2:${running.server.port}/api/call/benchState`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' });
      expect(refused.status).toBe(401);
    } finally {
      await running.close();
    }
  });
});

describe('rampwright serve as a command', () => {
  it('serves the demo board on 127.0.0.1, answers calls, and stops cleanly on SIGTERM', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'main/cli/rampwright.ts', 'serve', '--port', '0', '--demo', '--speed', '5', '--db', join(folder, 'serve.sqlite')], { cwd: process.cwd() });
    let stdout = '';
    child.stdout.setEncoding('utf8').on('data', (chunk: string) => (stdout += chunk));
    const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
    try {
      await expect.poll(() => stdout, { timeout: 60_000, interval: 100 }).toMatch(/Press Ctrl-C to stop/);
      const [, address, printedToken] = /Rampwright bench at (http:\/\/127\.0\.0\.1:\d+\/)\?token=([A-Za-z0-9_-]+)/.exec(stdout) ?? [];
      expect(address).toBeDefined();
      expect(stdout).toContain(`Access token: ${printedToken}`);
      const refused = await fetch(`${address}api/call/benchState`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' });
      expect(refused.status).toBe(401);
      expect(stdout).toContain('Virtual board connected');
      // The demo board streams in real time (here 5x): within a few seconds the link is streaming with readings.
      await expect
        .poll(
          async () => {
            const reply = await fetch(`${address}api/call/benchState`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-rampwright-token': printedToken }, body: '{}' });
            const outcome = (await reply.json()) as { ok: boolean; result: { link: { state: string; blocks: number } } };
            return outcome.ok && outcome.result.link.state === 'streaming' && outcome.result.link.blocks > 10;
          },
          { timeout: 30_000, interval: 250 },
        )
        .toBe(true);
      child.kill('SIGTERM');
      expect(await exited).toBe(0);
      expect(stdout).toContain('Bench server stopped.');
    } finally {
      if (child.exitCode === null) child.kill('SIGKILL');
    }
  });
});
