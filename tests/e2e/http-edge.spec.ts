/**
 * The HTTP edge of the production server (scripts/serve.ts + proxy.ts), request by request: the
 * security headers and the nonce-based Content-Security-Policy on every kind of answer (pages, the
 * API, 404s, static files and addresses Next cannot decode), HSTS only over https, the app's own
 * shape for the framework's errors, 403 for a cross-site server action, 404 for a study the user
 * may not see, and the web server listening on loopback only.
 */
import os from 'node:os';
import { expect, test } from '@playwright/test';
import { WorkspacePage } from './pages/workspace-page';
import { registerAndSignIn } from './support/flows';
import { cspNonce, raw, type RawResponse } from './support/raw-http';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

const client = distinctClientHeaders();
test.use({ extraHTTPHeaders: client });

const SECURITY_HEADERS = {
  'x-content-type-options': 'nosniff',
  'referrer-policy': 'strict-origin-when-cross-origin',
  'x-frame-options': 'DENY',
  'permissions-policy': 'camera=(), microphone=(), geolocation=()',
};

function expectHardened(res: RawResponse, what: string): void {
  for (const [name, value] of Object.entries(SECURITY_HEADERS)) expect(res.headers[name], `${name} on ${what}`).toBe(value);
  const csp = String(res.headers['content-security-policy']);
  expect(csp, `CSP on ${what}`).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]{24}' 'strict-dynamic';/);
  expect(csp, `CSP on ${what}`).toContain("frame-ancestors 'none'");
  expect(csp, `CSP on ${what}`).not.toContain('unsafe-eval');
  expect(res.headers['strict-transport-security'], `HSTS on ${what} over http`).toBeUndefined();
}

const tenKilobytes = '%E0%A4'.repeat(1700);

test.describe('every answer carries the security headers and a Content-Security-Policy', () => {
  for (const [what, path, status, type] of [
    ['a page', '/sign-in', 200, 'text/html'],
    ['an API answer', '/api/health', 200, 'application/json'],
    ['a missing page', '/no-such-page', 404, 'text/html'],
    ['a missing API route', '/api/v1/no-such-route', 404, 'application/json'],
    ['a missing static file', '/_next/static/chunks/no-such-file.js', 404, 'text/plain'],
    ['a broken %-encoding under /api', '/api/v1/studies/%E0%A4%A', 400, 'application/json'],
    ['a broken %-encoding in a page address', '/studies/%ZZ', 404, 'text/html'],
    ['a 10 kB path segment', `/studies/${tenKilobytes}`, 404, 'text/html'],
    ['a 10 kB API path segment', `/api/v1/studies/${'a'.repeat(10_000)}`, 400, 'application/json'],
  ] as const) {
    test(`${what} (${path.slice(0, 40)})`, async () => {
      const res = await raw(path, { headers: client });
      expect(res.status, res.body.slice(0, 300)).toBe(status);
      expect(res.headers['content-type']).toContain(type);
      expectHardened(res, what);
    });
  }
});

test('a request Node itself refuses (headers over 16 KB) gets the headers and the app’s shape', async () => {
  for (const [path, type] of [
    ['/api/health', 'application/json'],
    ['/sign-in', 'text/html'],
  ] as const) {
    const res = await raw(path, { headers: { 'x-padding': 'a'.repeat(20_000) } });
    expect(res.status).toBe(431);
    expect(res.headers['content-type']).toContain(type);
    for (const [name, value] of Object.entries(SECURITY_HEADERS)) expect(res.headers[name], name).toBe(value);
    expect(res.headers['content-security-policy']).toBe("default-src 'none'; frame-ancestors 'none'");
    if (type === 'application/json') expect(JSON.parse(res.body)).toMatchObject({ error: { code: 'bad_request' } });
  }
});

test('the nonce is new for every answer and is on every script of the page', async () => {
  const [a, b] = [await raw('/sign-in'), await raw('/sign-in')];
  const nonce = cspNonce(a.headers['content-security-policy'])!;
  expect(nonce).toBeTruthy();
  expect(cspNonce(b.headers['content-security-policy'])).not.toBe(nonce);
  const scripts = a.body.match(/<script\b[^>]*>/g) ?? [];
  expect(scripts.length).toBeGreaterThan(2);
  for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);
});

