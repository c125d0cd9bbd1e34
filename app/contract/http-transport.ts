/**
 * Browser mode's transport: calls as `POST /api/call/<name>` with a JSON payload, events over one WebSocket at
 * `/api/events`. `fetch` and `WebSocket` are passed in so this file stays pure (app/ has no DOM) and runs in
 * Node tests with the `ws` package. Where the server wants an access token (not loopback), it goes in the
 * `x-rampwright-token` header for calls and the `token` query parameter for the socket (browsers cannot set
 * headers on a WebSocket).
 */
import { callOutcomeSchema, type CallOutcome } from './errors';
import { isEventName, type EventName } from './bench-events';
import type { BenchTransport, Unsubscribe } from './client';

export const benchHttpPaths = {
  callPrefix: '/api/call/',
  events: '/api/events',
  tokenHeader: 'x-rampwright-token',
  tokenQuery: 'token',
} as const;

/** The parts of `fetch` this transport uses. */
export type FetchLike = (url: string, init: { method: string; headers: Record<string, string>; body: string }) => Promise<{ status: number; json(): Promise<unknown> }>;

/** The parts of a WebSocket this transport uses (browser WebSocket and the `ws` package both fit). */
export interface SocketLike {
  onmessage: ((message: { data: unknown }) => void) | null;
  onclose: ((...args: never[]) => void) | null;
  onerror: ((...args: never[]) => void) | null;
  close(): void;
}

export interface HttpTransportOptions {
  /** e.g. `http://127.0.0.1:5173`; empty for the page's own origin. */
  baseUrl: string;
  fetch: FetchLike;
  openSocket: (url: string) => SocketLike;
  token?: string | null;
  /** Wait before reopening a dropped event socket (ms). */
  reconnectDelayMs?: number;
  setTimer?: (callback: () => void, delayMs: number) => unknown;
}

/** The event socket's URL for a base URL (`http` -> `ws`, `https` -> `wss`). */
export function eventSocketUrl(baseUrl: string, token: string | null | undefined): string {
  const socketBase = baseUrl.replace(/^http/, 'ws');
  const query = token ? `?${benchHttpPaths.tokenQuery}=${encodeURIComponent(token)}` : '';
  return `${socketBase}${benchHttpPaths.events}${query}`;
}

export function createHttpTransport(options: HttpTransportOptions): BenchTransport {
  const handlers = new Map<EventName, Set<(data: unknown) => void>>();
  const reconnectDelayMs = options.reconnectDelayMs ?? 1000;
  // app/ compiles without DOM or Node timer types; every runtime it runs in has a global setTimeout.
  const globalTimer = (globalThis as unknown as { setTimeout: (callback: () => void, delayMs: number) => unknown }).setTimeout;
  const setTimer = options.setTimer ?? ((callback: () => void, delayMs: number) => globalTimer(callback, delayMs));
  let socket: SocketLike | null = null;

  const openEvents = (): void => {
    if (socket) return;
    const opened = options.openSocket(eventSocketUrl(options.baseUrl, options.token));
    socket = opened;
    opened.onmessage = (message) => {
      const text = typeof message.data === 'string' ? message.data : String(message.data);
      let parsed: unknown;
      try {
        parsed = JSON.parse(text);
      } catch {
        return; // A malformed event is dropped; the next frame replaces it.
      }
      if (typeof parsed !== 'object' || parsed === null) return;
      const { event, data } = parsed as { event?: unknown; data?: unknown };
      if (!isEventName(event)) return;
      for (const handler of handlers.get(event) ?? []) handler(data);
    };
    opened.onclose = () => {
      socket = null;
      if (totalHandlers() > 0) setTimer(openEvents, reconnectDelayMs);
    };
    opened.onerror = () => undefined;
  };

  const totalHandlers = (): number => [...handlers.values()].reduce((sum, set) => sum + set.size, 0);

  return {
    async invoke(call, payload): Promise<CallOutcome<unknown>> {
      const headers: Record<string, string> = { 'content-type': 'application/json' };
      if (options.token) headers[benchHttpPaths.tokenHeader] = options.token;
      let response: { status: number; json(): Promise<unknown> };
      try {
        response = await options.fetch(`${options.baseUrl}${benchHttpPaths.callPrefix}${call}`, { method: 'POST', headers, body: JSON.stringify(payload ?? {}) });
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        return { ok: false, error: { kind: 'expected', code: 'not-ready', message: `the bench service does not answer (${message})`, where: null } };
      }
      const body = await response.json().catch(() => null);
      const parsed = callOutcomeSchema.safeParse(body);
      if (parsed.success) return parsed.data;
      return { ok: false, error: { kind: 'bug', code: 'internal', message: `the bench service answered HTTP ${response.status} without a call outcome`, where: null } };
    },
    subscribe(event, handler): Unsubscribe {
      let set = handlers.get(event);
      if (!set) handlers.set(event, (set = new Set()));
      set.add(handler);
      openEvents();
      return () => {
        set.delete(handler);
        if (totalHandlers() === 0 && socket) {
          const closing = socket;
          socket = null;
          closing.onclose = null;
          closing.close();
        }
      };
    },
  };
}
