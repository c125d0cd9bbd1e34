/**
 * Browser mode as one function: open the bench (logbook, designs, session service), optionally connect the
 * virtual board, and serve the contract plus the built screens on loopback (or another interface when asked), with
 * this run's access token carried by the address it prints.
 * Used by `rampwright serve` and by `npm start` when the desktop shell cannot run.
 */
import { existsSync } from 'node:fs';
import { controlForAlpha } from '../../app/board/firingAngle';
import { InputError } from '../../app/errors';
import { isLoopbackAddress } from '../server/access';
import { startBenchServer, type BenchServer } from '../server/benchServer';
import { logbookDisplayLocation } from '../store/index';
import { openBenchContext, type BenchContext } from './benchContext';
import { demoDefaults } from './commissioningDemo';
import { rendererFolder } from './packagePaths';
import { recordExporters } from './recordExporters';
import type { SerialAccess } from './sessionService';

export interface BenchServeOptions {
  /** A logbook file, or a shared logbook's postgres:// address. */
  logbookPath: string;
  /** The bench's name on its sessions. */
  bench?: string;
  /** A shared logbook to push finished sessions to, as the bench goes, every `pushIntervalMs`. */
  pushTo?: string;
  pushIntervalMs?: number;
  host?: string;
  port?: number;
  /** This run's access token (default: a fresh random one). */
  token?: string;
  /** Connect the virtual board with the demo design and fault. */
  demo?: boolean;
  /** Times real time for the demo board (default 1). */
  speed?: number;
  serial?: SerialAccess | null;
  staticRoot?: string | null;
}

export interface RunningBench {
  context: BenchContext;
  server: BenchServer;
  /** Lines to print: the address, the token, the logbook. */
  banner: string[];
  close(): Promise<void>;
}

/** Why a server could not listen, in words, naming the option to change; anything unexpected stays a bug. */
export function listenFault(error: unknown, host: string, port: number): unknown {
  const code = (error as NodeJS.ErrnoException | null)?.code;
  if (code === 'EADDRINUSE') return new InputError(`port ${port} is already in use on ${host}: pick another with --port (0 picks a free one)`, '--port');
  if (code === 'EACCES') return new InputError(`this user may not listen on port ${port} (ports below 1024 need privileges): pick another with --port`, '--port');
  if (code === 'EADDRNOTAVAIL') return new InputError(`${host} is not an address of this computer`, '--host');
  return error;
}

export async function startBenchServe(options: BenchServeOptions): Promise<RunningBench> {
  const host = options.host ?? '127.0.0.1';
  const context = await openBenchContext({ logbookPath: options.logbookPath, serial: options.serial ?? null, exporters: recordExporters, bench: options.bench, pushTo: options.pushTo, pushIntervalMs: options.pushIntervalMs });
  try {
    if (options.demo) {
      const { design } = await context.designs.get(demoDefaults.designName);
      const controlV = controlForAlpha(design, 90) ?? design.rampTargetV / 2;
      const outcome = await context.dispatch('connect', { kind: 'virtual', designName: demoDefaults.designName, faults: demoDefaults.faults, control: { mode: 'fixed', controlV }, speed: options.speed ?? 1 });
      if (!outcome.ok) throw new Error(`the demo board did not connect: ${outcome.error.message}`);
    }
    const staticRoot = options.staticRoot === undefined ? rendererFolder() : options.staticRoot;
    const server = await startBenchServer({
      dispatch: context.dispatch,
      events: context.service.events,
      host,
      port: options.port ?? 0,
      token: options.token,
      staticRoot: staticRoot && existsSync(staticRoot) ? staticRoot : null,
      serveSourceMaps: process.env.RAMPWRIGHT_DEV === '1',
    }).catch((error: unknown) => {
      throw listenFault(error, host, options.port ?? 0);
    });
    const banner = [
      `Rampwright bench at ${server.url}`,
      `Access token: ${server.token} (new for every run; every request needs it, and the address above carries it)`,
      `Logbook: ${context.logbook.location}`,
    ];
    if (options.pushTo !== undefined) banner.push(`Pushing finished sessions to the shared logbook ${logbookDisplayLocation(options.pushTo)}`);
    if (!isLoopbackAddress(server.host)) banner.push(`Serving ${host}: other computers that have the address above can use this bench.`);
    if (!staticRoot || !existsSync(staticRoot)) banner.push('The screens are not built (npm run build); the API is served alone.');
    if (options.demo) banner.push(`Virtual board connected: ${demoDefaults.designName}, fault ${demoDefaults.faults.join(', ')}`);
    return {
      context,
      server,
      banner,
      async close() {
        await server.close();
        await context.close();
      },
    };
  } catch (error) {
    await context.close();
    throw error;
  }
}
