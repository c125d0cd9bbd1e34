// Who may talk to the bench server: loopback by address, Host, Origin and forwarding headers, and this run's token
// in every mode.
import { describe, expect, it } from 'vitest';
import { decideAccess, forwardedAddresses, hostOfAuthority, isLoopbackAddress, serverHostNames, tokensEqual, type AccessPolicy } from '../../../main/server/access';

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

const token = 'k9Q-secret-0123456789';

describe('decideAccess on loopback', () => {
  const loopback: AccessPolicy = { token, loopbackOnly: true, hostNames: ['127.0.0.1'], port: 5173 };
  const local = { remoteAddress: '127.0.0.1', headers: { host: '127.0.0.1:5173', 'x-rampwright-token': token } as Record<string, string>, url: '/' };
  const withHeaders = (headers: Record<string, string>) => ({ ...local, headers: { ...local.headers, ...headers } });

  it('serves this computer with the token, from its own page or a program without an Origin', () => {
    expect(decideAccess(local, loopback).allowed).toBe(true);
    expect(decideAccess(withHeaders({ host: 'localhost:5173', origin: 'http://localhost:5173' }), loopback).allowed).toBe(true);
  });
  it('refuses this computer without the token: any local process or other user could reach 127.0.0.1', () => {
    const { 'x-rampwright-token': _dropped, ...bare } = local.headers;
    expect(decideAccess({ ...local, headers: bare }, loopback)).toMatchObject({ allowed: false, status: 401 });
    expect(decideAccess(withHeaders({ 'x-rampwright-token': `${token}x` }), loopback)).toMatchObject({ allowed: false, status: 401 });
  });
  it('refuses another client address', () => {
    expect(decideAccess({ ...local, remoteAddress: '192.168.1.20' }, loopback)).toMatchObject({ allowed: false, status: 403 });
  });
  it('refuses a Host naming another computer (DNS rebinding), even with the token', () => {
    expect(decideAccess(withHeaders({ host: 'bench.attacker.example:5173' }), loopback)).toMatchObject({ allowed: false, status: 403 });
    const { host: _dropped, ...hostless } = local.headers;
    expect(decideAccess({ ...local, headers: hostless }, loopback).allowed).toBe(false);
  });
  it('refuses a request forwarded from another computer', () => {
    expect(decideAccess(withHeaders({ 'x-forwarded-for': '203.0.113.7' }), loopback)).toMatchObject({ allowed: false, status: 403 });
    expect(decideAccess(withHeaders({ forwarded: 'for=198.51.100.9' }), loopback).allowed).toBe(false);
  });
  it('refuses a page of another site, and of another port on this computer', () => {
    expect(decideAccess(withHeaders({ origin: 'https://attacker.example' }), loopback).allowed).toBe(false);
    expect(decideAccess(withHeaders({ origin: 'http://127.0.0.1:9999' }), loopback).allowed).toBe(false);
  });
  it('refuses Origin: null (a sandboxed frame or a local file page), saying why', () => {
    const decision = decideAccess(withHeaders({ origin: 'null' }), loopback);
    expect(decision).toMatchObject({ allowed: false, status: 403 });
    expect(decision.allowed ? '' : decision.reason).toMatch(/no origin/);
    expect(decideAccess(withHeaders({ origin: 'file://' }), loopback).allowed).toBe(false);
  });
});

describe('decideAccess on another interface', () => {
  const policy: AccessPolicy = { token, loopbackOnly: false, hostNames: serverHostNames('0.0.0.0', { hostname: 'bench7.workshop.lan', interfaceAddresses: ['127.0.0.1', '192.168.4.17'] }), port: 5173 };
  const remote = { remoteAddress: '192.168.4.30', headers: { host: '192.168.4.17:5173' } as Record<string, string>, url: '/api/call/benchState' };

  it('refuses a request without the token, even from this computer', () => {
    expect(decideAccess(remote, policy)).toMatchObject({ allowed: false, status: 401 });
    expect(decideAccess({ ...remote, remoteAddress: '127.0.0.1' }, policy).allowed).toBe(false);
  });
  it('refuses a wrong token', () => {
    expect(decideAccess({ ...remote, headers: { ...remote.headers, 'x-rampwright-token': token.toUpperCase() } }, policy).allowed).toBe(false);
  });
  it('takes the token from the header, a bearer authorisation, its port\'s cookie or the query', () => {
    expect(decideAccess({ ...remote, headers: { ...remote.headers, 'x-rampwright-token': token } }, policy)).toEqual({ allowed: true, viaQueryToken: false });
    expect(decideAccess({ ...remote, headers: { ...remote.headers, authorization: `Bearer ${token}` } }, policy).allowed).toBe(true);
    expect(decideAccess({ ...remote, headers: { ...remote.headers, cookie: `theme=dark; rampwright_token_5173=${token}` } }, policy).allowed).toBe(true);
    expect(decideAccess({ ...remote, headers: { ...remote.headers, cookie: `rampwright_token_4870=${token}` } }, policy).allowed).toBe(false);
    expect(decideAccess({ ...remote, url: `/?token=${token}` }, policy)).toEqual({ allowed: true, viaQueryToken: true });
  });
  it('keeps the Host and Origin checks when the token is right', () => {
    const withToken = { ...remote, url: `/?token=${token}` };
    expect(decideAccess({ ...withToken, headers: { host: 'bench7:5173' } }, policy).allowed).toBe(true);
    expect(decideAccess({ ...withToken, headers: { host: 'bench7.local:5173' } }, policy).allowed).toBe(true);
    expect(decideAccess({ ...withToken, headers: { host: 'rebound.attacker.example:5173' } }, policy)).toMatchObject({ allowed: false, status: 403 });
    expect(decideAccess({ ...withToken, headers: { host: '192.168.4.17:5173', origin: 'null' } }, policy)).toMatchObject({ allowed: false, status: 403 });
    expect(decideAccess({ ...withToken, headers: { host: '192.168.4.17:5173', origin: 'http://attacker.example' } }, policy)).toMatchObject({ allowed: false, status: 403 });
    expect(decideAccess({ ...withToken, headers: { host: '192.168.4.17:5173', origin: 'http://192.168.4.17:5173' } }, policy).allowed).toBe(true);
  });
});

describe('serverHostNames', () => {
  it('is the loopback address alone on loopback, and the computer\'s names and addresses on a wildcard bind', () => {
    expect(serverHostNames('127.0.0.1', { hostname: 'bench7', interfaceAddresses: ['10.1.1.1'] })).toEqual(['127.0.0.1']);
    expect(serverHostNames('10.1.1.1', { hostname: 'Bench7.lan', interfaceAddresses: ['10.1.1.1', '10.2.2.2'] })).toEqual(['10.1.1.1', 'bench7.lan', 'bench7', 'bench7.local']);
    expect(serverHostNames('0.0.0.0', { hostname: 'bench7', interfaceAddresses: ['10.1.1.1', 'fe80::1'] })).toEqual(expect.arrayContaining(['10.1.1.1', 'fe80::1', 'bench7']));
  });
});
