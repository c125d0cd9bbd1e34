// Who may talk to the bench server: loopback by address, Host and forwarding headers; a token in token mode.
import { describe, expect, it } from 'vitest';
import { decideAccess, forwardedAddresses, hostOfAuthority, isLoopbackAddress, tokensEqual } from '../../../main/server/access';

describe('isLoopbackAddress', () => {
  it('knows 127.0.0.0/8 and ::1 (RFC 1122 3.2.1.3, RFC 4291 2.5.3) including the IPv4-mapped form', () => {
    for (const address of ['127.0.0.1', '127.0.0.2', '127.255.255.254', '::1', '::ffff:127.0.0.1', '[::1]']) expect(isLoopbackAddress(address)).toBe(true);
  });
  it('refuses everything else', () => {
    for (const address of ['10.0.0.5', '192.168.1.20', '0.0.0.0', '::', '::ffff:10.0.0.1', '128.0.0.1', '127.0.0', '127.0.0.256', 'localhost', '', undefined]) {
      expect(isLoopbackAddress(address)).toBe(false);
    }
  });
});

describe('headers', () => {
  it('reads the host part of an authority', () => {
    expect(hostOfAuthority('127.0.0.1:5173')).toBe('127.0.0.1');
    expect(hostOfAuthority('[::1]:8080')).toBe('::1');
    expect(hostOfAuthority('Bench.Example:80')).toBe('bench.example');
  });
  it('collects forwarded client addresses from X-Forwarded-For, X-Real-IP and Forwarded (RFC 7239)', () => {
    expect(forwardedAddresses({ 'x-forwarded-for': '203.0.113.7, 127.0.0.1', 'x-real-ip': '198.51.100.2', forwarded: 'for=192.0.2.60;proto=http, for="[2001:db8::1]:4711"' })).toEqual([
      '203.0.113.7',
      '127.0.0.1',
      '198.51.100.2',
      '192.0.2.60',
      '2001:db8::1',
    ]);
  });
  it('compares tokens of different lengths without throwing', () => {
    expect(tokensEqual('abc', 'abc')).toBe(true);
    expect(tokensEqual('abc', 'abcd')).toBe(false);
  });
});

describe('decideAccess, loopback mode', () => {
  const loopback = { mode: 'loopback' } as const;
  const local = { remoteAddress: '127.0.0.1', headers: { host: '127.0.0.1:5173' }, url: '/' };

  it('serves this computer', () => {
    expect(decideAccess(local, loopback).allowed).toBe(true);
    expect(decideAccess({ ...local, headers: { host: 'localhost:5173', origin: 'http://localhost:5173' } }, loopback).allowed).toBe(true);
  });
  it('refuses another client address', () => {
    expect(decideAccess({ ...local, remoteAddress: '192.168.1.20' }, loopback)).toMatchObject({ allowed: false, status: 403 });
  });
  it('refuses a Host naming another computer (DNS rebinding)', () => {
    expect(decideAccess({ ...local, headers: { host: 'bench.attacker.example:5173' } }, loopback)).toMatchObject({ allowed: false, status: 403 });
    expect(decideAccess({ ...local, headers: {} }, loopback).allowed).toBe(false);
  });
  it('refuses a request forwarded from another computer', () => {
    expect(decideAccess({ ...local, headers: { host: '127.0.0.1:5173', 'x-forwarded-for': '203.0.113.7' } }, loopback)).toMatchObject({ allowed: false, status: 403 });
    expect(decideAccess({ ...local, headers: { host: '127.0.0.1:5173', forwarded: 'for=198.51.100.9' } }, loopback).allowed).toBe(false);
  });
  it('refuses a page of another site', () => {
    expect(decideAccess({ ...local, headers: { host: '127.0.0.1:5173', origin: 'https://attacker.example' } }, loopback).allowed).toBe(false);
  });
});

describe('decideAccess, token mode', () => {
  const policy = { mode: 'token', token: 'k9Q-secret' } as const;
  const remote = { remoteAddress: '127.0.0.2', headers: { host: '127.0.0.2:5173' } as Record<string, string>, url: '/api/call/benchState' };

  it('refuses a request without the token, even from this computer', () => {
    expect(decideAccess(remote, policy)).toMatchObject({ allowed: false, status: 401 });
    expect(decideAccess({ ...remote, remoteAddress: '127.0.0.1' }, policy).allowed).toBe(false);
  });
  it('refuses a wrong token', () => {
    expect(decideAccess({ ...remote, headers: { ...remote.headers, 'x-rampwright-token': 'k9Q-secreT' } }, policy).allowed).toBe(false);
  });
  it('takes the token from the header, a bearer authorisation, the cookie or the query', () => {
    expect(decideAccess({ ...remote, headers: { ...remote.headers, 'x-rampwright-token': 'k9Q-secret' } }, policy)).toEqual({ allowed: true, viaQueryToken: false });
    expect(decideAccess({ ...remote, headers: { ...remote.headers, authorization: 'Bearer k9Q-secret' } }, policy).allowed).toBe(true);
    expect(decideAccess({ ...remote, headers: { ...remote.headers, cookie: 'theme=dark; rampwright_token=k9Q-secret' } }, policy).allowed).toBe(true);
    expect(decideAccess({ ...remote, url: '/?token=k9Q-secret' }, policy)).toEqual({ allowed: true, viaQueryToken: true });
  });
});
