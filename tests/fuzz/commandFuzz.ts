/**
 * Fuzzing through the commands' own entry point: mutated inputs written to files and handed to `runCommandLine`
 * in-process, as a technician's shell would. Every run must end in a clear outcome: exit 0 with output free of
 * NaN, infinities and `undefined` (JSON that parses, every number finite), or exit 2 with one `rampwright: ...`
 * message; never a thrown bug, a stack trace or another exit code. Runs are drawn from a seeded generator: a
 * failure names the seed and the run, and `RAMPWRIGHT_FUZZ_SEED` replays it.
 * The suite runs `RAMPWRIGHT_FUZZ_RUNS` (default 10 000) of each kind; scripts/soak.ts runs 100 000.
 */
import { firstNonFiniteNumber } from '../../main/cli/jsonOutput';
import { runCommandLine } from '../../main/cli/rampwright';
import { joinBytes } from '../helpers/joinBytes';

/** xorshift32: small, fast and reproducible from its seed (Marsaglia, "Xorshift RNGs", 2003). */
export function createRandom(seed: number): { next(): number; below(limit: number): number; pick<T>(items: readonly T[]): T; chance(probability: number): boolean } {
  let state = seed >>> 0 || 0x9e3779b9;
  const next = (): number => {
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    return state / 0x1_0000_0000;
  };
  return {
    next,
    below: (limit) => Math.floor(next() * limit),
    pick: (items) => items[Math.floor(next() * items.length)],
    chance: (probability) => next() < probability,
  };
}
export type Random = ReturnType<typeof createRandom>;

export function fuzzRuns(): number {
  return Number(process.env.RAMPWRIGHT_FUZZ_RUNS ?? 10_000);
}

export function fuzzSeed(): number {
  return process.env.RAMPWRIGHT_FUZZ_SEED !== undefined ? Number(process.env.RAMPWRIGHT_FUZZ_SEED) : (Date.now() ^ (process.pid << 8)) >>> 0;
}

/** Bytes that matter to our formats, turning up more often than at random. */
const telling = ['\n', '\r\n', ',', ';', '-', '.', '9e999', 'NaN', '1e-300', '99999', '"', '\u001a', '\u0000', 'Infinity', '{', '}', '[', ']', ':'].map((text) => new TextEncoder().encode(text));

/** One to four byte-level changes: flip, insert, delete, duplicate, truncate. */
export function mutateBytes(original: Uint8Array, random: Random): Uint8Array {
  let bytes = original;
  const steps = 1 + random.below(4);
  for (let step = 0; step < steps; step += 1) {
    const at = bytes.length === 0 ? 0 : random.below(bytes.length);
    const piece = random.chance(0.5) ? random.pick(telling) : Uint8Array.from({ length: 1 + random.below(8) }, () => random.below(256));
    const kind = random.below(5);
    if (kind === 0) {
      bytes = Uint8Array.from(bytes);
      piece.forEach((value, index) => {
        if (at + index < bytes.length) bytes[at + index] ^= value;
      });
    } else if (kind === 1) bytes = joinBytes(bytes.subarray(0, at), piece, bytes.subarray(at));
    else if (kind === 2) bytes = joinBytes(bytes.subarray(0, at), bytes.subarray(at + 1 + random.below(16)));
    else if (kind === 3) bytes = joinBytes(bytes.subarray(0, at), bytes.subarray(at, at + 1 + random.below(32)), bytes.subarray(at));
    else bytes = bytes.subarray(0, at);
  }
  return bytes;
}

/** Values a JSON field may be replaced by: out of range, wrong type, empty, huge. */
const strangeValues: unknown[] = [0, -1, 1e-300, 1e300, -1e300, 5e-324, 2 ** 53 + 1, 0.5, 1e6, '', 'x', '1e999', null, true, [], {}, [1, 2], { ohm: 1 }, 'a'.repeat(5000)];

