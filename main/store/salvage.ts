/**
 * A damaged logbook file (pages overwritten by a failing disk, a copy cut short): SQLite's integrity check says
 * what is wrong, each session is read whole (its rows and its captures, checked against their sha-256) to tell
 * which can still be read, and those can be copied into a new logbook through the session archive's import, the
 * same path and checks as `rampwright import`. The damaged file is only ever opened for reading.
 */
import type { ArchiveSession } from '../../app/exchange/archiveSchema';
import { InputError } from '../../app/errors';
import { decodeCapture } from './captureCodec';
import { archiveContentHash } from './canonicalJson';
import { readArchiveSession } from './exchangeRows';
import { openLogbook } from './openLogbook';
import { openLogbookDatabase, type SqliteDatabase } from './openDatabase';
import { runSync } from './sqlProgram';
import { sqliteExecutor } from './sqliteLogbook';
import { errorCode } from './storageFaults';

export interface SalvageSession {
  id: number;
  unit: string | null;
  startedAt: string | null;
  readable: boolean;
  /** Why it cannot be read, in words; null when it can. */
  problem: string | null;
  /** Set by a salvage into a new logbook: the session's id there. */
  copiedAs?: number;
}

export interface SalvageReport {
  location: string;
  /** SQLite's integrity check, up to 50 findings; empty when it finds nothing wrong. */
  integrityProblems: string[];
  sessions: SalvageSession[];
}

/** Most integrity-check findings listed (the first ones name the damaged tables). */
const maxFindings = 50;

function describeFailure(error: unknown, location: string): string {
  const code = errorCode(error);
  if (code.startsWith('SQLITE_CORRUPT') || code === 'SQLITE_NOTADB') return 'its rows sit on damaged pages';
  return (error instanceof Error ? error.message : String(error)).replace(`${location}: `, '');
}

/** Session ids: from the sessions table, or, when its pages are damaged, by asking for each id in turn. */
function sessionIds(db: SqliteDatabase): number[] {
  try {
    return (db.prepare('SELECT id FROM sessions ORDER BY id').all() as Array<{ id: number }>).map((row) => row.id);
  } catch {
    const found: number[] = [];
    const probe = db.prepare('SELECT id FROM sessions WHERE id = ?');
    // Ids are handed out in order; 200 missing in a row means the end (or nothing more that can be reached).
    for (let id = 1, misses = 0; misses < 200 && id < 1_000_000; id += 1) {
      try {
        if (probe.get(id)) {
          found.push(id);
          misses = 0;
        } else misses += 1;
      } catch {
        misses += 1;
      }
    }
    return found;
  }
}

/** Reads one session whole; throws when any part of it is damaged. */
function readWhole(db: SqliteDatabase, id: number, location: string): { session: ArchiveSession; captureData: Buffer[] } {
  const content = runSync(readArchiveSession(id), sqliteExecutor(db));
  content.session.captures.forEach((info, index) => decodeCapture({ ...info, data: content.captureData[index], where: `${location}: session ${id}, capture ${index + 1}` }));
  return content;
}

function checkOpenDatabase(db: SqliteDatabase, location: string): { report: SalvageReport; contents: Map<number, { session: ArchiveSession; captureData: Buffer[] }> } {
  let integrityProblems: string[];
  try {
    const rows = db.prepare(`PRAGMA integrity_check(${maxFindings})`).all() as Array<{ integrity_check: string }>;
    integrityProblems = rows.map((row) => row.integrity_check).filter((text) => text !== 'ok');
  } catch (error) {
    integrityProblems = [`the integrity check itself stopped: ${error instanceof Error ? error.message : String(error)}`];
  }
  const contents = new Map<number, { session: ArchiveSession; captureData: Buffer[] }>();
  const sessions = sessionIds(db).map((id): SalvageSession => {
    let unit: string | null = null;
    let startedAt: string | null = null;
    try {
      const head = db.prepare('SELECT u.serial AS unit, s.started_at_ms AS startedAtMs FROM sessions s JOIN units u ON u.id = s.unit_id WHERE s.id = ?').get(id) as { unit: string; startedAtMs: number } | undefined;
      if (head) {
        unit = head.unit;
        startedAt = new Date(head.startedAtMs).toISOString();
      }
      const content = readWhole(db, id, location);
      contents.set(id, content);
      return { id, unit, startedAt, readable: true, problem: null };
    } catch (error) {
      return { id, unit, startedAt, readable: false, problem: describeFailure(error, location) };
    }
  });
  return { report: { location, integrityProblems, sessions }, contents };
}

/** The integrity check and which sessions can be read, without changing anything. */
export function checkDamagedLogbook(location: string): SalvageReport {
  const db = openLogbookDatabase(location, { readOnly: true });
  try {
    return checkOpenDatabase(db, location).report;
  } finally {
    db.close();
  }
}

/**
 * Copies every readable session into the logbook at `into` (a new file, or one that does not yet hold them:
 * importing is idempotent), and reports what was copied and what could not be read.
 */
export async function salvageLogbook(location: string, into: string): Promise<SalvageReport> {
  if (into === location) throw new InputError('salvage copies into another logbook: give --into a new file', '--into');
  const db = openLogbookDatabase(location, { readOnly: true });
  try {
    const { report, contents } = checkOpenDatabase(db, location);
    const target = await openLogbook(into);
    try {
      for (const entry of report.sessions) {
        const content = contents.get(entry.id);
        if (!content) continue;
        if (content.session.record.status !== 'closed' && content.session.record.status !== 'interrupted') continue;
        const result = await target.importArchiveSession({ ...content, contentSha256: archiveContentHash(content.session), where: `${location}: session ${entry.id}` });
        entry.copiedAs = result.sessionId;
      }
    } finally {
      await target.close();
    }
    return report;
  } finally {
    db.close();
  }
}
