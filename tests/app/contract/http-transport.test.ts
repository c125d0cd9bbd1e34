// Browser mode's transport with fetch and the socket passed in: token placement, event routing, reconnects,
// and failures turned into outcomes rather than thrown objects.
import { describe, expect, it } from 'vitest';
import { createBenchClient, createHttpTransport, eventSocketUrl, type SocketLike } from '../../../app/contract';

class RecordingSocket implements SocketLike {
  onmessage: ((message: { data: unknown }) => void) | null = null;
  onclose: (() => void) | null = null;
  onerror: (() => void) | null = null;
  closed = false;
  constructor(readonly url: string) {}
  close() {
    this.closed = true;
  }
}

function harness(reply: (url: string, init: { headers: Record<string, string>; body: string }) => { status: number; body: unknown } | Error) {
  const sockets: RecordingSocket[] = [];
  const timers: Array<() => void> = [];
  const requests: Array<{ url: string; headers: Record<string, string>; body: string }> = [];
  const transport = createHttpTransport({
    baseUrl: 'http://127.0.0.2:4870',
    token: 'k/9 q',
    fetch: async (url, init) => {
      requests.push({ url, headers: init.headers, body: init.body });
      const answer = reply(url, init);
      if (answer instanceof Error) throw answer;
      return { status: answer.status, json: async () => answer.body };
    },
    openSocket: (url) => {
      const socket = new RecordingSocket(url);
      sockets.push(socket);
      return socket;
    },
    setTimer: (callback) => timers.push(callback),
  });
  return { transport, sockets, timers, requests };
}

describe('createHttpTransport', () => {
  it('posts the payload as JSON to the call path with the token header', async () => {
    const { transport, requests } = harness(() => ({ status: 200, body: { ok: true, result: { held: true } } }));
    const client = createBenchClient(transport);
    await expect(client.setHold({ held: true })).resolves.toEqual({ held: true });
    expect(requests).toEqual([{ url: 'http://127.0.0.2:4870/api/call/setHold', headers: { 'content-type': 'application/json', 'x-rampwright-token': 'k/9 q' }, body: '{"held":true}' }]);
  });

  it('puts the token in the socket URL, escaped, since browsers cannot set socket headers', () => {
    expect(eventSocketUrl('http://127.0.0.2:4870', 'k/9 q')).toBe('ws://127.0.0.2:4870/api/events?token=k%2F9%20q');
    expect(eventSocketUrl('https://bench.example', null)).toBe('wss://bench.example/api/events');
  });

  it('turns a service that does not answer into an expected error, and a non-outcome reply into a bug', async () => {
    const down = harness(() => new Error('connect ECONNREFUSED'));
    const refused = await createBenchClient(down.transport).benchState().catch((error: unknown) => error);
    expect(refused).toMatchObject({ kind: 'expected', code: 'not-ready' });
    expect(String((refused as Error).message)).toContain('ECONNREFUSED');
    const odd = harness(() => ({ status: 502, body: '<html>bad gateway</html>' }));
    expect(await createBenchClient(odd.transport).benchState().catch((error: unknown) => error)).toMatchObject({ kind: 'bug', code: 'internal' });
  });

  it('routes events by name over one socket, ignores malformed ones, reopens after a drop, closes when nobody listens', () => {
    const { transport, sockets, timers } = harness(() => ({ status: 200, body: { ok: true, result: null } }));
    const notices: unknown[] = [];
    const health: unknown[] = [];
    const stopNotice = transport.subscribe('notice', (data) => notices.push(data));
    const stopHealth = transport.subscribe('health', (data) => health.push(data));
    expect(sockets).toHaveLength(1);
    const socket = sockets[0];
    socket.onmessage!({ data: JSON.stringify({ event: 'notice', data: { level: 'info', message: 'one' } }) });
    socket.onmessage!({ data: '{broken' });
    socket.onmessage!({ data: JSON.stringify({ event: 'unknown-event', data: 1 }) });
    socket.onmessage!({ data: JSON.stringify({ event: 'health', data: { state: 'streaming' } }) });
    expect(notices).toEqual([{ level: 'info', message: 'one' }]);
    expect(health).toEqual([{ state: 'streaming' }]);

    socket.onclose!();
    expect(timers).toHaveLength(1);
    timers[0]();
    expect(sockets).toHaveLength(2);
    stopNotice();
    expect(sockets[1].closed).toBe(false);
    stopHealth();
    expect(sockets[1].closed).toBe(true);
  });
});
