/**
 * Link faults on real pseudo-terminals (socat): dropped and corrupted logger blocks seen through the decoder, an
 * unplug mid-stream (socat killed), a logger gone silent (watchdog), and a device that comes back at the same path.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { SerialPort } from 'serialport';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createLoggerDecoder } from '../../../app/logger';
import { createVirtualLogger } from '../../../app/sim';
import { boardDesignSchema } from '../../../app/board/design';
import { openLoggerLink, type LoggerLink } from '../../../main/serial/loggerLink';
import { startPtyPair, type PtyPair } from '../../helpers/socat';
import { closePort, eventKinds, linesOf, openLoggerEnd, readUntil, send } from './linkTestKit';
import design from '../../../fixtures/boards/charger-ch50h.board.json';

let folder: string;
let pair: PtyPair;
let logger: SerialPort;
let link: LoggerLink | null = null;
const extraPairs: PtyPair[] = [];

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
  for (const extra of extraPairs.splice(0)) await extra.stop();
  rmSync(folder, { recursive: true, force: true });
});

describe('logger link faults on a pseudo-terminal', () => {
  it('carries logger blocks so the decoder counts exactly the dropped and corrupted ones', async () => {
    const virtual = createVirtualLogger(boardDesignSchema.parse(design), { seed: 7, blockSamples: 100 });
    // Greeting plus 0.4 s of data at 25 kS/s in 100-sample blocks: 100 data lines.
    const lines = virtual.linesUntil(0.4);
    const dataIndexes = lines.flatMap((line, index) => (line.startsWith('D') ? [index] : []));
    expect(dataIndexes.length).toBeGreaterThanOrEqual(90);
    const dropped = new Set([dataIndexes[10], dataIndexes[40], dataIndexes[41]]);
    const corrupted = new Set([dataIndexes[20], dataIndexes[60]]);
    const sentLines = lines.flatMap((line, index) => {
      if (dropped.has(index)) return [];
      if (corrupted.has(index)) return [`${line.slice(0, 30)}${line[30] === 'A' ? 'B' : 'A'}${line.slice(31)}`];
      return [line];
    });
    link = await openLoggerLink({ path: pair.hostPath, noDataTimeoutMs: 0 });
    await send(logger, sentLines.map((line) => `${line}\n`).join(''));
    const items = await readUntil(link, (got) => linesOf(got).length >= sentLines.length);
    expect(linesOf(items)).toEqual(sentLines);
    const decoder = createLoggerDecoder();
    let blocks = 0;
    for (const line of linesOf(items)) blocks += decoder.pushLine(line).filter((event) => event.kind === 'block').length;
    const health = decoder.health();
    expect(health.crcFailures).toBe(2);
    // Lost: 3 dropped + 2 rejected for their CRC, in four places (blocks 10; 20; 40-41; 60).
    expect(health.blocksLost).toBe(5);
    expect(health.sequenceGaps).toBe(4);
    expect(blocks).toBe(dataIndexes.length - 5);
  });

  it('reports an unplug mid-stream (socat killed) and ends the stream, keeping every line that came before', async () => {
    link = await openLoggerLink({ path: pair.hostPath, noDataTimeoutMs: 0 });
    const sent = Array.from({ length: 500 }, (_, i) => `D ${i}`);
    await send(logger, sent.map((line) => `${line}\n`).join(''));
    const items = await readUntil(link, (got) => linesOf(got).length >= 500);
    await pair.unplug();
    // The stream ends by itself after the unplug (no reopen asked for).
    await readUntil(link, () => false, 10_000, items);
    expect(linesOf(items)).toEqual(sent);
    expect(eventKinds(items)).toEqual(['opened', 'unplugged']);
    expect(link.stats()).toMatchObject({ open: false, unplugs: 1 });
    await expect(link.write('C stop')).rejects.toThrow(/not connected/);
  });

  it('gives up a port that goes silent after the watchdog time, where the platform never reports an unplug', async () => {
    link = await openLoggerLink({ path: pair.hostPath, noDataTimeoutMs: 300 });
    await send(logger, 'D 1\nD 2\n');
    const items = await readUntil(link, () => false, 10_000);
    expect(linesOf(items)).toEqual(['D 1', 'D 2']);
    expect(eventKinds(items)).toEqual(['opened', 'watchdog-timeout']);
    const timeout = items.find((item) => item.kind === 'watchdog-timeout');
    expect(timeout?.kind === 'watchdog-timeout' ? timeout.silentMs : 0).toBeGreaterThan(300);
    const stats = link.stats();
    expect(stats.watchdogTimeouts).toBe(1);
    expect(stats.open).toBe(false);
  });

  it('reopens the device when it comes back at the same path and goes on delivering lines', async () => {
    link = await openLoggerLink({ path: pair.hostPath, noDataTimeoutMs: 0, reopen: true, reopenIntervalMs: 100 });
    await send(logger, 'D before\n');
    const items = await readUntil(link, (got) => linesOf(got).includes('D before'));
    await closePort(logger);
    await pair.unplug();
    await readUntil(link, (got) => got.some((item) => item.kind === 'unplugged'), 10_000, items);
    // A new pair at the same link paths: the logger plugged back in.
    const again = await startPtyPair(pair.hostPath, pair.loggerPath);
    extraPairs.push(again);
    await readUntil(link, (got) => got.some((item) => item.kind === 'reopened'), 10_000, items);
    logger = await openLoggerEnd(again.loggerPath);
    await send(logger, 'D after\n');
    await readUntil(link, (got) => linesOf(got).includes('D after'), 10_000, items);
    expect(linesOf(items)).toEqual(['D before', 'D after']);
    expect(eventKinds(items).filter((kind) => kind !== 'error')).toEqual(['opened', 'unplugged', 'reopened']);
    expect(link.stats()).toMatchObject({ open: true, unplugs: 1, reopens: 1 });
  });
});