/** Changes one to three places in a JSON value: a field replaced, removed or duplicated under another name. */
export function mutateJson(value: unknown, random: Random): unknown {
  const copy = structuredClone(value) as unknown;
  const steps = 1 + random.below(3);
  for (let step = 0; step < steps; step += 1) {
    // Walk down to a random container.
    let parent: Record<string, unknown> | unknown[] | null = null;
    let key: string | number | null = null;
    let current: unknown = copy;
    while (typeof current === 'object' && current !== null && random.chance(0.8)) {
      const keys = Array.isArray(current) ? current.map((_, index) => index) : Object.keys(current);
      if (keys.length === 0) break;
      parent = current as Record<string, unknown> | unknown[];
      key = random.pick(keys as Array<string | number>);
      current = (parent as Record<string | number, unknown>)[key];
    }
    if (parent === null || key === null) continue;
    const target = parent as Record<string | number, unknown>;
    const action = random.below(10);
    if (action < 6) target[key] = typeof current === 'number' && random.chance(0.5) ? current * random.pick([1e-9, -1, 10, 1e9, 0]) : structuredClone(random.pick(strangeValues));
    else if (action < 8) {
      if (Array.isArray(parent)) parent.splice(Number(key), 1);
      else delete target[key];
    } else if (!Array.isArray(parent)) target[`${String(key)}Extra`] = current;
  }
  return copy;
}

export interface FuzzFailure {
  run: number;
  args: string[];
  problem: string;
}

/** Runs the command line with `args`, capturing its output, and says what is wrong with the outcome (null: clear). */
export async function clearOutcomeProblem(args: string[]): Promise<string | null> {
  let stdout = '';
  let stderr = '';
  const out = process.stdout.write;
  const err = process.stderr.write;
  process.stdout.write = ((chunk: string | Uint8Array) => ((stdout += String(chunk)), true)) as typeof process.stdout.write;
  process.stderr.write = ((chunk: string | Uint8Array) => ((stderr += String(chunk)), true)) as typeof process.stderr.write;
  let code: number;
  try {
    code = await runCommandLine(args);
  } catch (error) {
    return `threw (a bug): ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`;
  } finally {
    process.stdout.write = out;
    process.stderr.write = err;
    process.exitCode = undefined;
  }
  if (/\n\s+at \S+ \(|internal error/.test(stderr)) return `stack trace or internal error on stderr: ${stderr.slice(0, 400)}`;
  if (code === 2) return /^rampwright: \S/.test(stderr) || /^error: /.test(stderr) ? null : `exit 2 without a message: ${stderr.slice(0, 200)}`;
  if (code !== 0) return `exit ${code}: ${stderr.slice(0, 200)}`;
  if (/\bNaN\b|\bInfinity\b|\bundefined\b/.test(stdout)) return `NaN, Infinity or undefined in the output: ${stdout.slice(0, 300)}`;
  if (args.includes('--json')) {
    try {
      const bad = firstNonFiniteNumber(JSON.parse(stdout));
      if (bad !== null) return `non-finite number at ${bad}`;
    } catch {
      return `--json output is not JSON: ${stdout.slice(0, 200)}`;
    }
  }
  return null;
}

/** `runs` iterations of `oneRun`, collecting failures (at most 5 kept); returns them with the seed. */
export async function fuzz(label: string, runs: number, seed: number, oneRun: (random: Random, run: number) => Promise<string[] | null>): Promise<{ seed: number; failures: FuzzFailure[]; ran: number }> {
  const random = createRandom(seed);
  const failures: FuzzFailure[] = [];
  let ran = 0;
  for (let run = 0; run < runs && failures.length < 5; run += 1) {
    const args = await oneRun(random, run);
    if (args === null) continue;
    ran += 1;
    const problem = await clearOutcomeProblem(args);
    if (problem) failures.push({ run, args, problem: `${label}, seed ${seed}, run ${run}: ${problem}` });
  }
  return { seed, failures, ran };
}
