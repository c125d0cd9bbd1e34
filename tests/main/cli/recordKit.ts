/** A virtual logger on the far end of a pty pair, sending its protocol lines at the pace of signal time. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { SerialPort } from 'serialport';
import { afterEach, beforeEach } from 'vitest';
import { startPtyPair, type PtyPair } from '../../helpers/socat';
import { boardDesignSchema, type BoardDesign } from '../../../app/board/design';
import { createVirtualLogger, type VirtualLoggerOptions } from '../../../app/sim';
import { closePort, openLoggerEnd, send } from '../serial/linkTestKit';
import designJson from '../../../fixtures/boards/charger-ch50h.board.json';

export const designPath = new URL('../../../fixtures/boards/charger-ch50h.board.json', import.meta.url).pathname;
export const chargerBoard = (): BoardDesign => boardDesignSchema.parse(designJson);

export interface PacedLogger {
  /** Every line sent so far, in order. */
  sent: string[];
  stop(): Promise<void>;
}

/**
 * `silentBetweenS`: seconds (from the start of pacing) during which the logger sends nothing; the lines it makes
 * then are lost, as with a logger that hangs and recovers.
 * `joinedAfterS`: the logger has been streaming this long before the port was opened: what it sent meanwhile (its
 * greeting included) never reaches the host, which first gets the end of a line cut in the middle. The stream reaches
 * the host from the first bytes the host sends (its first command, right after it opened the port): a pseudo-terminal
 * opened by serialport is flushed at opening (tcflush in its bindings), so a cut line sent before the host opened
 * would be thrown away on a busy machine and kept on a quiet one, and a backlog with nobody reading fills the
 * pair's buffers (the test failed in CI on both).
 * `commandLatencyMs`: how long the logger takes to act on a host command (lines keep flowing meanwhile).
 */
export function paceVirtualLogger(port: SerialPort, options: VirtualLoggerOptions & { silentBetweenS?: [number, number]; joinedAfterS?: number; commandLatencyMs?: number }): PacedLogger {
  const virtual = createVirtualLogger(chargerBoard(), options);
  const sent: string[] = [];
  let startedMs = Date.now();
  let running = true;
  const joinedAfterS = options.joinedAfterS ?? 0;
  let hostOpened: () => void = () => undefined;
  const hostHeard = joinedAfterS > 0 ? new Promise<void>((resolve) => (hostOpened = resolve)) : Promise.resolve();
  // Host commands (start, identify...) from the recorder: answered like a logger (replies and a greeting).
  let heard = '';
  port.on('data', (chunk: Buffer) => {
    hostOpened();
    heard += chunk.toString('latin1');
    const lines = heard.split('\n');
    heard = lines.pop() ?? '';
    for (const line of lines) {
      const act = (): void => void virtual.handleCommandLine(line.replace(/\r$/, ''));
      if (options.commandLatencyMs) setTimeout(act, options.commandLatencyMs);
      else act();
    }
  });
  const missed = joinedAfterS > 0 ? virtual.linesUntil(joinedAfterS) : [];
  const cutLine = missed.length > 0 ? missed[missed.length - 1] : '';
  const loop = (async () => {
    await Promise.race([hostHeard, new Promise((resolve) => setTimeout(resolve, 10_000))]);
    startedMs = Date.now();
    if (cutLine !== '') await send(port, `${cutLine.slice(Math.floor(cutLine.length / 2))}\n`).catch(() => undefined);
    while (running) {
      const elapsedS = joinedAfterS + (Date.now() - startedMs) / 1000;
      const lines = virtual.linesUntil(elapsedS);
      const silent = options.silentBetweenS !== undefined && elapsedS >= options.silentBetweenS[0] && elapsedS < options.silentBetweenS[1];
      if (lines.length > 0 && !silent) {
        sent.push(...lines);
        await send(port, lines.map((line) => `${line}\n`).join('')).catch(() => undefined);
      }
      await new Promise((resolve) => setTimeout(resolve, 40));
    }
  })();
  return {
    sent,
    async stop() {
      running = false;
      // A write can wait for ever once nobody reads the other end (socat's buffer full): do not wait on it.
      await Promise.race([loop, new Promise((resolve) => setTimeout(resolve, 1000))]);
    },
  };
}

/** A folder, a pseudo-terminal pair and the logger's end of it open, fresh for each test of the file that calls this. */
export function ptyPairEachTest(prefix: string): { readonly folder: string; readonly pair: PtyPair; readonly logger: SerialPort } {
  const rig = {} as { folder: string; pair: PtyPair; logger: SerialPort };
  beforeEach(async () => {
    rig.folder = mkdtempSync(join(tmpdir(), prefix));
    rig.pair = await startPtyPair(join(rig.folder, 'host'), join(rig.folder, 'logger'));
    rig.logger = await openLoggerEnd(rig.pair.loggerPath);
  });
  afterEach(async () => {
    await closePort(rig.logger);
    await rig.pair.stop();
    rmSync(rig.folder, { recursive: true, force: true });
  });
  return rig;
}
