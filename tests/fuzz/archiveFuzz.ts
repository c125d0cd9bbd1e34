/**
 * Mutated session archives through `rampwright import`: fields changed with the hashes recomputed (so the change
 * reaches the checks of meaning, as a forger's would), changed without, the strings inside (design, readings,
 * steps) changed, and the gzip bytes changed. Shared by the test and the soak.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import { archiveContentHash } from '../../main/exchange/sessionArchive';
import { runCommandLine } from '../../main/cli/rampwright';
import { openSqliteLogbook } from '../../main/store/sqliteLogbook';
import { recordSweepSession } from '../main/record/recordFixture';
import { fuzz, mutateBytes, mutateJson, type Random } from './commandFuzz';

type ArchiveJson = { contentSha256: string; session: { design: { designJson: string; contentHash: string }; record: Record<string, unknown> } } & Record<string, unknown>;

const sha256 = (text: string): string => createHash('sha256').update(text).digest('hex');

async function quietly(args: string[]): Promise<number> {
  const out = process.stdout.write;
  process.stdout.write = (() => true) as typeof process.stdout.write;
  try {
    return await runCommandLine(args);
  } finally {
    process.stdout.write = out;
  }
}

/** The seeds: one short recorded session (cycles, transfer points, a capture, steps), signed and unsigned. */
export async function archiveSeeds(folder: string): Promise<Buffer[]> {
  const source = join(folder, 'source.sqlite');
  const logbook = await openSqliteLogbook(source);
  await recordSweepSession(logbook, { seconds: 0.25 });
  await logbook.close();
  const seeds: Buffer[] = [];
  for (const [name, extra] of [['signed', ['--key', join(folder, 'fuzz-key.pem')]], ['unsigned', ['--unsigned']]] as const) {
    const path = join(folder, `seed-${name}.rwsession`);
    if ((await quietly(['export', '--db', source, '--session', '1', '--out', path, ...extra])) !== 0) throw new Error('the seed archive was not written');
    seeds.push(readFileSync(path));
  }
  return seeds;
}

function rehash(archive: ArchiveJson): void {
  if (typeof archive.session?.design?.designJson === 'string') archive.session.design.contentHash = sha256(archive.session.design.designJson);
  try {
    archive.contentSha256 = archiveContentHash(archive.session as never);
  } catch {
    // A session mutated past hashing (not an object): left as it is, for the schema to refuse.
  }
}

/** A JSON text field changed as JSON (when it parses) or as bytes. */
function mutateText(text: string, random: Random): string {
  try {
    return JSON.stringify(mutateJson(JSON.parse(text), random));
  } catch {
    return new TextDecoder().decode(mutateBytes(new TextEncoder().encode(text), random));
  }
}

export async function fuzzArchives(folder: string, runs: number, seed: number) {
  const seeds = await archiveSeeds(folder);
  const parsed = seeds.map((bytes) => JSON.parse(gunzipSync(bytes).toString('utf8')) as ArchiveJson);
  const target = join(folder, 'target.sqlite');
  return fuzz('mutated archive', runs, seed, async (random: Random, run: number) => {
    const which = random.below(seeds.length);
    const use = random.next();
    let bytes: Uint8Array;
    if (use < 0.15) {
      bytes = mutateBytes(seeds[which], random);
    } else {
      let archive: ArchiveJson;
      if (use < 0.35) {
        archive = structuredClone(parsed[which]);
        const record = archive.session.record;
        const field = random.pick(['designJson', 'readingsJson', 'stepsJson'] as const);
        if (field === 'designJson') archive.session.design.designJson = mutateText(archive.session.design.designJson, random);
        else if (typeof record[field] === 'string') record[field] = mutateText(record[field] as string, random);
      } else {
        archive = mutateJson(parsed[which], random) as ArchiveJson;
      }
      if (use < 0.85 && typeof archive === 'object' && archive !== null) rehash(archive);
      bytes = gzipSync(Buffer.from(JSON.stringify(archive)), { level: 1 });
    }
    const path = join(folder, `archive-${run % 64}.rwsession`);
    writeFileSync(path, bytes);
    return ['import', '--db', target, path];
  });
}
