/**
 * Runs the command line as a child process of a user who does not own the test's files. As root (CI) that is
 * `nobody` through setpriv, since root writes any file whatever its mode; as anyone else it is the user itself,
 * whose files the test has made read-only. Folders the child must reach are opened to all by the caller.
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
  const [command, ...rest] = runsAsRoot ? ['setpriv', '--reuid=nobody', '--regid=nogroup', '--clear-groups', ...node] : node;
  const child = spawn(command, rest, { cwd: options.cwd ?? process.cwd(), stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, HOME: '/tmp', ...options.env } });
  let stdout = '';
  let stderr = '';
  child.stdout.setEncoding('utf8').on('data', (chunk: string) => (stdout += chunk));
  child.stderr.setEncoding('utf8').on('data', (chunk: string) => (stderr += chunk));
  return new Promise((resolve) => child.on('close', (code) => resolve({ code, stdout, stderr })));
}
