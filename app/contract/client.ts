/**
 * What the screens get: a `BenchClient` with one method per call and `subscribe` for events. Both transports
 * (Electron IPC through the preload bridge, HTTP + WebSocket in browser mode) build it from the same pair:
 * `invoke(call, payload)` returning a serialised outcome, and `subscribe(event, handler)`.
 */
import { BenchCallError, callOutcomeSchema, type CallOutcome } from './errors';
import { callNames, type CallName, type CallPayload, type CallResult } from './calls';
import type { EventData, EventName } from './bench-events';

export type Unsubscribe = () => void;

export interface BenchTransport {
  invoke(call: CallName, payload: unknown): Promise<CallOutcome<unknown>>;
  subscribe(event: EventName, handler: (data: unknown) => void): Unsubscribe;
}

export type BenchCallMethods = {
  [Name in CallName]: {} extends CallPayload<Name>
    ? (payload?: CallPayload<Name>) => Promise<CallResult<Name>>
    : (payload: CallPayload<Name>) => Promise<CallResult<Name>>;
};

export type BenchClient = BenchCallMethods & {
  subscribe<Name extends EventName>(event: Name, handler: (data: EventData<Name>) => void): Unsubscribe;
};

/** Unwraps an outcome; an error outcome becomes a thrown `BenchCallError` (expected or bug, with its code). */
export function unwrapOutcome<Result>(outcome: unknown): Result {
  const parsed = callOutcomeSchema.safeParse(outcome);
  if (!parsed.success) {
    throw new BenchCallError({ kind: 'bug', code: 'internal', message: 'the bench service sent a reply that is not a call outcome', where: null });
  }
  if (!parsed.data.ok) throw new BenchCallError(parsed.data.error);
  return parsed.data.result as Result;
}

export function createBenchClient(transport: BenchTransport): BenchClient {
  const methods: Record<string, (payload?: unknown) => Promise<unknown>> = {};
  for (const name of callNames) {
    methods[name] = async (payload?: unknown) => unwrapOutcome(await transport.invoke(name, payload ?? {}));
  }
  const subscribe = <Name extends EventName>(event: Name, handler: (data: EventData<Name>) => void): Unsubscribe =>
    transport.subscribe(event, (data) => handler(data as EventData<Name>));
  return { ...methods, subscribe } as unknown as BenchClient;
}

/**
 * The preload bridge (Electron): one function per call returning an outcome, plus `subscribe`.
 * This turns it back into a transport, so the renderer builds its client the same way in both modes.
 */
export type BenchBridge = { [Name in CallName]: (payload: unknown) => Promise<CallOutcome<unknown>> } & {
  subscribe(event: EventName, handler: (data: unknown) => void): Unsubscribe;
};

export function bridgeTransport(bridge: BenchBridge): BenchTransport {
  return {
    invoke: (call, payload) => bridge[call](payload),
    subscribe: (event, handler) => bridge.subscribe(event, handler),
  };
}
