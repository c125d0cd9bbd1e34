/** A virtual logger on the far end of a pty pair, sending its protocol lines at the pace of signal time. */
import type { SerialPort } from 'serialport';
import { boardDesignSchema, type BoardDesign } from '../../../app/board/design';
import { createVirtualLogger, type VirtualLoggerOptions } from '../../../app/sim';
import { send } from '../serial/linkTestKit';
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
 */
export function paceVirtualLogger(port: SerialPort, options: VirtualLoggerOptions & { silentBetweenS?: [number, number] }): PacedLogger {
  const virtual = createVirtualLogger(chargerBoard(), options);
  const sent: string[] = [];
  const startedMs = Date.now();
  let running = true;
  // Host commands (start, identify...) from the recorder: answered like a logger (replies and a greeting).
  let heard = '';
  port.on('data', (chunk: Buffer) => {
    heard += chunk.toString('latin1');
    const lines = heard.split('\n');
    heard = lines.pop() ?? '';
    for (const line of lines) virtual.handleCommandLine(line.replace(/\r$/, ''));
  });
  const loop = (async () => {
    while (running) {
      const elapsedS = (Date.now() - startedMs) / 1000;
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
