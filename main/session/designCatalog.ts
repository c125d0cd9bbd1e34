/**
 * Board designs the bench can pick: the example designs shipped with Rampwright (read-only) and the technician's
 * own, kept as `*.board.json` files in the data folder. Each distinct content gets a version from the logbook
 * (content-hashed there), so a session refers to the exact version it used.
 */
import { canonicalJson } from '../store/canonicalJson';
import { mkdirSync, readdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { boardDesignSchema, type BoardDesign } from '../../app/board/design';
import { validateBoardPhysics } from '../../app/board/boardPhysics';
import { parseBoardDesign } from '../../app/board/parseBoardDesign';
import { BenchFault, type DesignProblem, type DesignSummary, type StoredDesign } from '../../app/contract';
import type { Logbook } from '../store/logbookTypes';

export interface DesignCatalog {
  list(): Promise<DesignSummary[]>;
  get(name: string, version?: number): Promise<StoredDesign>;
  /** Saves a new version; a design equal to a stored version of its name saves nothing (`saved` false). */
  save(design: BoardDesign): Promise<StoredDesign & { saved: boolean }>;
  validate(input: unknown): { ok: boolean; problems: DesignProblem[] };
}

export interface DesignCatalogOptions {
  logbook: Logbook;
  /** Folders of read-only example designs (e.g. fixtures/boards). */
  exampleFolders: readonly string[];
  /** Where the technician's designs are saved (created when first needed). */
  saveFolder: string | null;
}

/** File name for a design: its name in lower case with anything but letters and digits as dashes. */
export function designFileName(name: string): string {
  const slug = name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '');
  return `${slug || 'design'}.board.json`;
}

function readDesignFolder(folder: string): BoardDesign[] {
  let names: string[];
  try {
    names = readdirSync(folder).filter((name) => name.endsWith('.board.json')).sort();
  } catch {
    return [];
  }
  const designs: BoardDesign[] = [];
  for (const name of names) {
    try {
      designs.push(parseBoardDesign(JSON.parse(readFileSync(join(folder, name), 'utf8')), join(folder, name)));
    } catch {
      // A damaged or invalid file is left out of the list; opening it by path in the Board screen says why.
    }
  }
  return designs;
}

export function validateDesignInput(input: unknown): { ok: boolean; problems: DesignProblem[] } {
  const parsed = boardDesignSchema.safeParse(input);
  if (!parsed.success) {
    return { ok: false, problems: parsed.error.issues.map((issue) => ({ field: issue.path.map(String).join('.') || '(whole design)', message: issue.message })) };
  }
  const problems = validateBoardPhysics(parsed.data).map((problem) => ({ field: problem.field, message: problem.severity === 'warning' ? `warning: ${problem.message}` : problem.message }));
  return { ok: !validateBoardPhysics(parsed.data).some((problem) => problem.severity === 'error'), problems };
}

export function createDesignCatalog(options: DesignCatalogOptions): DesignCatalog {
  /** name -> version -> stored design, filled as designs are read or saved. */
  const versions = new Map<string, Map<number, StoredDesign>>();
  let loaded = false;

  const remember = async (design: BoardDesign): Promise<StoredDesign> => {
    const version = await options.logbook.saveDesign(design);
    const stored: StoredDesign = {
      summary: { name: design.name, version: version.version, mainsHz: design.mainsHz, rectifier: design.rectifier, rampTargetV: design.rampTargetV, savedAt: version.savedAt },
      design,
    };
    const byVersion = versions.get(design.name) ?? new Map<number, StoredDesign>();
    byVersion.set(version.version, stored);
    versions.set(design.name, byVersion);
    return stored;
  };

  const load = async (): Promise<void> => {
    if (loaded) return;
    loaded = true;
    const folders = [...options.exampleFolders, ...(options.saveFolder ? [options.saveFolder] : [])];
    for (const folder of folders) for (const design of readDesignFolder(folder)) await remember(design);
  };

  const latest = (name: string): StoredDesign | null => {
    const byVersion = versions.get(name);
    if (!byVersion || byVersion.size === 0) return null;
    return byVersion.get(Math.max(...byVersion.keys())) ?? null;
  };

  return {
    async list() {
      await load();
      return [...versions.keys()].sort().map((name) => latest(name)!.summary);
    },
    async get(name, version) {
      await load();
      const found = version === undefined ? latest(name) : (versions.get(name)?.get(version) ?? null);
      if (!found) throw new BenchFault('not-found', version === undefined ? `there is no board design named "${name}"` : `there is no version ${version} of the board design "${name}"`, 'name');
      return found;
    },
    async save(design) {
      await load();
      const checked = parseBoardDesign(design, 'design');
      // Nothing changed: the version it equals stays the latest word, and no file or version is written.
      const same = [...(versions.get(checked.name)?.values() ?? [])].find((known) => canonicalJson(known.design) === canonicalJson(checked));
      if (same) return { ...same, saved: false };
      const stored = await remember(checked);
      if (options.saveFolder) {
        mkdirSync(options.saveFolder, { recursive: true });
        const file = join(options.saveFolder, designFileName(checked.name));
        writeFileSync(`${file}.tmp`, `${JSON.stringify(checked, null, 2)}\n`);
        renameSync(`${file}.tmp`, file);
      }
      return { ...stored, saved: true };
    },
    validate: validateDesignInput,
  };
}
