/**
 * Runs the command line as a child process that file modes bind. As root (CI), root writes any file whatever its mode
 * only through its capabilities (CAP_DAC_OVERRIDE and kin), so the child runs as root with every capability dropped
 * (setpriv): a read-only file stays read-only to it, and it still reaches a checkout under a private temporary folder,
 * which another user such as `nobody` could not enter. As anyone else it is the user itself, whose files the test has
 * made read-only.
 */
import { spawn } from 'node:child_process';

export const runsAsRoot = typeof process.getuid === 'function' && process.getuid() === 0;

export interface ChildResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

export function runCliAsOtherUser(args: string[], options: { cwd?: string; env?: Record<string, string> } = {}): Promise<ChildResult> {
  const node = [process.execPath, '--import', 'tsx', 'main/cli/rampwright.ts', ...args];
  const [command, ...rest] = runsAsRoot ? ['setpriv', '--inh-caps=-all', '--ambient-caps=-all', '--bounding-set=-all', ...node] : node;
  const child = spawn(command, rest, { cwd: options.cwd ?? process.cwd(), stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, HOME: '/tmp', ...options.env } });
  let stdout = '';
  let stderr = '';
  child.stdout.setEncoding('utf8').on('data', (chunk: string) => (stdout += chunk));
  child.stderr.setEncoding('utf8').on('data', (chunk: string) => (stderr += chunk));
  return new Promise((resolve) => child.on('close', (code) => resolve({ code, stdout, stderr })));
}
