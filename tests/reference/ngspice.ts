/**
 * Runs ngspice (Debian package `ngspice`, checked against release 39) as an outside reference for the board model
 * and the analysis engine. A deck's `.control` block runs `tran`, then `wrdata` of the wanted vectors, then `quit`;
 * ngspice is started with stdin not a terminal so it runs the control block in batch (REFERENCES.md).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface NgspiceTrace {
  timeS: Float64Array;
  /** One array per requested vector, in the order asked for, keyed by the vector expression (e.g. `v(ramp)`). */
  vectors: Record<string, Float64Array>;
}

export function ngspiceAvailable(): boolean {
  return spawnSync('ngspice', ['--version'], { stdio: 'ignore' }).status === 0;
}

/**
 * Simulates `netlist` (elements and models, no `.control`/`.end`) with a transient analysis and returns the traces.
 * `stepS` is the print step, `stopS` the end time; `maxStepS` bounds the solver's step so edges are resolved.
 */
export function runTransient(
  netlist: string,
  vectorNames: readonly string[],
  options: { stepS: number; stopS: number; maxStepS?: number; startS?: number },
): NgspiceTrace {
  const folder = mkdtempSync(join(tmpdir(), 'rampwright-ngspice-'));
  try {
    const outFile = join(folder, 'trace.txt');
    const maxStep = options.maxStepS ?? options.stepS;
    const deck = [
      '* rampwright reference deck',
      netlist.trim(),
      '.options reltol=1e-4 abstol=1e-12 vntol=1e-7',
      '.control',
      'set wr_singlescale',
      'set wr_vecnames',
      `tran ${options.stepS} ${options.stopS} ${options.startS ?? 0} ${maxStep}`,
      `linearize ${vectorNames.join(' ')}`,
      `wrdata ${outFile} ${vectorNames.join(' ')}`,
      'quit',
      '.endc',
      '.end',
      '',
    ].join('\n');
    const deckFile = join(folder, 'deck.cir');
    writeFileSync(deckFile, deck);
    execFileSync('ngspice', [deckFile], { cwd: folder, input: '', stdio: ['pipe', 'pipe', 'pipe'], timeout: 120_000 });
    return parseWrdata(readFileSync(outFile, 'utf8'), vectorNames);
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}

function parseWrdata(text: string, vectorNames: readonly string[]): NgspiceTrace {
  const lines = text.split('\n').filter((line) => line.trim().length > 0);
  const rows = lines.slice(1).map((line) => line.trim().split(/\s+/).map(Number));
  const timeS = new Float64Array(rows.map((row) => row[0]));
  const vectors: Record<string, Float64Array> = {};
  vectorNames.forEach((name, index) => {
    vectors[name] = new Float64Array(rows.map((row) => row[index + 1]));
  });
  return { timeS, vectors };
}
