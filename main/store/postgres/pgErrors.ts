/**
 * What goes wrong talking to a shared logbook, in words a technician or the person running the server can act on.
 * Connection faults (server down, restarting, network gone) are `SharedLogbookUnreachable`, which a push retries;
 * refusals (wrong password, no such database, a finished session touched) are plain InputErrors. Every message is
 * scrubbed of the password before it leaves.
 */
import { InputError } from '../../../app/errors';
import type { PostgresTarget } from './connection';

export class SharedLogbookUnreachable extends InputError {
  /** What the connection said, short (e.g. "connect ECONNREFUSED 127.0.0.1:5432"), scrubbed. */
  readonly detail: string;

  constructor(detail: string, where: string) {
    super(`cannot reach the shared logbook (${detail}); is its server running and reachable from here?`, where);
    this.name = 'SharedLogbookUnreachable';
    this.detail = detail;
  }
}

/** A lost connection's short reason, for reports that list many. */
export function connectionFaultDetail(error: unknown): string {
  if (error instanceof SharedLogbookUnreachable) return error.detail;
  return error instanceof Error ? error.message : String(error);
}

/** Node socket codes and PostgreSQL SQLSTATEs that mean "the connection is gone or not there yet". */
const connectionCodes = new Set([
  'ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EAI_AGAIN', 'ENOENT',
  '57P01', '57P02', '57P03', '08000', '08001', '08003', '08004', '08006', '53300',
]);
const connectionMessages = [/Connection terminated/i, /connection error/i, /timeout exceeded when trying to connect/i, /Client was closed/i, /not queryable/i, /Connection ended/i];

export function isConnectionFault(error: unknown): boolean {
  if (error instanceof SharedLogbookUnreachable) return true;
  if (typeof error !== 'object' || error === null) return false;
  const code = (error as { code?: unknown }).code;
  if (typeof code === 'string' && connectionCodes.has(code)) return true;
  const message = (error as { message?: unknown }).message;
  return typeof message === 'string' && connectionMessages.some((pattern) => pattern.test(message));
}

/** The SQLSTATE a described error came from, if any. */
export function sqlStateOf(error: unknown): string | undefined {
  const code = typeof error === 'object' && error !== null ? (error as { code?: unknown }).code : undefined;
  return typeof code === 'string' ? code : undefined;
}

/** The error to throw for a driver error: typed, scrubbed, naming the logbook, keeping its SQLSTATE as `code`. */
export function describePostgresError(error: unknown, target: PostgresTarget): Error {
  const described = describe(error, target);
  const code = sqlStateOf(error);
  if (code !== undefined && described !== error) Object.assign(described, { code });
  return described;
}

function describe(error: unknown, target: PostgresTarget): Error {
  const code = typeof error === 'object' && error !== null ? (error as { code?: unknown }).code : undefined;
  const raw = error instanceof Error ? error.message : String(error);
  const message = target.scrub(raw);
  if (error instanceof InputError) {
    if (message === raw || error instanceof SharedLogbookUnreachable) return error;
    const scrubbed = new InputError(message);
    scrubbed.name = error.name;
    return scrubbed;
  }
  if (isConnectionFault(error)) return new SharedLogbookUnreachable(message, target.display);
  switch (code) {
    case '28P01':
    case '28000':
      return new InputError(`the server refused the login (${message}); check the user and the password file`, target.display);
    case '3D000':
      return new InputError(`there is no such database on the server (${message}); whoever runs the server creates it (README, "A shared logbook")`, target.display);
    case '42501':
      return new InputError(`the server refused this (${message})`, target.display);
    default:
      return new Error(`${target.display}: ${message}`);
  }
}
