// The bench server over a real bench (logbook, virtual board): the contract over HTTP and WebSocket, this run's
// token required on loopback too, refusals of foreign hosts, origins (Origin: null included) and forwarded
// requests, payload validation, and the screens as static files without their source maps.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WebSocket } from 'ws';
import { createBenchClient, createHttpTransport, type FetchLike, type SocketLike } from '../../../app/contract';
import { openBenchContext, type BenchContext } from '../../../main/session/benchContext';
import { demoDefaults } from '../../../main/session/commissioningDemo';
import { startBenchServer, type BenchServer } from '../../../main/server/benchServer';

interface RawReply {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
}

/** A raw HTTP request, so Host and forwarding headers can be set as an outside client would. */
function raw(server: BenchServer, path: string, options: { method?: string; headers?: Record<string, string>; body?: string } = {}): Promise<RawReply> {
  return new Promise((resolve, reject) => {
    const outgoing = request({ host: server.host, port: server.port, path, method: options.method ?? 'GET', headers: options.headers }, (incoming) => {
      let body = '';
      incoming.setEncoding('utf8');
      incoming.on('data', (chunk: string) => (body += chunk));
      incoming.on('end', () => resolve({ status: incoming.statusCode ?? 0, headers: incoming.headers, body }));
    });
    outgoing.on('error', reject);
    outgoing.end(options.body);
  });
}

/** Opens the event socket; resolves 'open' or the HTTP status of a refused upgrade. */
function tryUpgrade(url: string, headers: Record<string, string> = {}): Promise<'open' | number> {
  return new Promise((resolve) => {
    const socket = new WebSocket(url, { headers });
    socket.on('open', () => {
      socket.close();
      resolve('open');
    });
    socket.on('unexpected-response', (_request, response) => resolve(response.statusCode ?? 0));
    socket.on('error', () => resolve(0));
  });
}

const nodeFetch: FetchLike = (url, init) => fetch(url, init);
const openSocket = (url: string) => new WebSocket(url) as unknown as SocketLike;

let folder = '';
let context: BenchContext;
let loopback: BenchServer;
let shared: BenchServer;
const token = 'test-token-3f9a-shared-bench';
const loopbackToken = 'test-token-71c2-this-computer';

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-server-'));
  const screens = join(folder, 'renderer');
  mkdirSync(screens);
  writeFileSync(join(screens, 'index.html'), '<!doctype html><title>Rampwright</title>');
  writeFileSync(join(screens, 'index.js.map'), '{"version":3,"sources":["renderer/index.ts"]}');
  writeFileSync(join(folder, 'secret.txt'), 'not for the browser');
  context = await openBenchContext({ logbookPath: join(folder, 'logbook.sqlite'), virtualPaced: false });
  loopback = await startBenchServer({ dispatch: context.dispatch, events: context.service.events, staticRoot: screens, token: loopbackToken });
  // The "other interface": a second loopback address in 127.0.0.0/8.
  shared = await startBenchServer({ dispatch: context.dispatch, events: context.service.events, host: '127.0.0.2', token, staticRoot: screens });
});

afterAll(async () => {
  await loopback.close();
  await shared.close();
  await context.close();
  rmSync(folder, { recursive: true, force: true });
});

const withToken = { 'x-rampwright-token': loopbackToken };
const jsonCall = { method: 'POST', headers: { 'content-type': 'application/json', ...withToken }, body: '{}' };
const eventsUrl = () => `ws://127.0.0.1:${loopback.port}/api/events?token=${loopbackToken}`;

