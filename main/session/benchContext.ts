/**
 * Everything a bench needs, opened once: the logbook file, the design catalogue (example designs plus the
 * technician's own in the data folder) and the session service over them. Shared by `serve`, `demo` and the
 * desktop shell.
 */
import { dirname, join } from 'node:path';
import { openLogbook } from '../store/openLogbook';
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
  close(): Promise<void>;
}

export interface BenchContextOptions {
  /** The logbook's location: a file (its folder is created when missing). */
  logbookPath: string;
  /** Where the technician's designs are saved (default: `designs` beside the logbook). */
  designsFolder?: string;
  serial?: SerialAccess | null;
  virtualPaced?: boolean;
  pipeline?: SessionServiceOptions['pipeline'];
  onBug?: (call: string, error: unknown) => void;
  /** More export formats (the commissioning record, CSV, COMTRADE...) beside the built-in session JSON. */
  exporters?: readonly SessionExporter[];
}

export async function openBenchContext(options: BenchContextOptions): Promise<BenchContext> {
  const logbook = await openLogbook(options.logbookPath);
  const designs = createDesignCatalog({ logbook, exampleFolders: [exampleDesignsFolder()], saveFolder: options.designsFolder ?? join(dirname(options.logbookPath), 'designs') });
  const service = createSessionService({ logbook, designs, serial: options.serial ?? null, exporters: [sessionJsonExporter, ...(options.exporters ?? [])], virtualPaced: options.virtualPaced, pipeline: options.pipeline });
  const dispatch = createBenchDispatch(service.handlers, { onBug: options.onBug });
  return {
    logbook,
    designs,
    service,
    dispatch,
    async close() {
      await service.close();
      await logbook.close();
    },
  };
}