test('HSTS is sent only when the app is reached over https (through the trusted proxy)', async () => {
  const https = await raw('/sign-in', { headers: { 'x-forwarded-proto': 'https' } });
  expect(https.headers['strict-transport-security']).toBe('max-age=63072000; includeSubDomains');
  expect(https.headers['content-security-policy']).toContain('upgrade-insecure-requests');
  const http = await raw('/sign-in', { headers: { 'x-forwarded-proto': 'http' } });
  expect(http.headers['strict-transport-security']).toBeUndefined();
});

test('addresses the framework cannot decode are answered in the app’s shape', async () => {
  const api = await raw('/api/v1/studies/%E0%A4%A');
  expect(api.status).toBe(400);
  expect(JSON.parse(api.body)).toEqual({ error: { code: 'bad_request', message: expect.stringMatching(/broken %-encoding/) } });

  for (const path of ['/studies/%ZZ', '/studies/%C0%AE%C0%AE/plan', `/studies/${tenKilobytes}`]) {
    const page = await raw(path);
    expect(page.status).toBe(404);
    expect(page.body).toContain('This address could not be read');
  }

  const missing = await raw('/api/v1/studies/00000000-0000-4000-8000-000000000000/no-such-thing');
  expect(missing.status).toBe(404);
  expect(JSON.parse(missing.body)).toMatchObject({ error: { code: 'not_found' } });
});

test('a server action posted from another site is refused with 403', async () => {
  const attempts: Record<string, string>[] = [
    // what a script on another site sends (the action id does not matter: it is refused first)
    { 'next-action': '7f3c1b2a9d8e4f5061728394a5b6c7d8e9f0a1b2c3', origin: 'https://evil.example', 'content-type': 'text/plain;charset=UTF-8' },
    // what a plain form on another site sends
    { origin: 'https://evil.example', 'sec-fetch-site': 'cross-site', 'content-type': 'application/x-www-form-urlencoded' },
  ];
  for (const headers of attempts) {
    const res = await raw('/sign-in', { method: 'POST', headers, body: headers['next-action'] ? '[]' : 'email=a%40b.c' });
    expect(res.status, res.body.slice(0, 300)).toBe(403);
    expect(JSON.parse(res.body)).toEqual({ error: { code: 'forbidden', message: 'Cross-site requests are not accepted.' } });
    expectHardened(res, 'a refused action');
  }
});

test('a study the user may not see answers 404, before any of the page is sent', async ({ page, browser }) => {
  test.slow(); // two accounts
  await registerAndSignIn(page, { name: 'Olga Owner', email: uniqueEmail('edge-owner'), password: STRONG_PASSWORD });
  const studyId = await new WorkspacePage(page).createStudyNamed('Private pilot', 'Only its owner sees it');
  const mine = await page.request.get(`/studies/${studyId}`);
  expect(mine.status()).toBe(200);

  const other = await browser.newContext({ extraHTTPHeaders: distinctClientHeaders() });
  const outsider = await other.newPage();
  await registerAndSignIn(outsider, { name: 'Otto Outsider', email: uniqueEmail('edge-outsider'), password: STRONG_PASSWORD });
  for (const path of [`/studies/${studyId}`, `/studies/${studyId}/plan`, `/studies/${studyId}/stress-test`, `/studies/${studyId}/design`]) {
    const res = await outsider.request.get(path, { maxRedirects: 0 });
    expect(res.status(), path).toBe(404);
    expect(await res.text()).toContain('This page does not exist, or you do not have access to it.');
  }
  const seen = await outsider.goto(`/studies/${studyId}/plan`);
  expect(seen?.status()).toBe(404);
  await expect(outsider.getByRole('heading', { level: 1, name: 'Not found' })).toBeVisible();
  await other.close();
});

test('the web server listens on loopback only', async () => {
  const lan = Object.values(os.networkInterfaces())
    .flat()
    .find((i) => i && i.family === 'IPv4' && !i.internal)?.address;
  test.skip(!lan, 'this machine has no network interface besides loopback');
  expect((await raw('/api/health')).status).toBe(200);
  await expect(raw('/api/health', { host: lan })).rejects.toThrow(/ECONNREFUSED/);
});
