/**
 * Serial loggers for the session service, over main/serial: port listing with USB ids, and a link source that
 * opens the port (reopening the same device when it comes back), asks the logger to identify itself and start,
 * and hands its lines and link events on. Loaded lazily, so a computer whose serial binding cannot load still
 * runs the virtual board and the logbook.
 */
import type { LinkState } from '../../app/contract';
import { edgeRequestAfter, encodeCommand } from '../../app/logger';
import type { LinkEventKind } from '../store/logbookTypes';
import type { LineSink, LineSource } from './liveLink';
import type { SerialAccess } from './sessionService';

type SerialModule = typeof import('../serial/index');

const eventStates: Partial<Record<string, LinkState>> = { unplugged: 'lost', 'watchdog-timeout': 'stalled', reopened: 'streaming', opened: 'connecting' };

export function serialSource(serial: SerialModule, path: string, options: { baudRate?: number }): LineSource {
  let link: Awaited<ReturnType<SerialModule['openLoggerLink']>> | null = null;
  let stopped = false;
  return {
    description: { kind: 'serial', path },
    start(sink: LineSink) {
      void (async () => {
        try {
          link = await serial.openLoggerLink({ path, baudRate: options.baudRate, reopen: true });
          if (stopped) return void (await link.close());
          await link.write(encodeCommand({ command: 'identify' }));
          await link.write(encodeCommand({ command: 'start' }));
          for await (const item of link) {
            if (item.kind === 'line') {
              const request = edgeRequestAfter(item.text);
              if (request) void link.write(request).catch(() => undefined);
              sink.lines([item.text]);
              continue;
            }
            const kind: LinkEventKind = item.kind === 'error' ? 'link-error' : item.kind;
            const detail = 'message' in item ? item.message : 'detail' in item ? item.detail : 'count' in item ? `${item.count} lines dropped` : 'path' in item ? item.path : '';
            sink.event?.(kind, detail, eventStates[item.kind] ?? null);
          }
          if (!stopped) sink.ended(`the port ${path} closed`);
        } catch (error) {
          sink.ended(error instanceof Error ? error.message : String(error));
        }
      })();
    },
    async stop() {
      stopped = true;
      if (link) {
        await link.write(encodeCommand({ command: 'stop' })).catch(() => undefined);
        await link.close();
      }
    },
  };
}

/** Serial access, or null where the serial binding cannot load here. */
export async function serialAccess(): Promise<SerialAccess | null> {
  let serial: SerialModule;
  try {
    serial = await import('../serial/index');
  } catch {
    return null;
  }
  return {
    listPorts: () => serial.listPorts(),
    async open(path, options) {
      // Checked before the link starts, so a wrong path or a busy port is an expected fault at connect.
      serial.checkDevicePath(path);
      return serialSource(serial, path, options);
    },
  };
}
