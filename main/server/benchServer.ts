/**
 * Browser mode and remote viewing: the bench contract over HTTP (`POST /api/call/<name>`, JSON in and out) and
 * one WebSocket for events (`/api/events`), plus the built screens as static files. Binds 127.0.0.1 unless told
 * otherwise. Every request needs this run's access token, and passes the address, Host and Origin checks of
 * access.ts first. Every payload goes through the contract's validating dispatch; the socket drops live frames
 * for a client that cannot keep up rather than queueing them.
 */
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { hostname, networkInterfaces } from 'node:os';
import { WebSocketServer, type WebSocket } from 'ws';
import { benchHttpPaths, isEventName, type CallOutcome } from '../../app/contract';
import type { BenchDispatch } from '../session/dispatch';
import type { BenchEventSource } from '../session/handlers';
import { createAccessToken, decideAccess, isLoopbackAddress, serverHostNames, tokenCookieName, type AccessPolicy } from './access';
import { readStaticFile, rendererContentSecurityPolicy } from './staticFiles';

export interface BenchServerOptions {
  dispatch: BenchDispatch;
  events: BenchEventSource;
  /** Default 127.0.0.1 (this computer only). */
  host?: string;
  /** Default 0 (any free port). */
  port?: number;
  /** This run's access token, which every request must carry. Default: a fresh random one. */
  token?: string;
  /** Serve source maps (`*.map`) with the screens: development only. Default false. */
  serveSourceMaps?: boolean;
  /** Folder of the built screens (dist/renderer); null serves the API only. */
  staticRoot?: string | null;
  /** Largest request body accepted (bytes). Default 4 MB (a board design or an inline capture label, never samples). */
  maxBodyBytes?: number;
  /** A client whose socket has more than this many bytes waiting gets no live frames until it drains. Default 1 MB. */
  maxBufferedBytes?: number;
}

export interface BenchServer {
  host: string;
  port: number;
  /** Address to open in a browser; it carries the access token. */
  url: string;
  token: string;
  close(): Promise<void>;
}

function sendJson(response: ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  response.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store', 'x-content-type-options': 'nosniff' });
  response.end(text);
}

function refuse(response: ServerResponse, status: number, reason: string): void {
  const outcome: CallOutcome<never> = { ok: false, error: { kind: 'expected', code: 'not-allowed', message: reason, where: null } };
  sendJson(response, status, outcome);
}

async function readBody(request: IncomingMessage, limit: number): Promise<string | null> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of request) {
    size += (chunk as Buffer).length;
    if (size > limit) return null;
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks).toString('utf8');
}

