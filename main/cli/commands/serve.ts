/**
 * `rampwright serve [--port N] [--host ADDR] [--demo] [--db file|address] [--bench name] [--push-to address]`: the
 * screens in a browser. With --push-to the bench records into its own logbook file and pushes finished sessions to
 * the shared logbook as it goes (main/share/sharePusher.ts). Binds 127.0.0.1 unless told otherwise; every run has
 * its own access token, carried by the address it prints.
 * Runs until Ctrl-C; an open session is then marked interrupted (nothing recorded is lost).
 */
import { Option, type Command } from 'commander';
import { InputError } from '../../../app/errors';
import { startBenchServe } from '../../session/benchServe';
import { defaultLogbookPath } from './demo';
import { serialAccess } from '../../session/serialAccess';
import { resolveLogbookLocation } from '../../store/index';

interface ServeOptions {
  port: string;
  host: string;
  demo?: boolean;
  speed: string;
  db?: string;
  bench?: string;
  pushTo?: string;
  pushEvery: string;
}

export function parsePort(text: string): number {
  const port = Number(text);
  if (!/^\d+$/.test(text.trim()) || !Number.isInteger(port) || port < 0 || port > 65535) throw new InputError(`"${text}" is not a port number (0-65535; 0 picks a free one)`, '--port');
  return port;
}

export function registerServeCommand(program: Command): void {
  program
    .command('serve')
    .description('Serve the bench screens to a browser on this computer (or, with a token, to others)')
    .option('--port <number>', 'port to listen on (0 picks a free one)', '4870')
    .option('--host <address>', 'interface to listen on (another than 127.0.0.1 lets other computers that have the address in)', '127.0.0.1')
    // Kept so older scripts still start: the token is now required in every mode.
    .addOption(new Option('--token-required', 'the access token is always required').hideHelp())
    .option('--demo', 'connect the virtual board with the demo design')
    .option('--speed <factor>', 'how much faster than real time the demo board runs', '1')
    .option('--db <file|address>', 'logbook file, or a shared logbook\'s postgres:// address (default: logbook.sqlite in your data folder)')
    .option('--bench <name>', 'this bench\'s name on its sessions (default: RAMPWRIGHT_BENCH or the computer\'s name)')
    .option('--push-to <address>', 'push finished sessions to this shared logbook (postgres://...) as the bench goes (default: the RAMPWRIGHT_PUSH_TO setting)', process.env.RAMPWRIGHT_PUSH_TO?.trim() || undefined)
    .option('--push-every <seconds>', 'how often to push with --push-to', '10')
    .action(async (options: ServeOptions) => {
      const pushEveryS = Number(options.pushEvery);
      if (!Number.isFinite(pushEveryS) || pushEveryS < 0.5 || pushEveryS > 86_400) throw new InputError(`"${options.pushEvery}" is not a number of seconds between 0.5 and 86400`, '--push-every');
      const speed = Number(options.speed);
      if (!Number.isFinite(speed) || speed <= 0 || speed > 1000) throw new InputError(`"${options.speed}" is not a speed factor between 0 and 1000`, '--speed');
      const running = await startBenchServe({
        logbookPath: resolveLogbookLocation(options.db ?? defaultLogbookPath()),
        bench: options.bench,
        pushTo: options.pushTo,
        pushIntervalMs: pushEveryS * 1000,
        host: options.host,
        port: parsePort(options.port),
        demo: options.demo ?? false,
        speed,
        serial: await serialAccess(),
      });
      process.stdout.write(`${running.banner.join('\n')}\nPress Ctrl-C to stop.\n`);
      await new Promise<void>((resolveStop) => {
        const stop = () => {
          process.off('SIGINT', stop);
          process.off('SIGTERM', stop);
          resolveStop();
        };
        process.on('SIGINT', stop);
        process.on('SIGTERM', stop);
      });
      await running.close();
      process.stdout.write('Bench server stopped.\n');
    });
}
