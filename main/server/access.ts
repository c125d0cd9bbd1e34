/**
 * Who may talk to the bench server. Every request needs this run's access token (a fresh one each start; the
 * address the server prints carries it), in every mode: on loopback the token keeps out other local processes
 * and other users of the same computer, who can all reach 127.0.0.1. The token is checked after, not instead of,
 * the rest:
 * - the client address must be loopback when the server binds loopback (its default);
 * - the Host header must name this server (a loopback name, the bound address, or this computer's own name and
 *   addresses when it serves another interface): a foreign name means DNS rebinding;
 * - forwarding headers must not name another computer (on loopback);
 * - a browser's Origin must be the server's own origin. `Origin: null` (a sandboxed frame, a local file page,
 *   some redirects) is refused: such a page could otherwise watch the bench through the event socket.
 */
import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { IncomingHttpHeaders } from 'node:http';
import { benchHttpPaths } from '../../app/contract';

/** Cookies ignore ports, so two bench servers on one computer each name their own cookie by port. */
export function tokenCookieName(port: number): string {
  return `rampwright_token_${port}`;
}

export interface AccessPolicy {
  /** This run's access token: every request must carry it. */
  token: string;
  /** Serve loopback clients only (the server binds a loopback address). */
  loopbackOnly: boolean;
  /** Host names (lower case, no port) a Host header may carry besides the loopback names. */
  hostNames: readonly string[];
  /** The port, for the cookie's name. */
  port: number;
}

export type AccessDecision = { allowed: true; viaQueryToken: boolean } | { allowed: false; status: 401 | 403; reason: string };

export interface RequestFacts {
  remoteAddress: string | undefined;
  headers: IncomingHttpHeaders;
  /** Path and query as sent, e.g. `/api/events?token=...`. */
  url: string;
}

/** 127.0.0.0/8, ::1 and the IPv4-mapped form of 127/8 (RFC 1122 3.2.1.3; RFC 4291 2.5.3 and 2.5.5.2). */
export function isLoopbackAddress(address: string | undefined): boolean {
  if (!address) return false;
  const plain = address.replace(/^\[|\]$/g, '').toLowerCase();
  if (plain === '::1' || plain === '0:0:0:0:0:0:0:1') return true;
  const v4 = plain.startsWith('::ffff:') ? plain.slice(7) : plain;
  const parts = v4.split('.');
  return parts.length === 4 && parts[0] === '127' && parts.every((part) => /^\d{1,3}$/.test(part) && Number(part) <= 255);
}

/** The host part of a Host header or URL authority: `127.0.0.1:5173` -> `127.0.0.1`, `[::1]:80` -> `::1`. */
export function hostOfAuthority(authority: string): string {
  const trimmed = authority.trim().toLowerCase();
  if (trimmed.startsWith('[')) return trimmed.slice(1, trimmed.indexOf(']') > 0 ? trimmed.indexOf(']') : undefined);
  const colon = trimmed.lastIndexOf(':');
  return colon > 0 && trimmed.indexOf(':') === colon ? trimmed.slice(0, colon) : trimmed;
}

export function isLoopbackHostName(host: string): boolean {
  return host === 'localhost' || host.endsWith('.localhost') || isLoopbackAddress(host);
}

/**
 * The names a Host header may carry for a server bound to `boundAddress`, besides the loopback names: the
 * address itself and, when it is not loopback, this computer's name (bare, first label, `.local`) and, for a
 * wildcard bind (0.0.0.0, ::), every address of its interfaces.
 */
export function serverHostNames(boundAddress: string, computer: { hostname: string; interfaceAddresses: readonly string[] }): string[] {
  const bound = boundAddress.replace(/^\[|\]$/g, '').toLowerCase();
  if (isLoopbackAddress(bound) || bound === 'localhost') return [bound];
  const name = computer.hostname.toLowerCase();
  const firstLabel = name.split('.')[0];
  const names = [bound, name, firstLabel, `${firstLabel}.local`];
  if (bound === '0.0.0.0' || bound === '::') names.push(...computer.interfaceAddresses.map((address) => address.toLowerCase()));
  return [...new Set(names.filter(Boolean))];
}

