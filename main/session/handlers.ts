/**
 * The bench service as the transports see it: one handler per contract call (payloads already validated) and a
 * source of contract events. The session service implements it once; IPC and HTTP/WebSocket carry it.
 */
import type { CallName, CallResult, EventData, EventName, ParsedPayload } from '../../app/contract';

export type BenchHandlers = {
  [Name in CallName]: (payload: ParsedPayload<Name>) => Promise<CallResult<Name>>;
};

export type BenchEventListener = <Name extends EventName>(event: Name, data: EventData<Name>) => void;

export interface BenchEventSource {
  /** Listen to every event; returns a function that stops listening. */
  onEvent(listener: BenchEventListener): () => void;
}

/** A small fan-out for contract events, shared by the service and tests. */
export function createBenchEventHub(): BenchEventSource & { emit: BenchEventListener; listenerCount(): number } {
  const listeners = new Set<BenchEventListener>();
  return {
    onEvent(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    emit(event, data) {
      for (const listener of [...listeners]) {
        try {
          listener(event, data);
        } catch {
          // A failing listener (a closed window, a dead socket) must not stop the others or the session.
        }
      }
    },
    listenerCount: () => listeners.size,
  };
}