describe('bench server on loopback', () => {
  it('binds 127.0.0.1 by default and prints an address carrying this run\'s token', async () => {
    expect(loopback.host).toBe('127.0.0.1');
    expect(loopback.url).toBe(`http://127.0.0.1:${loopback.port}/?token=${loopbackToken}`);
    const fresh = await startBenchServer({ dispatch: context.dispatch, events: context.service.events, staticRoot: null });
    try {
      expect(fresh.token).toMatch(/^[A-Za-z0-9_-]{32}$/);
      expect(fresh.token).not.toBe(loopbackToken);
      expect(fresh.url).toContain(`?token=${fresh.token}`);
    } finally {
      await fresh.close();
    }
  });

  it('carries the contract: a client over HTTP gets results, and events over the socket', async () => {
    const client = createBenchClient(createHttpTransport({ baseUrl: `http://127.0.0.1:${loopback.port}`, fetch: nodeFetch, openSocket, token: loopbackToken }));
    const designs = await client.listDesigns();
    expect(designs.designs.map((design) => design.name)).toContain(demoDefaults.designName);
    const notices: string[] = [];
    const healthStates: string[] = [];
    client.subscribe('notice', (notice) => notices.push(notice.message));
    const stop = client.subscribe('health', (health) => healthStates.push(health.state));
    await new Promise((resolve) => setTimeout(resolve, 200)); // let the socket open before events flow
    await client.connect({ kind: 'virtual', designName: demoDefaults.designName, faults: [] });
    context.service.virtual()!.pump(0.5);
    context.service.emit('notice', { level: 'info', message: 'hello from the bench' });
    await expect.poll(() => notices, { timeout: 5000 }).toContain('hello from the bench');
    expect(healthStates).toContain('streaming');
    stop();
    await client.disconnect();
  });

  it('refuses any local process without the token: calls, files and the event socket', async () => {
    const bare = await raw(loopback, '/api/call/benchState', { ...jsonCall, headers: { 'content-type': 'application/json' } });
    expect(bare.status).toBe(401);
    expect(JSON.parse(bare.body)).toMatchObject({ ok: false, error: { code: 'not-allowed', message: expect.stringMatching(/access token/) } });
    expect((await raw(loopback, '/api/call/startSession', { ...jsonCall, headers: { 'content-type': 'application/json', 'x-rampwright-token': 'guess' } })).status).toBe(401);
    expect((await raw(loopback, '/')).status).toBe(401);
    expect(await tryUpgrade(`ws://127.0.0.1:${loopback.port}/api/events`)).toBe(401);
  });

  it('refuses the event socket to a page with Origin: null (sandboxed frame, local file) even with the token', async () => {
    expect(await tryUpgrade(eventsUrl(), { origin: 'null' })).toBe(403);
    expect(await tryUpgrade(eventsUrl(), { origin: 'https://attacker.example' })).toBe(403);
    expect(await tryUpgrade(eventsUrl(), { origin: `http://127.0.0.1:${loopback.port}` })).toBe('open');
    expect((await raw(loopback, '/api/call/benchState', { ...jsonCall, headers: { ...jsonCall.headers, origin: 'null' } })).status).toBe(403);
  });

  it('refuses a request naming another host (DNS rebinding) and one forwarded from another computer, token or not', async () => {
    expect((await raw(loopback, '/api/call/benchState', jsonCall)).status).toBe(200);
    const rebound = await raw(loopback, '/api/call/benchState', { ...jsonCall, headers: { ...jsonCall.headers, host: 'bench.attacker.example' } });
    expect(rebound.status).toBe(403);
    expect(JSON.parse(rebound.body)).toMatchObject({ ok: false, error: { code: 'not-allowed' } });
    const forwarded = await raw(loopback, '/api/call/benchState', { ...jsonCall, headers: { ...jsonCall.headers, 'x-forwarded-for': '203.0.113.7' } });
    expect(forwarded.status).toBe(403);
    const crossSite = await raw(loopback, '/api/call/benchState', { ...jsonCall, headers: { ...jsonCall.headers, origin: 'https://attacker.example' } });
    expect(crossSite.status).toBe(403);
    expect(await tryUpgrade(eventsUrl(), { 'x-forwarded-for': '203.0.113.7' })).toBe(403);
    expect(await tryUpgrade(eventsUrl())).toBe('open');
  });

  it('validates payloads and names: 400 with the field, 404 for an unknown call, 415 for a form post', async () => {
    const json = { 'content-type': 'application/json', ...withToken };
    const bad = await raw(loopback, '/api/call/sessionDetail', { method: 'POST', headers: json, body: '{"sessionId":"seven"}' });
    expect(bad.status).toBe(400);
    const outcome = JSON.parse(bad.body) as { ok: boolean; error: { code: string; message: string } };
    expect(outcome.error.code).toBe('invalid-payload');
    expect(outcome.error.message).toContain('sessionId');
    expect((await raw(loopback, '/api/call/sessionDetail', { method: 'POST', headers: json, body: '{not json' })).status).toBe(400);
    expect((await raw(loopback, '/api/call/dropTables', { method: 'POST', headers: json, body: '{}' })).status).toBe(404);
    expect((await raw(loopback, '/api/call/benchState', { method: 'POST', headers: { ...json, 'content-type': 'text/plain' }, body: '{}' })).status).toBe(415);
    expect((await raw(loopback, '/api/call/benchState', { headers: withToken })).status).toBe(405);
  });

  it('serves the screens with a strict CSP, sets the token cookie, and serves nothing outside their folder nor a source map', async () => {
    const page = await raw(loopback, `/?token=${loopbackToken}`);
    expect(page.status).toBe(200);
    expect(page.body).toContain('<title>Rampwright</title>');
    expect(String(page.headers['content-security-policy'])).toContain("script-src 'self'");
    const cookie = String(page.headers['set-cookie']).split(';')[0];
    expect(cookie).toBe(`rampwright_token_${loopback.port}=${loopbackToken}`);
    expect((await raw(loopback, '/index.html', { headers: { cookie } })).status).toBe(200);
    expect((await raw(loopback, '/index.js.map', { headers: withToken })).status).toBe(404);
    expect((await raw(loopback, '/../secret.txt', { headers: withToken })).status).toBe(404);
    expect((await raw(loopback, '/%2e%2e/secret.txt', { headers: withToken })).status).toBe(404);
    expect((await raw(loopback, '/nothing-here.js', { headers: withToken })).status).toBe(404);
  });
});

