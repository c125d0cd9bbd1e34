/**
 * The SQLite store's queries for the commissioning record, recall and exchange: a design version's stored JSON by
 * id, the newest version of a name, each unit's latest session of a design. Read-only.
 */
import { InputError } from '../../app/errors';
import type { StoredDesignVersion } from './logbookTypes';
import type { SqliteDatabase } from './openDatabase';

export function readDesignVersion(db: SqliteDatabase, designId: number): StoredDesignVersion {
  const row = db
    .prepare('SELECT id, name, version, content_hash AS contentHash, design_json AS designJson, saved_at_ms AS savedAtMs FROM board_designs WHERE id = ?')
    .get(designId) as StoredDesignVersion | undefined;
  if (!row) throw new InputError(`there is no board design version ${designId} in this logbook`);
  return row;
}

/** The newest version of a design name, or null. */
export function latestDesignVersion(db: SqliteDatabase, designName: string): StoredDesignVersion | null {
  const row = db
    .prepare('SELECT id, name, version, content_hash AS contentHash, design_json AS designJson, saved_at_ms AS savedAtMs FROM board_designs WHERE name = ? ORDER BY version DESC LIMIT 1')
    .get(designName) as StoredDesignVersion | undefined;
  return row ?? null;
}

/** Each unit's latest session among those that used any version of the design: one figure per unit in a fleet view. */
export function latestSessionPerUnit(db: SqliteDatabase, designName: string): Array<{ unit: string; sessionId: number }> {
  return db
    .prepare(
      `SELECT u.serial AS unit, s.id AS sessionId FROM sessions s JOIN units u ON u.id = s.unit_id JOIN board_designs d ON d.id = s.design_id
       WHERE d.name = ? AND s.started_at_ms = (SELECT max(s2.started_at_ms) FROM sessions s2 JOIN board_designs d2 ON d2.id = s2.design_id WHERE s2.unit_id = s.unit_id AND d2.name = d.name)
       GROUP BY u.id ORDER BY u.serial`,
    )
    .all(designName) as Array<{ unit: string; sessionId: number }>;
}
