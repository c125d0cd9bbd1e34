/**
 * The serial link to the data logger: lines in (bounded, see boundedLineSplitter.ts), host command lines out, and
 * what happened to the link told in the same stream as the lines, in order: opened, unplugged, watchdog-timeout,
 * reopened, closed, error, line-too-long, lines-dropped.
 * Unplug: the binding closes the port with `disconnected` on most platforms; some never report it, so a no-data
 * watchdog also gives the port up after `noDataTimeoutMs` of silence. With `reopen`, the link then looks for the
 * same device every `reopenIntervalMs`: by its USB ids (vendor, product, serial number) when it had them, since a
 * replugged logger may come back under another name, else by its path.
 */
import { realpathSync, statSync } from 'node:fs';
import { SerialPort } from 'serialport';
import { createBoundedLineSplitter } from './boundedLineSplitter';
import { createLinkQueue } from './linkQueue';
import { checkDevicePath, LinkError, linkErrorFromMessage } from './linkErrors';
import { listPorts, sameUsbDevice, type PortInfo } from './listPorts';

/** The reference logger's serial rate: 16 MHz / (8 x 2) with U2X, an exact 1 Mbaud (firmware/src/config.h). */
export const defaultBaudRate = 1_000_000;

export interface LoggerLinkOptions {
  path: string;
  /** Default 1 000 000, the reference firmware's (firmware/README.md); a USB CDC logger ignores it, a UART bridge needs it. */
  baudRate?: number;
  /** Longest line kept (bytes, terminator excluded); longer ones are cut and reported. Default 4096 (PROTOCOL.md). */
  maxLineBytes?: number;
  /** Silence after which the port is given up as lost (ms); 0 turns the watchdog off. Default 3000. */
  noDataTimeoutMs?: number;
  /** Look for the device again after an unplug or a watchdog timeout. Default false. */
  reopen?: boolean;
  reopenIntervalMs?: number;
  /** Lines waiting for a slow consumer before new ones are dropped. Default 4096. */
  queueCapacityLines?: number;
}

export type LinkEvent =
  | { kind: 'opened'; path: string; port: PortInfo | null; atMs: number }
  | { kind: 'unplugged'; path: string; detail: string; atMs: number }
  | { kind: 'watchdog-timeout'; path: string; silentMs: number; atMs: number }
  | { kind: 'reopened'; path: string; previousPath: string; atMs: number }
  | { kind: 'closed'; path: string; atMs: number }
  | { kind: 'error'; path: string; message: string; atMs: number }
  | { kind: 'line-too-long'; bytes: number; keptBytes: number; atMs: number }
  | { kind: 'lines-dropped'; count: number; atMs: number };

export interface LinkLine {
  kind: 'line';
  text: string;
  /** The line was longer than maxLineBytes and this is its beginning only. */
  truncated: boolean;
  atMs: number;
}

export type LinkItem = LinkLine | LinkEvent;

export interface LinkStats {
  path: string;
  open: boolean;
  bytes: number;
  lines: number;
  linesDropped: number;
  longLines: number;
  queuedLines: number;
  /** Most bytes ever held for an unfinished line: never above maxLineBytes. */
  largestPendingBytes: number;
  unplugs: number;
  watchdogTimeouts: number;
  reopens: number;
}

export interface LoggerLink extends AsyncIterable<LinkItem> {
  next(): Promise<IteratorResult<LinkItem>>;
  /** Sends one host command line (a newline is added). */
  write(line: string): Promise<void>;
  stats(): LinkStats;
  /** Closes the port and ends the stream after what is queued. */
  close(): Promise<void>;
}

function openPort(path: string, baudRate: number): Promise<SerialPort> {
  return new Promise((resolve, reject) => {
    const port = new SerialPort({ path, baudRate, autoOpen: false });
    port.open((error) => (error ? reject(linkErrorFromMessage(path, error.message)) : resolve(port)));
  });
}

function deviceExists(path: string): boolean {
  try {
    return statSync(path).isCharacterDevice();
  } catch {
    return false;
  }
}

