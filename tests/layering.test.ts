/**
 * The layering of ARCHITECTURE.md is a rule the test command enforces: these probes must fail the lint step
 * (eslint.config.js), and the per-runtime tsconfigs must reject platform globals in the pure core.
 */
import { ESLint } from 'eslint';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = resolve(__dirname, '..');
const eslint = new ESLint({ cwd: root });

async function restrictedImportErrors(filePath: string, source: string): Promise<string[]> {
  const [result] = await eslint.lintText(source, { filePath: join(root, filePath) });
  return result.messages.filter((message) => message.ruleId === 'no-restricted-imports').map((message) => message.message);
}

describe('import rule by runtime folder', () => {
  it.each([
    ['app/probe.ts', "import { readFileSync } from 'node:fs';\nexport const x = readFileSync;\n"],
    ['app/probe.ts', "import Database from 'better-sqlite3';\nexport const x = Database;\n"],
    ['app/probe.ts', "import { SerialPort } from 'serialport';\nexport const x = SerialPort;\n"],
    ['app/probe.ts', "import { Chart } from 'chart.js';\nexport const x = Chart;\n"],
    ['renderer/probe.ts', "import { ipcRenderer } from 'electron';\nexport const x = ipcRenderer;\n"],
    ['renderer/probe.ts', "import { join } from 'path';\nexport const x = join;\n"],
    ['main/probe.ts', "import { app } from 'electron';\nexport const x = app;\n"],
    ['main/session/probe.ts', "import Database from 'better-sqlite3';\nexport const x = Database;\n"],
    ['main/record/probe.ts', "import { openLogbookDatabase } from '../store/openDatabase';\nexport const x = openLogbookDatabase;\n"],
  ])('%s may not import %j', async (filePath, source) => {
    const errors = await restrictedImportErrors(filePath, source);
    expect(errors.length).toBe(1);
  });

  it.each([
    ['app/probe.ts', "import { z } from 'zod';\nexport const x = z;\n"],
    ['main/probe.ts', "import { readFileSync } from 'node:fs';\nexport const x = readFileSync;\n"],
    ['main/store/probe.ts', "import Database from 'better-sqlite3';\nexport const x = Database;\n"],
    ['main/record/probe.ts', "import { openLogbook } from '../store/openLogbook';\nexport const x = openLogbook;\n"],
    ['main/electron/probe.ts', "import { app } from 'electron';\nexport const x = app;\n"],
    ['renderer/probe.ts', "import { Chart } from 'chart.js';\nexport const x = Chart;\n"],
  ])('%s may import %j', async (filePath, source) => {
    expect(await restrictedImportErrors(filePath, source)).toEqual([]);
  });
});

describe('per-runtime compiler settings', () => {
  it('the app/ settings reject Node globals such as Buffer and process', () => {
    const folder = mkdtempSync(join(tmpdir(), 'rampwright-layering-'));
    try {
      writeFileSync(join(folder, 'probe.ts'), 'export const size = Buffer.byteLength("x") + process.pid;\n');
      writeFileSync(
        join(folder, 'tsconfig.json'),
        JSON.stringify({ extends: join(root, 'app/tsconfig.json'), include: [join(folder, 'probe.ts')] }),
      );
      let output = '';
      try {
        execFileSync(process.execPath, [join(root, 'node_modules/typescript/bin/tsc'), '-p', folder], { encoding: 'utf8' });
      } catch (error) {
        output = String((error as { stdout?: string }).stdout);
      }
      expect(output).toMatch(/Cannot find name 'Buffer'/);
      expect(output).toMatch(/Cannot find name 'process'/);
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });
});
