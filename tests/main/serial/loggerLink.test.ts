/**
 * The serial link on real pseudo-terminals (socat): a normal stream, host commands, very long lines, garbage, a
 * slow consumer. Each case asserts what the consumer received and what the link reported.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { SerialPort } from 'serialport';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openLoggerLink, type LoggerLink } from '../../../main/serial/loggerLink';
import { startPtyPair, type PtyPair } from '../../helpers/socat';
import { closePort, eventKinds, linesOf, openLoggerEnd, readUntil, send } from './linkTestKit';

let folder: string;
let pair: PtyPair;
let logger: SerialPort;
let link: LoggerLink | null = null;

beforeEach(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-link-'));
  pair = await startPtyPair(join(folder, 'host'), join(folder, 'logger'));
  logger = await openLoggerEnd(pair.loggerPath);
});
afterEach(async () => {
  await link?.close();
  link = null;
  await closePort(logger);
  await pair.stop();
  rmSync(folder, { recursive: true, force: true });
});

describe('logger link on a pseudo-terminal', () => {
  it('delivers a stream of lines in order, LF or CRLF ended, after an opened event', async () => {
    link = await openLoggerLink({ path: pair.hostPath, noDataTimeoutMs: 0 });
    const sent = Array.from({ length: 2000 }, (_, i) => `D ${i} ${'x'.repeat(i % 90)}`);
    await send(logger, sent.map((line, i) => (i % 3 === 0 ? `${line}\r\n` : `${line}\n`)).join(''));
    const items = await readUntil(link, (got) => linesOf(got).length >= 2000);
    expect(items[0]).toMatchObject({ kind: 'opened', path: pair.hostPath });
    expect(linesOf(items)).toEqual(sent);
    expect(eventKinds(items)).toEqual(['opened']);
    expect(link.stats()).toMatchObject({ lines: 2000, linesDropped: 0, longLines: 0, open: true });
  });

  it('sends host command lines to the logger', async () => {
    link = await openLoggerLink({ path: pair.hostPath, noDataTimeoutMs: 0 });
    const received = new Promise<string>((resolve) => {
      let text = '';
      logger.on('data', (chunk: Buffer) => {
        text += chunk.toString('latin1');
        if (text.split('\n').length > 2) resolve(text);
      });
    });
    await link.write('C start');
    await link.write('C rate 25000');
    expect(await received).toBe('C start\nC rate 25000\n');
  });

  it('cuts a very long line at maxLineBytes, reports its real length, and carries on with the next line', async () => {
    link = await openLoggerLink({ path: pair.hostPath, maxLineBytes: 1024, noDataTimeoutMs: 0 });
    const long = 'L'.repeat(200_000);
    await send(logger, `before\n${long}`);
    await send(logger, `\nafter\n${'M'.repeat(1024)}\n`);
    const items = await readUntil(link, (got) => linesOf(got).length >= 4);
    const lines = items.filter((item) => item.kind === 'line');
    expect(lines.map((line) => (line.kind === 'line' ? [line.text.length, line.truncated] : null))).toEqual([
      [6, false],
      [1024, true],
      [5, false],
      // Exactly maxLineBytes is still a whole line.
      [1024, false],
    ]);
    expect(items.find((item) => item.kind === 'line-too-long')).toMatchObject({ bytes: 200_000, keptBytes: 1024 });
    // Memory stayed bounded: the splitter never held more than the cap for an unfinished line.
    expect(link.stats().largestPendingBytes).toBeLessThanOrEqual(1024);
    expect(link.stats().longLines).toBe(1);
  });

  it('passes garbage bursts through as lines of their own without losing the good lines around them', async () => {
    link = await openLoggerLink({ path: pair.hostPath, maxLineBytes: 512, noDataTimeoutMs: 0 });
    // Garbage without LF (so it joins no good line): every byte value except LF, including NUL, CR and 0x80-0xff.
    const garbage = Buffer.from(Array.from({ length: 3000 }, (_, i) => { const b = (i * 97 + 13) % 256; return b === 10 ? 11 : b; }));
    const good = Array.from({ length: 300 }, (_, i) => `D ${i} abcdef`);
    for (let i = 0; i < good.length; i += 1) {
      await send(logger, `${good[i]}\n`);
      if (i % 50 === 25) await send(logger, Buffer.concat([garbage, Buffer.from('\n')]));
    }
    const items = await readUntil(link, (got) => linesOf(got).includes('D 299 abcdef'));
    // The good lines arrive whole and in order; each burst is one cut line plus one line-too-long report.
    expect(linesOf(items).filter((line) => line.startsWith('D '))).toEqual(good);
    const bursts = items.filter((item) => item.kind === 'line-too-long');
    expect(bursts).toHaveLength(6);
    expect(bursts.every((item) => item.kind === 'line-too-long' && item.bytes === 3000)).toBe(true);
  });

  it('drops and counts lines for a consumer that does not keep up, and says where', async () => {
    link = await openLoggerLink({ path: pair.hostPath, queueCapacityLines: 50, noDataTimeoutMs: 0 });
    const sent = Array.from({ length: 2000 }, (_, i) => `D ${i}`);
    await send(logger, sent.map((line) => `${line}\n`).join(''));
    // The consumer reads nothing until all 2000 lines have reached the link.
    const deadline = Date.now() + 10_000;
    while (link.stats().lines < 2000 && Date.now() < deadline) await new Promise((resolve) => setTimeout(resolve, 20));
    expect(link.stats().lines).toBe(2000);
    expect(link.stats().queuedLines).toBe(50);
    await send(logger, 'D late\n');
    const items = await readUntil(link, (got) => linesOf(got).includes('D late'));
    // The oldest 50 were kept, then one report of the 1950 dropped, then the stream goes on.
    expect(linesOf(items)).toEqual([...sent.slice(0, 50), 'D late']);
    expect(items.filter((item) => item.kind === 'lines-dropped')).toMatchObject([{ count: 1950 }]);
    const dropIndex = items.findIndex((item) => item.kind === 'lines-dropped');
    expect(items[dropIndex - 1]).toMatchObject({ kind: 'line', text: 'D 49' });
    expect(link.stats().linesDropped).toBe(1950);
  });
});
