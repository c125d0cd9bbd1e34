/**
 * Every command of the command line, in the order `rampwright --help` lists them. One line per command. A command
 * is loaded when it is the one asked for (all of them for help): `analyze` does not pay for the PDF writer, the
 * serial port or the web server at start-up (the build splits them into chunks loaded on demand).
 */
import type { Command } from 'commander';

type Register = (program: Command) => void;

const commands: readonly { name: string; load: () => Promise<Register> }[] = [
  { name: 'demo', load: async () => (await import('./demo')).registerDemoCommand },
  { name: 'analyze', load: async () => (await import('./analyze')).registerAnalyzeCommand },
  { name: 'sim', load: async () => (await import('./sim')).registerSimCommand },
  { name: 'size', load: async () => (await import('./size')).registerSizeCommand },
  { name: 'trim', load: async () => (await import('./trim')).registerTrimCommand },
  { name: 'serve', load: async () => (await import('./serve')).registerServeCommand },
  { name: 'log', load: async () => (await import('./log')).registerLogCommand },
  { name: 'record', load: async () => (await import('./record')).registerRecordCommand },
  { name: 'report', load: async () => (await import('./report')).registerReportCommand },
  { name: 'export', load: async () => (await import('./export')).registerExportCommand },
  { name: 'import', load: async () => (await import('./import')).registerImportCommand },
  { name: 'salvage', load: async () => (await import('./salvage')).registerSalvageCommand },
  { name: 'push', load: async () => (await import('./push')).registerPushCommand },
];

/** Registers the command named first in `argv`, or every command when the first word names none (help, a typo). */
export async function registerCommands(program: Command, argv: readonly string[] = []): Promise<void> {
  const wanted = commands.find((command) => command.name === argv[0]);
  for (const command of wanted ? [wanted] : commands) (await command.load())(program);
}
