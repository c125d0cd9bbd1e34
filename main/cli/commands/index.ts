/** Every command of the command line, in the order `rampwright --help` lists them. One line per command. */
import type { Command } from 'commander';
import { registerDemoCommand } from './demo';
import { registerAnalyzeCommand } from './analyze';
import { registerSimCommand } from './sim';
import { registerSizeCommand } from './size';
import { registerTrimCommand } from './trim';
import { registerServeCommand } from './serve';
import { registerLogCommand } from './log';
import { registerRecordCommand } from './record';
import { registerReportCommand } from './report';
import { registerExportCommand } from './export';
import { registerImportCommand } from './import';
import { registerSalvageCommand } from './salvage';
import { registerPushCommand } from './push';

export function registerCommands(program: Command): void {
  void program;
  registerDemoCommand(program);
  registerAnalyzeCommand(program);
  registerSimCommand(program);
  registerSizeCommand(program);
  registerTrimCommand(program);
  registerServeCommand(program);
  registerLogCommand(program);
  registerRecordCommand(program);
  registerReportCommand(program);
  registerExportCommand(program);
  registerImportCommand(program);
  registerSalvageCommand(program);
  registerPushCommand(program);
}
