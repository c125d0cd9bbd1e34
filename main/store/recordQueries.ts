/**
 * Board design versions as the commissioning record, recall and exchange read them: by id, the newest of a name,
 * and each unit's latest session of a design. Query programs (sqlProgram.ts), the same on both stores.
 */
import { InputError } from '../../app/errors';
import type { StoredDesignVersion } from './logbookTypes';
import { all, get, lock, type SqlProgram } from './sqlProgram';

const designColumns = 'id, name, version, content_hash AS "contentHash", design_json AS "designJson", saved_at_ms AS "savedAtMs"';

export function* readDesignVersion(designId: number): SqlProgram<StoredDesignVersion> {
  const row = yield* get<StoredDesignVersion>(`SELECT ${designColumns} FROM board_designs WHERE id = ?`, [designId]);
  if (!row) throw new InputError(`there is no board design version ${designId} in this logbook`);
  return row;
}

export function* designVersionByHash(contentHash: string): SqlProgram<StoredDesignVersion | null> {
  return (yield* get<StoredDesignVersion>(`SELECT ${designColumns} FROM board_designs WHERE content_hash = ?`, [contentHash])) ?? null;
}

/** The newest version of a design name, or null. */
export function* latestDesignVersion(designName: string): SqlProgram<StoredDesignVersion | null> {
  return (yield* get<StoredDesignVersion>(`SELECT ${designColumns} FROM board_designs WHERE name = ? ORDER BY version DESC LIMIT 1`, [designName])) ?? null;
}

/**
 * Adds a design version unless its content is stored already; the version number is the next free one for its name
 * in this logbook. Runs inside the caller's write transaction.
 */
export function* insertDesignVersion(design: { name: string; contentHash: string; designJson: string; savedAtMs: number }): SqlProgram<StoredDesignVersion> {
  yield* lock(`board design ${design.name}`);
  const existing = yield* designVersionByHash(design.contentHash);
  if (existing) return existing;
  const next = (yield* get<{ v: number }>('SELECT coalesce(max(version), 0) + 1 AS "v" FROM board_designs WHERE name = ?', [design.name]))?.v ?? 1;
  const inserted = yield* get<{ id: number }>(
    'INSERT INTO board_designs (name, version, content_hash, design_json, saved_at_ms) VALUES (?, ?, ?, ?, ?) RETURNING id',
    [design.name, next, design.contentHash, design.designJson, design.savedAtMs],
  );
  return yield* readDesignVersion((inserted as { id: number }).id);
}

/** Each unit's latest session among those that used any version of the design: one figure per unit in a fleet view. */
export function* latestSessionPerUnit(designName: string): SqlProgram<Array<{ unit: string; sessionId: number }>> {
  // Of two sessions started at the same instant the later recorded (higher id) counts.
  return yield* all<{ unit: string; sessionId: number }>(
    `SELECT u.serial AS "unit", max(s.id) AS "sessionId" FROM sessions s JOIN units u ON u.id = s.unit_id JOIN board_designs d ON d.id = s.design_id
     WHERE d.name = ? AND s.started_at_ms = (SELECT max(s2.started_at_ms) FROM sessions s2 JOIN board_designs d2 ON d2.id = s2.design_id WHERE s2.unit_id = s.unit_id AND d2.name = d.name)
     GROUP BY u.id, u.serial ORDER BY u.serial`,
    [designName],
  );
}
