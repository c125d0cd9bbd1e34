/**
 * Drives the firmware on the simulated board like a host on the link: commands at given signal times, every line
 * kept with the signal time it had arrived by. Also measures how fast the simulation runs here.
 */
import type { FirmwareLogger } from '../../../main/firmware/firmwareLogger';

export interface ScriptStep {
  atS: number;
  /** A host command line, framed (encodeCommand). */
  send: string;
}

export interface TimedLine {
  line: string;
  /** Signal time by which the line had arrived (s, to the simulation's 2 ms step). */
  atS: number;
}

export interface SessionRun {
  lines: TimedLine[];
  simulatedS: number;
  wallS: number;
}

export function runScript(logger: FirmwareLogger, steps: readonly ScriptStep[], untilS: number, stepS = 0.01): SessionRun {
  const lines: TimedLine[] = [];
  const pending = [...steps].sort((a, b) => a.atS - b.atS);
  const startedMs = performance.now();
  const fromS = logger.timeS();
  for (let timeS = fromS + stepS; timeS <= untilS + 1e-9; timeS += stepS) {
    while (pending.length > 0 && pending[0].atS <= logger.timeS()) logger.sendLine((pending.shift() as ScriptStep).send);
    for (const line of logger.runUntil(timeS)) lines.push({ line, atS: logger.timeS() });
  }
  return { lines, simulatedS: logger.timeS() - fromS, wallS: (performance.now() - startedMs) / 1000 };
}
