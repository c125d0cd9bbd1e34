/**
 * Everything a bench needs, opened once: the logbook file, the design catalogue (example designs plus the
 * technician's own in the data folder) and the session service over them. Shared by `serve`, `demo` and the
 * desktop shell.
 */
import { homedir } from 'node:os';
import { dirname, join } from 'node:path';
import { InputError } from '../../app/errors';
import type { PushReport } from '../share/pushSessions';
import { startSharePusher, type SharePusher } from '../share/sharePusher';
import { isPostgresLocation, openLogbook } from '../store/index';
import { userDataFolder } from './dataFolder';
import type { Logbook } from '../store/logbookTypes';
import { createDesignCatalog, type DesignCatalog } from './designCatalog';
import { createBenchDispatch, type BenchDispatch } from './dispatch';
import { sessionJsonExporter, type SessionExporter } from './exporters';
import { exampleDesignsFolder } from './packagePaths';
import { createSessionService, type SerialAccess, type SessionService, type SessionServiceOptions } from './sessionService';

export interface BenchContext {
  logbook: Logbook;
  designs: DesignCatalog;
  service: SessionService;
  dispatch: BenchDispatch;
  /** The background pusher, when the bench pushes to a shared logbook. */
  sharing: SharePusher | null;
  close(): Promise<void>;
}

export interface BenchContextOptions {
  /** The logbook's location: a file (its folder is created when missing) or a shared logbook's postgres:// address. */
  logbookPath: string;
  /** Where the technician's designs are saved (default: `designs` beside the logbook file, or in the data folder). */
  designsFolder?: string;
  /** The bench's name on its sessions (default: the RAMPWRIGHT_BENCH setting or the host name). */
  bench?: string;
  /** A shared logbook to push finished sessions to as the bench goes (the logbook must be this bench's own file). */
  pushTo?: string;
  /** How often the bench pushes (default 10 s). */
  pushIntervalMs?: number;
  /** Told each background push's report (what was pushed, what was retried). */
  onPushReport?: (report: PushReport) => void;
  serial?: SerialAccess | null;
  virtualPaced?: boolean;
  pipeline?: SessionServiceOptions['pipeline'];
  onBug?: (call: string, error: unknown) => void;
  /** More export formats (the commissioning record, CSV, COMTRADE...) beside the built-in session JSON. */
  exporters?: readonly SessionExporter[];
}

export async function openBenchContext(options: BenchContextOptions): Promise<BenchContext> {
  const shared = isPostgresLocation(options.logbookPath);
  if (options.pushTo !== undefined && (shared || !isPostgresLocation(options.pushTo))) {
    throw new InputError('a bench pushes from its own logbook file to a shared logbook\'s postgres:// address', '--push-to');
  }
  const logbook = await openLogbook(options.logbookPath);
  const dataFolder = shared ? userDataFolder({ platform: process.platform, env: process.env, home: homedir() }) : dirname(options.logbookPath);
  const designs = createDesignCatalog({ logbook, exampleFolders: [exampleDesignsFolder()], saveFolder: options.designsFolder ?? join(dataFolder, 'designs') });
  const sharing: SharePusher | null = options.pushTo === undefined ? null : startSharePusher(logbook, options.pushTo, { intervalMs: options.pushIntervalMs, onReport: options.onPushReport });
  const service = createSessionService({
    logbook, designs, serial: options.serial ?? null, exporters: [sessionJsonExporter, ...(options.exporters ?? [])], virtualPaced: options.virtualPaced, pipeline: options.pipeline,
    bench: options.bench, sharing, recordsSessions: !shared,
  });
  const dispatch = createBenchDispatch(service.handlers, { onBug: options.onBug });
  return {
    logbook,
    designs,
    service,
    dispatch,
    sharing,
    async close() {
      await service.close();
      await sharing?.stop();
      await logbook.close();
    },
  };
}
