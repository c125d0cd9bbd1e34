/**
 * Who may talk to the bench server. Loopback mode (the default) serves only this machine: the client address,
 * the Host header (against DNS rebinding) and any forwarding header must all be loopback, and a cross-site
 * Origin is refused. Token mode (serving on another interface, chosen explicitly) wants the access token on
 * every request: header, query parameter, or the cookie the server sets when the page is opened with the token.
 */
import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { IncomingHttpHeaders } from 'node:http';
import { benchHttpPaths } from '../../app/contract';

export const tokenCookieName = 'rampwright_token';

export type AccessPolicy = { mode: 'loopback' } | { mode: 'token'; token: string };

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

function presentedTokens(facts: RequestFacts): { tokens: string[]; queryToken: boolean } {
  const tokens: string[] = [];
  const header = facts.headers[benchHttpPaths.tokenHeader];
  if (typeof header === 'string') tokens.push(header);
  const authorization = facts.headers.authorization;
  if (typeof authorization === 'string' && /^bearer /i.test(authorization)) tokens.push(authorization.slice(7).trim());
  const cookie = facts.headers.cookie;
  if (typeof cookie === 'string') {
    for (const part of cookie.split(';')) {
      const [name, ...rest] = part.trim().split('=');
      if (name === tokenCookieName) tokens.push(decodeURIComponent(rest.join('=')));
    }
  }
  const query = new URL(facts.url, 'http://placeholder').searchParams.get(benchHttpPaths.tokenQuery);
  if (query !== null) tokens.push(query);
  return { tokens, queryToken: query !== null };
}

export function decideAccess(facts: RequestFacts, policy: AccessPolicy): AccessDecision {
  if (policy.mode === 'token') {
    const { tokens, queryToken } = presentedTokens(facts);
    if (tokens.some((token) => tokensEqual(token, policy.token))) return { allowed: true, viaQueryToken: queryToken };
    return { allowed: false, status: 401, reason: 'this bench server wants its access token (printed where it was started)' };
  }
  if (!isLoopbackAddress(facts.remoteAddress)) return { allowed: false, status: 403, reason: 'this bench server serves this computer only (start it with --host and --token-required to share it)' };
  const host = facts.headers.host;
  if (typeof host !== 'string' || !isLoopbackHostName(hostOfAuthority(host))) {
    return { allowed: false, status: 403, reason: 'the request names a host other than this computer' };
  }
  const forwarded = forwardedAddresses(facts.headers).filter((address) => !isLoopbackAddress(address));
  if (forwarded.length > 0) return { allowed: false, status: 403, reason: 'the request was forwarded from another computer' };
  const origin = facts.headers.origin;
  if (typeof origin === 'string' && origin !== 'null') {
    let originHost = '';
    try {
      originHost = new URL(origin).hostname;
    } catch {
      originHost = '';
    }
    if (!isLoopbackHostName(hostOfAuthority(originHost))) return { allowed: false, status: 403, reason: 'the request comes from a page of another site' };
  }
  return { allowed: true, viaQueryToken: false };
}