/** Client addresses named by X-Forwarded-For, X-Real-IP and Forwarded (RFC 7239) headers. */
export function forwardedAddresses(headers: IncomingHttpHeaders): string[] {
  const found: string[] = [];
  const add = (value: string | string[] | undefined, split: (text: string) => string[]) => {
    for (const text of Array.isArray(value) ? value : value ? [value] : []) found.push(...split(text));
  };
  add(headers['x-forwarded-for'], (text) => text.split(',').map((part) => part.trim()).filter(Boolean));
  add(headers['x-real-ip'], (text) => [text.trim()]);
  add(headers.forwarded, (text) =>
    [...text.matchAll(/for=("?)([^;,"]+)\1/gi)].map((match) => {
      const value = match[2].trim();
      return value.startsWith('[') ? value.slice(1, value.indexOf(']')) : value.replace(/:\d+$/, '');
    }),
  );
  return found;
}

export function tokensEqual(given: string, expected: string): boolean {
  const a = Buffer.from(given);
  const b = Buffer.from(expected);
  return a.length === b.length && timingSafeEqual(a, b);
}

/** A fresh access token: 24 random bytes, URL-safe. */
export function createAccessToken(): string {
  return randomBytes(24).toString('base64url');
}

function presentedTokens(facts: RequestFacts, port: number): { tokens: string[]; queryToken: boolean } {
  const tokens: string[] = [];
  const header = facts.headers[benchHttpPaths.tokenHeader];
  if (typeof header === 'string') tokens.push(header);
  const authorization = facts.headers.authorization;
  if (typeof authorization === 'string' && /^bearer /i.test(authorization)) tokens.push(authorization.slice(7).trim());
  const cookie = facts.headers.cookie;
  const cookieName = tokenCookieName(port);
  if (typeof cookie === 'string') {
    for (const part of cookie.split(';')) {
      const [name, ...rest] = part.trim().split('=');
      if (name !== cookieName) continue;
      try {
        tokens.push(decodeURIComponent(rest.join('=')));
      } catch {
        // A cookie that is not URL-encoded cannot be the token.
      }
    }
  }
  let query: string | null = null;
  try {
    query = new URL(facts.url, 'http://placeholder').searchParams.get(benchHttpPaths.tokenQuery);
  } catch {
    query = null;
  }
  if (query !== null) tokens.push(query);
  return { tokens, queryToken: query !== null };
}

function refused(status: 401 | 403, reason: string): AccessDecision {
  return { allowed: false, status, reason };
}

/** The Origin header's verdict: absent (not a browser page) passes; it must be the server's own origin. */
function originProblem(origin: string | string[] | undefined, host: string): string | null {
  if (origin === undefined) return null;
  if (typeof origin !== 'string') return 'the request carries more than one Origin';
  if (origin.trim().toLowerCase() === 'null') return 'the request comes from a page with no origin (a sandboxed frame or a local file), which may not use the bench';
  let originAuthority: string;
  try {
    const parsed = new URL(origin);
    if (parsed.protocol !== 'http:' && parsed.protocol !== 'https:') return 'the request comes from a page of another site';
    originAuthority = parsed.host.toLowerCase();
  } catch {
    return 'the request carries an Origin that is not an address';
  }
  // Browsers drop the default port from both; compare the authorities as sent.
  return originAuthority === host.trim().toLowerCase() ? null : 'the request comes from a page of another site';
}

export function decideAccess(facts: RequestFacts, policy: AccessPolicy): AccessDecision {
  if (policy.loopbackOnly && !isLoopbackAddress(facts.remoteAddress)) {
    return refused(403, 'this bench server serves this computer only (start it with --host to share it)');
  }
  const host = facts.headers.host;
  if (typeof host !== 'string') return refused(403, 'the request names no host');
  const hostName = hostOfAuthority(host);
  if (!isLoopbackHostName(hostName) && !policy.hostNames.includes(hostName)) return refused(403, 'the request names a host other than this bench server');
  if (policy.loopbackOnly) {
    const forwarded = forwardedAddresses(facts.headers).filter((address) => !isLoopbackAddress(address));
    if (forwarded.length > 0) return refused(403, 'the request was forwarded from another computer');
  }
  const originFault = originProblem(facts.headers.origin, host);
  if (originFault) return refused(403, originFault);
  const { tokens, queryToken } = presentedTokens(facts, policy.port);
  if (tokens.some((token) => tokensEqual(token, policy.token))) return { allowed: true, viaQueryToken: queryToken };
  return refused(401, 'this bench server wants the access token of this run: open the address it printed where it was started');
}