/** The serial ports there are, in a sentence, so a wrong path can be put right at once. */
async function portsHere(): Promise<string> {
  const ports = await listPorts().catch(() => [] as PortInfo[]);
  if (ports.length === 0) return 'No serial ports were found on this computer.';
  const named = ports.map((port) => (port.vendorId ? `${port.path} (USB ${port.vendorId}:${port.productId}${port.manufacturer ? `, ${port.manufacturer}` : ''})` : port.path));
  return `Serial ports here: ${named.join(', ')}.`;
}

async function identify(path: string): Promise<PortInfo | null> {
  try {
    const real = realpathSync(path);
    const ports = await listPorts();
    return ports.find((port) => port.path === path || port.path === real) ?? null;
  } catch {
    return null; // no udev, or the list failed: the link still works by path
  }
}

export async function openLoggerLink(options: LoggerLinkOptions): Promise<LoggerLink> {
  const baudRate = options.baudRate ?? defaultBaudRate;
  const maxLineBytes = options.maxLineBytes ?? 4096;
  const noDataTimeoutMs = options.noDataTimeoutMs ?? 3000;
  const reopenIntervalMs = options.reopenIntervalMs ?? 250;
  let first: SerialPort;
  try {
    checkDevicePath(options.path);
    first = await openPort(options.path, baudRate);
  } catch (error) {
    if (error instanceof LinkError && error.kind === 'not-found') throw new LinkError('not-found', error.path, `${error.detail} ${await portsHere()}`);
    throw error;
  }
  const identity = await identify(options.path);

  const queue = createLinkQueue<LinkLine, LinkEvent>(options.queueCapacityLines ?? 4096, (count) => ({ kind: 'lines-dropped', count, atMs: Date.now() }));
  const splitter = createBoundedLineSplitter(maxLineBytes);
  const stats: LinkStats = {
    path: options.path, open: true, bytes: 0, lines: 0, linesDropped: 0, longLines: 0, queuedLines: 0, largestPendingBytes: 0, unplugs: 0, watchdogTimeouts: 0, reopens: 0,
  };
  let port: SerialPort | null = null;
  let closing = false;
  let lastDataMs = Date.now();
  let reopenTimer: NodeJS.Timeout | null = null;

  const onLine = (line: { text: string; truncated: boolean }): void => {
    stats.lines += 1;
    queue.pushLine({ kind: 'line', text: line.text, truncated: line.truncated, atMs: Date.now() });
  };
  const onLongLine = (line: { bytes: number; keptBytes: number }): void => {
    stats.longLines += 1;
    queue.pushEvent({ kind: 'line-too-long', bytes: line.bytes, keptBytes: line.keptBytes, atMs: Date.now() });
  };

  function attach(next: SerialPort): void {
    port = next;
    stats.open = true;
    stats.path = next.path;
    lastDataMs = Date.now();
    splitter.reset();
    next.on('data', (chunk: Buffer) => {
      if (port !== next) return;
      lastDataMs = Date.now();
      stats.bytes += chunk.length;
      splitter.push(chunk, onLine, onLongLine);
      stats.largestPendingBytes = Math.max(stats.largestPendingBytes, splitter.pendingBytes());
    });
    next.on('error', (error: Error) => {
      if (port === next) queue.pushEvent({ kind: 'error', path: next.path, message: error.message, atMs: Date.now() });
    });
    next.on('close', (error: (Error & { disconnected?: boolean }) | null) => {
      if (port !== next || closing) return;
      lost('unplugged', error?.message ?? 'the port closed');
    });
  }

  function lost(kind: 'unplugged' | 'watchdog-timeout', detail: string): void {
    const gone = port;
    if (!gone) return;
    port = null;
    stats.open = false;
    const path = gone.path;
    if (kind === 'unplugged') {
      stats.unplugs += 1;
      queue.pushEvent({ kind: 'unplugged', path, detail, atMs: Date.now() });
    } else {
      stats.watchdogTimeouts += 1;
      queue.pushEvent({ kind: 'watchdog-timeout', path, silentMs: Date.now() - lastDataMs, atMs: Date.now() });
    }
    if (gone.isOpen) gone.close(() => undefined);
    if (options.reopen) scheduleReopen(path);
    else finish();
  }

  async function findAgain(previousPath: string): Promise<string | null> {
    if (identity && identity.vendorId !== null) {
      const ports = await listPorts().catch(() => [] as PortInfo[]);
      const same = ports.find((candidate) => candidate.path === previousPath && sameUsbDevice(identity, candidate)) ?? ports.find((candidate) => sameUsbDevice(identity, candidate));
      if (same) return same.path;
    }
    try {
      checkDevicePath(options.path);
      return options.path;
    } catch {
      return null;
    }
  }

  let lastReopenError = '';
  function scheduleReopen(previousPath: string): void {
    reopenTimer = setTimeout(async () => {
      reopenTimer = null;
      if (closing) return;
      const path = await findAgain(previousPath);
      if (path !== null && !closing) {
        try {
          const next = await openPort(path, baudRate);
          if (closing) {
            next.close(() => undefined);
            return;
          }
          attach(next);
          stats.reopens += 1;
          lastReopenError = '';
          queue.pushEvent({ kind: 'reopened', path, previousPath, atMs: Date.now() });
          return;
        } catch (error) {
          // Report each new reason once, not every attempt (a busy port would fill the stream).
          const message = error instanceof Error ? error.message : String(error);
          if (message !== lastReopenError) queue.pushEvent({ kind: 'error', path, message: `cannot reopen yet: ${message}`, atMs: Date.now() });
          lastReopenError = message;
        }
      }
      if (!closing) scheduleReopen(previousPath);
    }, reopenIntervalMs);
  }

  // The monitor: a device that has vanished from the file system is unplugged, whatever the binding says (serialport
  // 13 on Linux misses the hang-up of a port opened after another port in the same process was closed: seen on
  // pseudo-terminals here), and a port silent for noDataTimeoutMs is given up.
  const monitorMs = noDataTimeoutMs > 0 ? Math.max(20, Math.min(250, noDataTimeoutMs / 4)) : 250;
  const monitor = setInterval(() => {
    const current = port;
    if (!current) return;
    if (process.platform !== 'win32' && !deviceExists(current.path)) lost('unplugged', 'the device disappeared');
    else if (noDataTimeoutMs > 0 && Date.now() - lastDataMs > noDataTimeoutMs) lost('watchdog-timeout', 'no data');
  }, monitorMs);

  let finished = false;
  function finish(): void {
    if (finished) return;
    finished = true;
    clearInterval(monitor);
    if (reopenTimer) clearTimeout(reopenTimer);
    queue.end();
  }

  attach(first);
  queue.pushEvent({ kind: 'opened', path: first.path, port: identity, atMs: Date.now() });

  const link: LoggerLink = {
    next: () => queue.next(),
    [Symbol.asyncIterator]() {
      return { next: () => queue.next() };
    },
    write(line) {
      const current = port;
      if (!current || !current.isOpen) return Promise.reject(new LinkError('not-open', stats.path, 'the logger is not connected: the command was not sent'));
      return new Promise((resolve, reject) => {
        current.write(`${line}\n`, (error) => {
          if (error) reject(new LinkError('io', current.path, `cannot send to the logger: ${error.message}`));
          else current.drain(() => resolve());
        });
      });
    },
    stats: () => ({ ...stats, linesDropped: queue.droppedLines(), queuedLines: queue.queuedLines() }),
    async close() {
      if (closing) return;
      closing = true;
      const current = port;
      port = null;
      stats.open = false;
      if (current?.isOpen) await new Promise<void>((resolve) => current.close(() => resolve()));
      queue.pushEvent({ kind: 'closed', path: stats.path, atMs: Date.now() });
      finish();
    },
  };
  return link;
}