export async function startBenchServer(options: BenchServerOptions): Promise<BenchServer> {
  const host = options.host ?? '127.0.0.1';
  const token = options.token ?? createAccessToken();
  if (token.length < 16) throw new Error('an access token needs at least 16 characters');
  // Filled in once the server listens (the port and the bound address are known then); no request comes sooner.
  let policy: AccessPolicy = { token, loopbackOnly: true, hostNames: [], port: 0 };
  const maxBodyBytes = options.maxBodyBytes ?? 4 * 1024 * 1024;
  const maxBufferedBytes = options.maxBufferedBytes ?? 1024 * 1024;

  const handleCall = async (request: IncomingMessage, response: ServerResponse, call: string): Promise<void> => {
    if (request.method !== 'POST') return refuse(response, 405, 'bench calls are POST requests');
    // JSON only: a cross-site form cannot send it without a preflight this server never answers.
    if (!/^application\/json\b/i.test(request.headers['content-type'] ?? '')) return refuse(response, 415, 'bench calls carry JSON (content-type: application/json)');
    const text = await readBody(request, maxBodyBytes);
    if (text === null) return refuse(response, 413, `the request is larger than ${maxBodyBytes} bytes`);
    let payload: unknown;
    try {
      payload = text.trim() === '' ? {} : JSON.parse(text);
    } catch {
      const outcome: CallOutcome<never> = { ok: false, error: { kind: 'expected', code: 'invalid-payload', message: 'the request body is not JSON', where: call } };
      return sendJson(response, 400, outcome);
    }
    const outcome = await options.dispatch(call, payload);
    const status = outcome.ok ? 200 : outcome.error.kind === 'bug' ? 500 : outcome.error.code === 'unknown-call' ? 404 : 400;
    sendJson(response, status, outcome);
  };

  const handleStatic = async (request: IncomingMessage, response: ServerResponse, path: string, setCookie: boolean): Promise<void> => {
    if (request.method !== 'GET' && request.method !== 'HEAD') return refuse(response, 405, 'only GET for files');
    const file = options.staticRoot ? await readStaticFile(options.staticRoot, path, { sourceMaps: options.serveSourceMaps ?? false }) : null;
    if (!file) {
      response.writeHead(404, { 'content-type': 'text/plain; charset=utf-8' });
      response.end(options.staticRoot ? 'not found' : 'this bench server carries the API only (the screens are not built: npm run build)');
      return;
    }
    const headers: Record<string, string> = {
      'content-type': file.mediaType,
      'content-security-policy': rendererContentSecurityPolicy,
      'x-content-type-options': 'nosniff',
      'referrer-policy': 'no-referrer',
      'cache-control': 'no-cache',
    };
    if (setCookie) headers['set-cookie'] = `${tokenCookieName(policy.port)}=${encodeURIComponent(token)}; HttpOnly; SameSite=Strict; Path=/`;
    response.writeHead(200, headers);
    response.end(request.method === 'HEAD' ? undefined : file.body);
  };

  const server: Server = createServer((request, response) => {
    const decision = decideAccess({ remoteAddress: request.socket.remoteAddress, headers: request.headers, url: request.url ?? '/' }, policy);
    if (!decision.allowed) return refuse(response, decision.status, decision.reason);
    const path = new URL(request.url ?? '/', 'http://placeholder').pathname;
    const work = path.startsWith(benchHttpPaths.callPrefix)
      ? handleCall(request, response, path.slice(benchHttpPaths.callPrefix.length))
      : handleStatic(request, response, path, decision.viaQueryToken);
    work.catch((error: unknown) => {
      if (!response.headersSent) sendJson(response, 500, { ok: false, error: { kind: 'bug', code: 'internal', message: `internal error (a bug, please report it): ${error instanceof Error ? error.message : String(error)}`, where: null } });
      else response.destroy();
    });
  });

  const sockets = new WebSocketServer({ noServer: true, maxPayload: 64 * 1024 });
  server.on('upgrade', (request, socket, head) => {
    const decision = decideAccess({ remoteAddress: request.socket.remoteAddress, headers: request.headers, url: request.url ?? '/' }, policy);
    const path = new URL(request.url ?? '/', 'http://placeholder').pathname;
    if (!decision.allowed || path !== benchHttpPaths.events) {
      const status = !decision.allowed ? `${decision.status} ${decision.status === 401 ? 'Unauthorized' : 'Forbidden'}` : '404 Not Found';
      socket.end(`HTTP/1.1 ${status}\r\nConnection: close\r\nContent-Length: 0\r\n\r\n`);
      return;
    }
    sockets.handleUpgrade(request, socket, head, (client) => sockets.emit('connection', client, request));
  });

  const clients = new Set<WebSocket>();
  sockets.on('connection', (client: WebSocket) => {
    clients.add(client);
    client.on('close', () => clients.delete(client));
    client.on('error', () => clients.delete(client));
    // Events flow one way; anything a client sends is ignored.
  });

  const stopEvents = options.events.onEvent((event, data) => {
    if (!isEventName(event) || clients.size === 0) return;
    const text = JSON.stringify({ event, data });
    for (const client of clients) {
      if (client.readyState !== client.OPEN) continue;
      if (event === 'live' && client.bufferedAmount > maxBufferedBytes) continue;
      client.send(text);
    }
  });

  await new Promise<void>((resolveListen, rejectListen) => {
    server.once('error', rejectListen);
    server.listen(options.port ?? 0, host, () => {
      server.off('error', rejectListen);
      resolveListen();
    });
  });
  const address = server.address() as AddressInfo;
  const interfaceAddresses = Object.values(networkInterfaces()).flatMap((entries) => (entries ?? []).map((entry) => entry.address));
  policy = { token, loopbackOnly: isLoopbackAddress(address.address), hostNames: serverHostNames(address.address, { hostname: hostname(), interfaceAddresses }), port: address.port };
  const shownHost = address.family === 'IPv6' ? `[${address.address}]` : address.address;
  const url = `http://${shownHost}:${address.port}/?${benchHttpPaths.tokenQuery}=${encodeURIComponent(token)}`;

  return {
    host: address.address,
    port: address.port,
    url,
    token,
    close: async () => {
      stopEvents();
      for (const client of clients) client.terminate();
      sockets.close();
      const closed = new Promise<void>((resolveClose) => server.close(() => resolveClose()));
      server.closeAllConnections();
      await closed;
    },
  };
}
