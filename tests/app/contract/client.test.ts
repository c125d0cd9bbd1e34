// The client builder: one method per call, outcomes unwrapped, errors rebuilt with their kind and code.
import { describe, expect, it } from 'vitest';
import { BenchCallError, BenchFault, callNames, createBenchClient, toBenchError, type BenchTransport, type CallOutcome } from '../../../app/contract';
import { InputError } from '../../../app/errors';

function recordingTransport(reply: (call: string, payload: unknown) => CallOutcome<unknown>) {
  const calls: Array<{ call: string; payload: unknown }> = [];
  const handlers = new Map<string, Array<(data: unknown) => void>>();
  const transport: BenchTransport = {
    invoke: async (call, payload) => {
      calls.push({ call, payload });
      return reply(call, payload);
    },
    subscribe: (event, handler) => {
      handlers.set(event, [...(handlers.get(event) ?? []), handler]);
      return () => handlers.set(event, (handlers.get(event) ?? []).filter((h) => h !== handler));
    },
  };
  return { transport, calls, handlers };
}

describe('createBenchClient', () => {
  it('has one method per contract call and passes the payload through unchanged', async () => {
    const { transport, calls } = recordingTransport((call) => ({ ok: true, result: { echoed: call } }));
    const client = createBenchClient(transport);
    for (const name of callNames) expect(typeof (client as unknown as Record<string, unknown>)[name]).toBe('function');
    const result = await client.getDesign({ name: 'Charger 24V half-wave' });
    expect(result).toEqual({ echoed: 'getDesign' });
    expect(calls).toEqual([{ call: 'getDesign', payload: { name: 'Charger 24V half-wave' } }]);
  });

  it('sends an empty object for calls without a payload', async () => {
    const { transport, calls } = recordingTransport(() => ({ ok: true, result: { ports: [] } }));
    await createBenchClient(transport).listPorts();
    expect(calls[0]).toEqual({ call: 'listPorts', payload: {} });
  });

  it('throws a BenchCallError that keeps kind, code and where of an error outcome', async () => {
    const { transport } = recordingTransport(() => ({ ok: false, error: { kind: 'expected', code: 'not-ready', message: 'no session is open', where: null } }));
    const failure = await createBenchClient(transport).stopSession({}).catch((error: unknown) => error);
    expect(failure).toBeInstanceOf(BenchCallError);
    expect(failure).toMatchObject({ kind: 'expected', code: 'not-ready', message: 'no session is open', expected: true });
  });

  it('treats a reply that is not an outcome as a bug, not as a result', async () => {
    const { transport } = recordingTransport(() => ({ weird: true }) as unknown as CallOutcome<unknown>);
    const failure = await createBenchClient(transport).benchState().catch((error: unknown) => error);
    expect(failure).toMatchObject({ kind: 'bug', code: 'internal' });
  });

  it('delivers subscribed events and stops after unsubscribe', () => {
    const { transport, handlers } = recordingTransport(() => ({ ok: true, result: null }));
    const client = createBenchClient(transport);
    const seen: string[] = [];
    const stop = client.subscribe('notice', (notice) => seen.push(notice.message));
    for (const handler of handlers.get('notice') ?? []) handler({ level: 'info', message: 'link reopened' });
    stop();
    for (const handler of handlers.get('notice') ?? []) handler({ level: 'info', message: 'after stop' });
    expect(seen).toEqual(['link reopened']);
  });
});

describe('toBenchError', () => {
  it('keeps expected faults as expected with their message and place', () => {
    expect(toBenchError(new BenchFault('not-found', 'no design named X', 'designName'))).toEqual({ kind: 'expected', code: 'not-found', message: 'designName: no design named X', where: 'designName' });
    expect(toBenchError(new InputError('ohm must be above 0', 'parts.rEmitter.ohm'))).toMatchObject({ kind: 'expected', code: 'input', where: 'parts.rEmitter.ohm' });
  });

  it('marks anything else as a bug', () => {
    expect(toBenchError(new TypeError('x is undefined'))).toMatchObject({ kind: 'bug', code: 'internal' });
    expect(toBenchError('a string')).toMatchObject({ kind: 'bug', code: 'internal' });
  });
});