describe('bench server on another interface', () => {
  it('refuses calls, files and the event socket without the token', async () => {
    expect(shared.host).toBe('127.0.0.2');
    expect(shared.url).toContain(`token=${token}`);
    const call = { method: 'POST', headers: { 'content-type': 'application/json', host: `127.0.0.2:${shared.port}` }, body: '{}' };
    expect((await raw(shared, '/api/call/benchState', call)).status).toBe(401);
    expect((await raw(shared, '/api/call/benchState', { ...call, headers: { ...call.headers, 'x-rampwright-token': 'wrong' } })).status).toBe(401);
    expect((await raw(shared, '/')).status).toBe(401);
    expect(await tryUpgrade(`ws://127.0.0.2:${shared.port}/api/events`)).toBe(401);
  });

  it('serves a client that has the token, and sets the cookie for the page opened with it', async () => {
    const client = createBenchClient(createHttpTransport({ baseUrl: `http://127.0.0.2:${shared.port}`, fetch: nodeFetch, openSocket, token }));
    const state = await client.benchState();
    expect(state.session).toBeNull();
    expect(await tryUpgrade(`ws://127.0.0.2:${shared.port}/api/events?token=${token}`)).toBe('open');
    const page = await raw(shared, `/?token=${token}`);
    expect(page.status).toBe(200);
    const cookie = String(page.headers['set-cookie']);
    expect(cookie).toContain(`rampwright_token_${shared.port}=${token}`);
    expect(cookie).toContain('HttpOnly');
    expect((await raw(shared, '/index.html', { headers: { cookie: cookie.split(';')[0] } })).status).toBe(200);
  });

  it('keeps the Host and Origin checks with the right token', async () => {
    const call = { method: 'POST', headers: { 'content-type': 'application/json', 'x-rampwright-token': token }, body: '{}' };
    expect((await raw(shared, '/api/call/benchState', call)).status).toBe(200);
    expect((await raw(shared, '/api/call/benchState', { ...call, headers: { ...call.headers, host: 'rebound.attacker.example' } })).status).toBe(403);
    expect((await raw(shared, '/api/call/benchState', { ...call, headers: { ...call.headers, origin: 'null' } })).status).toBe(403);
    expect(await tryUpgrade(`ws://127.0.0.2:${shared.port}/api/events?token=${token}`, { origin: 'null' })).toBe(403);
  });
});
