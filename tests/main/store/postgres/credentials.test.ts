/**
 * A shared logbook's password is never printed and never stored: not in what the commands write to the terminal,
 * not in the logbook's rows (the shared one, or a bench's record of where it pushed), not in error messages. The
 * password comes from the address, the PGPASSWORD setting or a password file (PostgreSQL's format; a file others
 * can read is ignored, as libpq does). Real server (throwaway cluster), the command line run in-process.
 */
import Database from 'better-sqlite3';
import pg from 'pg';
import { chmodSync, readFileSync, writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { passwordFromFile } from '../../../../main/store/postgres/passwordFile';
import { startThrowawayCluster, type ThrowawayCluster } from '../../../../scripts/postgres/throwawayCluster';
import { runCli } from '../../cli/cliRun';
import { tempFolder, type TempFolder } from '../storeFixtures';

// Characters an address must escape, and a colon a password file must escape.
const password = 'Tr1m pot:secret#7/';
const user = 'bench_b';
const database = 'line_logbook';
let cluster: ThrowawayCluster;
let folder: TempFolder;
const outputs: string[] = [];

const withPassword = () => cluster.url(database, user, password);
const withoutPassword = () => `postgres://${user}@127.0.0.1:${cluster.port}/${database}`;

function expectNoPassword(text: string): void {
  expect(text).not.toContain(password);
  expect(text).not.toContain(encodeURIComponent(password));
  expect(text).not.toContain('secret');
}

async function cli(args: string[], env: Record<string, string> = {}) {
  const result = await runCli(args, env);
  outputs.push(result.stdout, result.stderr);
  return result;
}

beforeAll(async () => {
  folder = tempFolder('rampwright-credentials-');
  cluster = await startThrowawayCluster();
  cluster.psql(`CREATE ROLE ${user} LOGIN PASSWORD '${password}'; CREATE DATABASE ${database} OWNER ${user};`);
}, 60_000);

afterAll(async () => {
  await cluster?.stop();
  folder?.remove();
});

describe('a shared logbook address with a password in it', () => {
  it('records, lists and reports without ever printing the password', async () => {
    // Given the shared logbook, the demo records into this bench's own logbook (data folder) and pushes from there.
    const demo = await cli(['demo', '--db', withPassword(), '--json'], { XDG_DATA_HOME: folder.file('data') });
    expect(demo.code).toBe(0);
    const result = JSON.parse(demo.stdout) as { logbook: string; pushed: string[] };
    expect(result.logbook).toBe(folder.file('data/rampwright/logbook.sqlite'));
    // The demo commissions two units (a part replaced, a stack-up trimmed): both sessions pushed.
    expect(result.pushed.join('\n')).toMatch(new RegExp(`Pushed 2 sessions \\(\\d+ cycles\\) to postgres://${user}@127\\.0\\.0\\.1:${cluster.port}/${database}`));
    const log = await cli(['log', '--db', withPassword()]);
    expect(log.code).toBe(0);
    expect(log.stdout).toMatch(/CH50H-0042/);
    const json = await cli(['log', '--db', withPassword(), '--json']);
    expect(JSON.parse(json.stdout).sessions).toHaveLength(2);
    const record = folder.file('record.html');
    expect((await cli(['report', '--db', withPassword(), '--session', '1', '--out', record])).code).toBe(0);
    outputs.push(readFileSync(record, 'utf8'));
    for (const text of outputs) expectNoPassword(text);
  });

  it('names the refusal of a wrong password without quoting it', async () => {
    const wrong = `postgres://${user}:${encodeURIComponent('not the secret of it')}@127.0.0.1:${cluster.port}/${database}`;
    const result = await cli(['log', '--db', wrong]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/refused the login/);
    expect(result.stderr).not.toContain('not the secret of it');
    expect(result.stderr).not.toContain(encodeURIComponent('not the secret of it'));
  });
});

describe('a password kept out of the address', () => {
  it('comes from the PGPASSWORD setting', async () => {
    const result = await cli(['log', '--db', withoutPassword()], { PGPASSWORD: password });
    expect(result.code).toBe(0);
    expectNoPassword(result.stdout + result.stderr);
  });

  it('comes from a password file readable by its owner only, and not from one others can read', async () => {
    const file = folder.file('pgpass');
    writeFileSync(file, `# line logbook\n127.0.0.1:${cluster.port}:${database}:${user}:${password.replace(/:/g, '\\:')}\n`);
    chmodSync(file, 0o600);
    expect(passwordFromFile(file, { host: '127.0.0.1', port: cluster.port, database, user })).toBe(password);
    const result = await cli(['log', '--db', withoutPassword()], { PGPASSFILE: file });
    expect(result.code).toBe(0);
    chmodSync(file, 0o644);
    const refused = await cli(['log', '--db', withoutPassword()], { PGPASSFILE: file });
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/asks for a password/);
    for (const text of outputs) expectNoPassword(text);
  });
});

describe('pushing and what is stored', () => {
  it('pushes a bench logbook without printing the password, and no stored row holds it', async () => {
    const local = folder.file('bench-b.sqlite');
    expect((await cli(['demo', '--db', local])).code).toBe(0);
    const push = await cli(['push', '--db', local, '--to', withPassword()]);
    expect(push.code).toBe(0);
    expect(push.stdout).toMatch(/Pushed 2 sessions/);
    // Both demos are in the shared logbook: two sessions each (the demo commissions two units).
    const log = await cli(['log', '--db', withPassword(), '--json']);
    expect((JSON.parse(log.stdout) as { sessions: unknown[] }).sessions).toHaveLength(4);
    for (const text of outputs) expectNoPassword(text);

    // Every text column of every table, in the shared logbook and in the bench's own.
    const client = new pg.Client({ connectionString: withPassword() });
    await client.connect();
    const columns = await client.query<{ table_name: string; column_name: string }>(
      "SELECT table_name, column_name FROM information_schema.columns WHERE table_schema = 'public' AND data_type = 'text'",
    );
    let scanned = 0;
    for (const { table_name: table, column_name: column } of columns.rows) {
      const found = await client.query(`SELECT count(*)::int AS n FROM ${table} WHERE position($1 in ${column}) > 0 OR position($2 in ${column}) > 0 OR position('secret' in ${column}) > 0`, [password, encodeURIComponent(password)]);
      expect(found.rows[0].n, `${table}.${column}`).toBe(0);
      scanned += 1;
    }
    await client.end();
    expect(scanned).toBeGreaterThan(20);
    const db = new Database(local, { readonly: true });
    const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").all() as Array<{ name: string }>).map((row) => row.name);
    for (const table of tables) {
      for (const { name } of db.prepare(`PRAGMA table_info(${table})`).all() as Array<{ name: string }>) {
        const n = (db.prepare(`SELECT count(*) AS n FROM ${table} WHERE instr(CAST(${name} AS TEXT), ?) > 0 OR instr(CAST(${name} AS TEXT), 'secret') > 0`).get(password) as { n: number }).n;
        expect(n, `${table}.${name}`).toBe(0);
      }
    }
    const [target] = db.prepare('SELECT target FROM shared_copies').all() as Array<{ target: string }>;
    db.close();
    expect(target.target).toBe(`postgres://${user}@127.0.0.1:${cluster.port}/${database}`);
  });
});
