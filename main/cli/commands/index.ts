/** Every command of the command line, in the order `rampwright --help` lists them. One line per command. */
import type { Command } from 'commander';
import { registerSimCommand } from './sim';

export function registerCommands(program: Command): void {
  void program;
  registerSimCommand(program);
}
