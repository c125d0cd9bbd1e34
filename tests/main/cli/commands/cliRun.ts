/** Runs the command line in-process and collects what it prints (stdout, stderr) and its exit code. */
import { vi } from 'vitest';
import { runCommandLine } from '../../../../main/cli/rampwright';

export async function runCli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const outSpy = vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => {
    stdout += String(chunk);
    return true;
  });
  const errSpy = vi.spyOn(process.stderr, 'write').mockImplementation((chunk: string | Uint8Array) => {
    stderr += String(chunk);
    return true;
  });
  try {
    const code = await runCommandLine(args);
    return { code, stdout, stderr };
  } finally {
    outSpy.mockRestore();
    errSpy.mockRestore();
    process.exitCode = undefined;
  }
}
