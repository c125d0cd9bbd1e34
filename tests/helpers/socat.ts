/**
 * A pair of real pseudo-terminals joined by socat (Debian package), for serial-link tests:
 * `socat -d -d pty,raw,echo=0,link=A pty,raw,echo=0,link=B`. Bytes written to one end come out of the other.
 * `unplug()` kills socat with SIGKILL, as a logger yanked from its USB socket: both ends vanish at once.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { rmSync } from 'node:fs';

export interface PtyPair {
  /** The end the code under test opens (the "logger port"). */
  hostPath: string;
  /** The end the test drives as the logger. */
  loggerPath: string;
  pid: number;
  unplug(): Promise<void>;
  /** Ends socat politely (SIGTERM: it removes its links). */
  stop(): Promise<void>;
}

export async function startPtyPair(hostPath: string, loggerPath: string): Promise<PtyPair> {
  // Links left by a pair killed earlier would be taken for the new ones.
  // rmSync removes a dangling symbolic link too (it does not follow it).
  for (const path of [hostPath, loggerPath]) rmSync(path, { force: true });
  const child: ChildProcess = spawn('socat', ['-d', '-d', `pty,raw,echo=0,link=${hostPath}`, `pty,raw,echo=0,link=${loggerPath}`], {
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  let log = '';
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`socat did not start: ${log}`)), 10_000);
    child.stderr?.setEncoding('utf8');
    child.stderr?.on('data', (text: string) => {
      log += text;
      if (log.includes('starting data transfer loop')) {
        clearTimeout(timer);
        resolve();
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`socat exited (${code}): ${log}`));
    });
  });
  const pid = child.pid ?? -1;
  const end = async (signal: NodeJS.Signals): Promise<void> => {
    if (child.exitCode === null && child.signalCode === null) child.kill(signal);
    await exited;
  };
  return { hostPath, loggerPath, pid, unplug: () => end('SIGKILL'), stop: () => end('SIGTERM') };
}

