import { describe, expect, it } from 'vitest';
import { contentSecurityPolicy, isCrossSite, MAX_PATH_LENGTH, newNonce, pathProblem, servedOverHttps } from './security';

const APP = 'http://localhost:3000';
const h = (init: Record<string, string>) => new Headers(init);

describe('Content-Security-Policy', () => {
  it('lets scripts run only with the answer’s nonce, never eval in production', () => {
    const csp = contentSecurityPolicy({ nonce: 'abc', dev: false, https: false });
    expect(csp).toContain("script-src 'self' 'nonce-abc' 'strict-dynamic'");
    expect(csp).toContain("style-src 'self' 'nonce-abc'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).not.toMatch(/unsafe-eval|'unsafe-inline'.*script|upgrade-insecure-requests/);
  });

  it('allows eval and inline styles only in development, and upgrades requests only over https', () => {
    expect(contentSecurityPolicy({ nonce: 'n', dev: true, https: false })).toMatch(/script-src [^;]*'unsafe-eval'.*style-src 'self' 'unsafe-inline'/);
    expect(contentSecurityPolicy({ nonce: 'n', dev: false, https: true })).toMatch(/; upgrade-insecure-requests$/);
  });

  it('uses a new unguessable nonce every time', () => {
    const nonces = new Set(Array.from({ length: 100 }, newNonce));
    expect(nonces.size).toBe(100);
    for (const n of nonces) expect(atob(n)).toHaveLength(16);
  });
});

describe('https for HSTS', () => {
  it.each([
    ['https://unitwise.example.org', false, {}, true],
    ['http://localhost:3000', false, { 'x-forwarded-proto': 'https' }, false],
    ['http://localhost:3000', true, { 'x-forwarded-proto': 'https' }, true],
    ['http://localhost:3000', true, { 'x-forwarded-proto': 'http' }, false],
    ['http://localhost:3000', true, {}, false],
  ])('APP_URL %s, TRUST_PROXY %s, %j → %s', (appUrl, trust, headers, https) => {
    expect(servedOverHttps(appUrl, trust, h(headers))).toBe(https);
  });
});

describe('cross-site writes', () => {
  it.each([
    [{ origin: 'http://localhost:3000' }, false],
    [{ origin: 'http://127.0.0.1:3000', host: '127.0.0.1:3000' }, false],
    [{}, false],
    [{ 'sec-fetch-site': 'same-origin', origin: 'http://localhost:3000' }, false],
    [{ origin: 'https://evil.example' }, true],
    [{ origin: 'null' }, true],
    [{ 'sec-fetch-site': 'cross-site' }, true],
    [{ 'sec-fetch-site': 'same-site', origin: 'http://localhost:3000' }, true],
  ])('%j → %s', (headers, cross) => {
    expect(isCrossSite(h({ host: 'localhost:3000', ...headers }), APP)).toBe(cross);
  });
});

describe('paths Next cannot decode', () => {
  it.each([
    ['a truncated sequence', '/api/v1/studies/%E0%A4%A'],
    ['a % without hex digits', '/studies/%ZZ'],
    ['an overlong encoding of "."', '/studies/%C0%AE%C0%AE'],
    ['an encoded lone surrogate', '/studies/%ED%A0%80'],
    ['a trailing %', '/studies/abc%'],
  ])('refuses %s', (_what, path) => {
    expect(pathProblem(path)).toMatch(/broken %-encoding/);
  });

  it('refuses an over-long path, such as a 10 kB segment', () => {
    expect(pathProblem(`/studies/${'a'.repeat(MAX_PATH_LENGTH)}`)).toMatch(/too long/);
    expect(pathProblem(`/studies/${'%E0%A4'.repeat(1700)}`)).toMatch(/too long/);
  });

  it.each([['/'], ['/studies/4c71a415-aa39-4848-a12a-bffa2dc0abe0/plan'], ['/calculators/two-group-means'], ['/search/caf%C3%A9%20%F0%9F%8C%B1'], ['/a%2Fb']])(
    '%s is routed',
    (path) => expect(pathProblem(path)).toBeNull(),
  );
});
