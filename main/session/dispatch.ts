/**
 * The single validated choke point between a transport and the service: the call name must be in the contract,
 * the payload must pass the call's schema, and whatever happens comes back as a serialised outcome
 * (expected fault or bug), never as a thrown object for the transport to mangle.
 */
import { benchCalls, parseCallName, parseCallPayload, toBenchError, describeSchemaIssues, type CallName, type CallOutcome } from '../../app/contract';
import type { BenchHandlers } from './handlers';

export type BenchDispatch = (call: unknown, payload: unknown) => Promise<CallOutcome<unknown>>;

export interface DispatchOptions {
  /** Check every result against the contract too (tests and development; a mismatch is a bug). */
  checkResults?: boolean;
  /** Told about bugs (not expected faults), e.g. to log them. */
  onBug?: (call: string, error: unknown) => void;
}

export function createBenchDispatch(handlers: BenchHandlers, options: DispatchOptions = {}): BenchDispatch {
  return async (call, payload) => {
    let name: CallName | null = null;
    try {
      name = parseCallName(call);
      const parsed = parseCallPayload(name, payload);
      const handler = handlers[name] as (payload: unknown) => Promise<unknown>;
      const result = await handler(parsed);
      if (options.checkResults) {
        const checked = benchCalls[name].result.safeParse(result);
        if (!checked.success) throw new Error(`the result of ${name} does not match the contract: ${describeSchemaIssues(checked.error)}`);
      }
      return { ok: true, result };
    } catch (error) {
      const shape = toBenchError(error);
      if (shape.kind === 'bug') options.onBug?.(name ?? String(call), error);
      return { ok: false, error: shape };
    }
  };
}
