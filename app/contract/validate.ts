/**
 * The one choke point every transport passes a payload through: unknown call names and malformed payloads become
 * expected errors with a message naming the field, before anything reaches the session service.
 */
import { benchCalls, isCallName, type CallName, type ParsedPayload } from './calls';
import { BenchFault, describeSchemaIssues } from './errors';

export function parseCallName(name: unknown): CallName {
  if (!isCallName(name)) throw new BenchFault('unknown-call', `there is no bench call named ${JSON.stringify(String(name)).slice(0, 80)}`);
  return name;
}

export function parseCallPayload<Name extends CallName>(name: Name, payload: unknown): ParsedPayload<Name> {
  const parsed = benchCalls[name].payload.safeParse(payload ?? {});
  if (!parsed.success) throw new BenchFault('invalid-payload', describeSchemaIssues(parsed.error), name);
  return parsed.data as ParsedPayload<Name>;
}
