/**
 * The one error shape that crosses a transport (Electron IPC or HTTP/WebSocket). Errors are serialised on purpose,
 * never by whatever the transport does with a thrown object: an expected fault (port busy, bad design value,
 * no session open) keeps its message for the technician; anything else is a bug and says so.
 */
import { z } from 'zod';
import { isInputError } from '../errors';

export const benchErrorCodes = [
  /** A payload failed the contract's schema (a screen or client sent something malformed). */
  'invalid-payload',
  /** The call name is not in the contract. */
  'unknown-call',
  /** The request came from somewhere it may not (foreign frame, missing access token). */
  'not-allowed',
  /** The call needs state that is not there: no link, no session open, nothing to trim. */
  'not-ready',
  /** A named thing does not exist: design, session, unit, port. */
  'not-found',
  /** The input was understood but is wrong: a design value, a capture file, a port that will not open. */
  'input',
  /** A hook that another part of the program has not filled yet (an export format nobody registered). */
  'not-available',
  /** A bug: the message is for the developer's report, not the technician's fault. */
  'internal',
] as const;

export type BenchErrorCode = (typeof benchErrorCodes)[number];

export const benchErrorSchema = z.object({
  /** Expected faults are the technician's to fix; bugs are ours. */
  kind: z.enum(['expected', 'bug']),
  code: z.enum(benchErrorCodes),
  message: z.string(),
  /** Where the fault is: a field path, a file and line, a port. */
  where: z.string().nullable(),
});

export type BenchErrorShape = z.infer<typeof benchErrorSchema>;

/** What every call returns across a transport: a result or an error, never a thrown object. */
export type CallOutcome<Result> = { ok: true; result: Result } | { ok: false; error: BenchErrorShape };

export const callOutcomeSchema = z.discriminatedUnion('ok', [
  z.object({ ok: z.literal(true), result: z.unknown() }),
  z.object({ ok: z.literal(false), error: benchErrorSchema }),
]);

/** Thrown on the service side for an expected fault with a code; serialised as `kind: 'expected'`. */
export class BenchFault extends Error {
  readonly code: BenchErrorCode;
  readonly where: string | null;

  constructor(code: Exclude<BenchErrorCode, 'internal'>, message: string, where?: string) {
    super(where ? `${where}: ${message}` : message);
    this.name = 'BenchFault';
    this.code = code;
    this.where = where ?? null;
  }
}

/** Thrown on the client side when a call comes back with an error; carries the serialised shape. */
export class BenchCallError extends Error {
  readonly kind: BenchErrorShape['kind'];
  readonly code: BenchErrorCode;
  readonly where: string | null;

  constructor(shape: BenchErrorShape) {
    super(shape.message);
    this.name = 'BenchCallError';
    this.kind = shape.kind;
    this.code = shape.code;
    this.where = shape.where;
  }

  get expected(): boolean {
    return this.kind === 'expected';
  }
}

/** Turns anything thrown by the service into the wire shape. Unknown throwables are bugs. */
export function toBenchError(error: unknown): BenchErrorShape {
  if (error instanceof BenchFault) return { kind: 'expected', code: error.code, message: error.message, where: error.where };
  if (isInputError(error)) return { kind: 'expected', code: 'input', message: error.message, where: error.where ?? null };
  const message = error instanceof Error ? error.message : String(error);
  return { kind: 'bug', code: 'internal', message: `internal error (a bug, please report it): ${message}`, where: null };
}

/** A zod failure as one readable line per problem: `field.path: what is wrong`. */
export function describeSchemaIssues(error: z.ZodError, prefix = ''): string {
  return error.issues
    .map((issue) => {
      const path = [prefix, ...issue.path.map(String)].filter((part) => part !== '').join('.');
      return path ? `${path}: ${issue.message}` : issue.message;
    })
    .join('; ');
}
