/** Test kit for the serial-link suites: the logger end of a pty pair, and reading a link until a condition holds. */
import { SerialPort } from 'serialport';
import type { LinkItem, LoggerLink } from '../../../main/serial/loggerLink';

export function openLoggerEnd(path: string): Promise<SerialPort> {
  return new Promise((resolve, reject) => {
    const port = new SerialPort({ path, baudRate: 921_600, autoOpen: false, lock: false });
    // A write still waiting when the test closes this end fails with "Canceled": expected, and not what is tested.
    port.on('error', () => undefined);
    port.open((error) => (error ? reject(error) : resolve(port)));
  });
}

export function send(port: SerialPort, data: string | Buffer): Promise<void> {
  return new Promise((resolve, reject) => {
    port.write(data, (error) => (error ? reject(error) : port.drain(() => resolve())));
  });
}

export function closePort(port: SerialPort): Promise<void> {
  return new Promise((resolve) => (port.isOpen ? port.close(() => resolve()) : resolve()));
}

/** Reads items until `done(items)` says so or the stream ends; fails after `limitMs`, listing what came. */
export async function readUntil(link: LoggerLink, done: (items: LinkItem[]) => boolean, limitMs = 10_000, items: LinkItem[] = []): Promise<LinkItem[]> {
  const deadline = Date.now() + limitMs;
  while (!done(items)) {
    const remaining = deadline - Date.now();
    let timer: NodeJS.Timeout | undefined;
    const timeout = new Promise<'timeout'>((resolve) => (timer = setTimeout(() => resolve('timeout'), Math.max(0, remaining))));
    const result = await Promise.race([link.next(), timeout]);
    clearTimeout(timer);
    if (result === 'timeout') throw new Error(`link: condition not met in ${limitMs} ms; got ${summarise(items)}`);
    if (result.done) break;
    items.push(result.value);
  }
  return items;
}

export const linesOf = (items: LinkItem[]): string[] => items.flatMap((item) => (item.kind === 'line' ? [item.text] : []));
export const eventKinds = (items: LinkItem[]): string[] => items.filter((item) => item.kind !== 'line').map((item) => item.kind);

function summarise(items: LinkItem[]): string {
  return `${linesOf(items).length} lines, events [${eventKinds(items).join(', ')}]`;
}
