/**
 * The logbook's queries are written once and run on either store. A query program is a generator that yields each
 * SQL step it needs and receives that step's result; an executor runs the steps, synchronously on SQLite
 * (better-sqlite3, inside its transactions) or asynchronously on PostgreSQL (node-postgres, on one connection).
 * So a reading, a summary or an archive is computed by the same code and the same SQL in both, and the store
 * contract tests hold both to the same answers.
 *
 * The SQL is the common ground of the two dialects: `?` placeholders (numbered for PostgreSQL by the executor),
 * aliases in double quotes (PostgreSQL folds bare names to lower case), RETURNING, ON CONFLICT, subqueries in FROM
 * named. `insert` steps carry rows for the executor to write its own way; `lock` steps serialise writers on PostgreSQL (advisory locks); SQLite's write transactions are serial
 * already, so there they do nothing.
 */

export type SqlValue = string | number | null | Uint8Array;

export type SqlStep =
  | { mode: 'all' | 'get' | 'run'; sql: string; parameters: readonly SqlValue[] }
  | { mode: 'insert'; table: string; columns: readonly string[]; rows: ReadonlyArray<readonly SqlValue[]> }
  | { mode: 'lock'; key: string };

export type SqlProgram<T> = Generator<SqlStep, T, unknown>;

export function* all<T>(sql: string, parameters: readonly SqlValue[] = []): SqlProgram<T[]> {
  return (yield { mode: 'all', sql, parameters }) as T[];
}

export function* get<T>(sql: string, parameters: readonly SqlValue[] = []): SqlProgram<T | undefined> {
  return (yield { mode: 'get', sql, parameters }) as T | undefined;
}

export function* run(sql: string, parameters: readonly SqlValue[] = []): SqlProgram<void> {
  yield { mode: 'run', sql, parameters };
}

/**
 * Many rows into one table, each store its fastest way: one prepared statement run per row on SQLite (no round
 * trips there), one statement per table on PostgreSQL (the rows travel as one JSON parameter).
 */
export function* insertMany(table: string, columns: readonly string[], rows: ReadonlyArray<readonly SqlValue[]>): SqlProgram<void> {
  if (rows.length > 0) yield { mode: 'insert', table, columns, rows };
}

/** Holds a writers' lock named `key` until the transaction ends (PostgreSQL only; see above). */
export function* lock(key: string): SqlProgram<void> {
  yield { mode: 'lock', key };
}

export function runSync<T>(program: SqlProgram<T>, execute: (step: SqlStep) => unknown): T {
  let next = program.next();
  while (!next.done) next = program.next(execute(next.value));
  return next.value;
}

export async function runAsync<T>(program: SqlProgram<T>, execute: (step: SqlStep) => Promise<unknown>): Promise<T> {
  let next = program.next();
  while (!next.done) {
    let result: unknown;
    try {
      result = await execute(next.value);
    } catch (error) {
      // Let the program's own finally blocks run, then fail as it would have.
      program.return(undefined as T);
      throw error;
    }
    next = program.next(result);
  }
  return next.value;
}

/** `?` placeholders as PostgreSQL's `$1, $2...`, leaving quoted text alone. */
export function numberedPlaceholders(sql: string): string {
  let out = '';
  let index = 0;
  let quote: string | null = null;
  for (const char of sql) {
    if (quote !== null) {
      if (char === quote) quote = null;
    } else if (char === "'" || char === '"') quote = char;
    else if (char === '?') {
      index += 1;
      out += `$${index}`;
      continue;
    }
    out += char;
  }
  return out;
}
