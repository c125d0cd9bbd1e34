/**
 * Where a shared logbook is and how to log in to it, from a `postgres://` (or `postgresql://`) address. The
 * password comes from the address, else the PGPASSWORD setting, else a password file (`?passfile=` in the address,
 * PGPASSFILE, or ~/.pgpass); host, port, user and database left out of the address come from PGHOST, PGPORT,
 * PGUSER and PGDATABASE, as every PostgreSQL client does. A password is never printed: messages and the logbook's
 * `location` use the address without it, and every error text from the driver is scrubbed of it.
 */
import type { PoolConfig } from 'pg';
import pg from 'pg';
import { userInfo } from 'node:os';
import { InputError } from '../../../app/errors';
import { passwordFilePath, passwordFromFile } from './passwordFile';

export function isPostgresLocation(location: string): boolean {
  return /^postgres(ql)?:\/\//i.test(location.trim());
}

export interface PostgresTarget {
  /** The address without a password: for messages, the logbook's `location`, and a bench's record of its pushes. */
  display: string;
  config: PoolConfig;
  /** Removes the password from a text (a driver's message may quote the address). */
  scrub(text: string): string;
}

/** int8 (count(*), bigint ids and millisecond times) and numeric (sum of bigints) as JavaScript numbers. */
const numberTypes = new Set([20, 1700]);
const types = {
  getTypeParser: ((oid: number, format?: 'text' | 'binary') => (numberTypes.has(oid) && format !== 'binary' ? (value: string) => Number(value) : pg.types.getTypeParser(oid, format as 'text'))) as typeof pg.types.getTypeParser,
};

/** Redacts `user:password@` in anything that looks like an address, even one that does not parse. */
export function redactAddress(text: string): string {
  return text.replace(/(postgres(?:ql)?:\/\/[^:@/\s]*):[^@\s]*@/gi, '$1@');
}

export function postgresTarget(location: string, env: Record<string, string | undefined> = process.env): PostgresTarget {
  let url: URL;
  try {
    url = new URL(location.trim());
  } catch {
    throw new InputError('is not a usable postgres:// address (postgres://user@host:port/database)', redactAddress(location));
  }
  const password = url.password === '' ? null : decodeURIComponent(url.password);
  const passfile = url.searchParams.get('passfile') ?? undefined;
  url.searchParams.delete('passfile');
  const user = url.username !== '' ? decodeURIComponent(url.username) : env.PGUSER ?? userInfo().username;
  const host = url.hostname !== '' ? url.hostname.replace(/^\[(.*)\]$/, '$1') : url.searchParams.get('host') ?? env.PGHOST ?? 'localhost';
  const port = url.port !== '' ? Number(url.port) : Number(env.PGPORT ?? 5432);
  const database = url.pathname.length > 1 ? decodeURIComponent(url.pathname.slice(1)) : env.PGDATABASE ?? user;
  const name = (text: string): string => encodeURIComponent(text);
  const display = host.startsWith('/')
    ? `postgres://${name(user)}@:${port}/${name(database)}?host=${name(host)}`
    : `postgres://${name(user)}@${host.includes(':') ? `[${host}]` : host}:${port}/${name(database)}`;
  const sslmode = url.searchParams.get('sslmode') ?? env.PGSSLMODE ?? 'prefer';
  // libpq's sslmode: verify-ca and verify-full check the server's certificate; require only encrypts.
  const ssl = sslmode === 'verify-ca' || sslmode === 'verify-full' ? { rejectUnauthorized: true } : sslmode === 'require' ? { rejectUnauthorized: false } : undefined;
  const secrets = [password, env.PGPASSWORD].filter((value): value is string => typeof value === 'string' && value.length >= 1);
  const scrub = (text: string): string => secrets.reduce((scrubbed, secret) => scrubbed.split(secret).join('[password]'), redactAddress(text));
  const config: PoolConfig = {
    host,
    port,
    user,
    database,
    // The password is asked for only when the server wants one, and read from the file at that moment.
    password: async () => {
      if (password !== null) return password;
      if (env.PGPASSWORD !== undefined) return env.PGPASSWORD;
      const fromFile = passwordFromFile(passwordFilePath(env, passfile), { host, port, database, user });
      if (fromFile !== null) {
        secrets.push(fromFile);
        return fromFile;
      }
      throw new InputError(`the server asks for a password for user ${user}: put it in a password file (PGPASSFILE or ~/.pgpass, readable by you only) or the PGPASSWORD setting`, display);
    },
    ssl,
    types,
    application_name: 'rampwright',
    connectionTimeoutMillis: 10_000,
  };
  return { display, config, scrub };
}

/** A location as messages and a bench's record of its pushes show it: a file as given, an address without password. */
export function logbookDisplayLocation(location: string, env: Record<string, string | undefined> = process.env): string {
  return isPostgresLocation(location) ? postgresTarget(location, env).display : location;
}
