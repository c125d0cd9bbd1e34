/**
 * The `rampwright` command line: a thin adapter over the core. Each command lives in commands/<name>.ts and
 * exports one `register<Name>Command(program)`. Expected faults (InputError) print their message and exit 2.
 */
import { Command, CommanderError } from 'commander';
import { isInputError } from '../../app/errors';
import { registerCommands } from './commands/index';
import { exitAfterOutput, toleratePipeClosed } from './deliverOutput';

export async function runCommandLine(argv: readonly string[]): Promise<number> {
  const program = new Command('rampwright')
    .description('Bench assistant for commissioning ramp-and-comparator thyristor firing boards')
    .exitOverride()
    .configureOutput({ writeErr: (text) => process.stderr.write(text) });
  await registerCommands(program, argv);
  try {
    await program.parseAsync([...argv], { from: 'user' });
    return typeof process.exitCode === 'number' ? process.exitCode : 0;
  } catch (error) {
    if (error instanceof CommanderError) return error.exitCode === 0 ? 0 : 2;
    if (isInputError(error)) {
      process.stderr.write(`rampwright: ${error.message}\n`);
      return 2;
    }
    throw error;
  }
}

const invokedDirectly = process.argv[1] !== undefined && /rampwright(\.js|\.ts)?$/.test(process.argv[1]);
if (invokedDirectly) {
  toleratePipeClosed(process.stdout);
  toleratePipeClosed(process.stderr);
  // Exit only after stdout and stderr have drained: a pipe takes output asynchronously (see deliverOutput.ts).
  runCommandLine(process.argv.slice(2)).then(
    (code) => exitAfterOutput(code),
    (error: unknown) => {
      process.stderr.write(`rampwright: internal error (a bug, please report it): ${error instanceof Error ? error.stack : String(error)}\n`);
      return exitAfterOutput(1);
    },
  );
}
