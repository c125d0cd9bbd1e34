/**
 * Every test file gets a data folder of its own (XDG_DATA_HOME), so nothing a command keeps there by default (the
 * logbook, the bench signing key) lands in the home folder of whoever runs the suite.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';

const folder = mkdtempSync(join(tmpdir(), 'rampwright-data-'));
process.env.XDG_DATA_HOME = folder;
afterAll(() => rmSync(folder, { recursive: true, force: true }));
