/**
 * The screens get one `BenchClient` and never know how it travels: inside the desktop shell the preload bridge
 * is at `window.rampwright`; in browser mode the page talks to the server it was loaded from (HTTP calls and
 * one WebSocket for events). An access token in the page's address (`?token=`) is passed on.
 */
import { bridgeTransport, createBenchClient, createHttpTransport, type BenchBridge, type BenchClient, type SocketLike } from '../../app/contract/index';

declare global {
  interface Window {
    rampwright?: BenchBridge;
  }
}

export function connectClient(): BenchClient {
  if (window.rampwright) return createBenchClient(bridgeTransport(window.rampwright));
  const token = new URLSearchParams(window.location.search).get('token');
  return createBenchClient(
    createHttpTransport({
      baseUrl: window.location.origin,
      token,
      fetch: (url, init) => window.fetch(url, init),
      openSocket: (url) => new WebSocket(url) as unknown as SocketLike,
    }),
  );
}
