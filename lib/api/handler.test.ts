import { beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { AppError } from '@/lib/errors';
import { api, assertSameOrigin, errorResponse, parseBody } from './handler';

beforeAll(() => {
  process.env.DATABASE_URL ??= 'postgres://unused@127.0.0.1:1/unused';
  process.env.AUTH_SECRET ??= 'unit-test-secret-unit-test-secret-unit';
  process.env.APP_URL = 'http://localhost:3000';
});

function req(headers: Record<string, string>, body?: string) {
  return new Request('http://localhost:3000/api/v1/x', { method: 'POST', headers, body });
}

describe('assertSameOrigin', () => {
  it.each([
    [{ origin: 'http://localhost:3000', 'sec-fetch-site': 'same-origin' }, true],
    [{}, true], // not a browser (curl, server to server): no cookie is sent for it by a third party
    [{ 'sec-fetch-site': 'none' }, true],
    [{ origin: 'https://evil.example' }, false],
    [{ 'sec-fetch-site': 'cross-site' }, false],
    [{ 'sec-fetch-site': 'same-site', origin: 'http://sub.localhost:3000' }, false],
    [{ origin: 'null' }, false],
  ])('%j → allowed %s', (headers, allowed) => {
    const run = () => assertSameOrigin(req(headers));
    if (allowed) expect(run).not.toThrow();
    else expect(run).toThrow(AppError);
  });

  it('a cross-site write gets 403 before anything else happens', async () => {
    let ran = false;
    const handler = api(async () => {
      ran = true;
      return { ok: true };
    });
    const res = await handler(req({ origin: 'https://evil.example' }), { params: Promise.resolve({}) });
    expect(res.status).toBe(403);
    expect(ran).toBe(false);
    expect((await res.json()).error.code).toBe('forbidden');
  });
});

describe('parseBody', () => {
  const schema = z.object({ title: z.string().min(1, 'Title is required.') });
  it('refuses malformed JSON with a 400 that says so', async () => {
    await expect(parseBody(req({}, '{"title":'), schema)).rejects.toMatchObject({ code: 'bad_request', message: 'The request body is not valid JSON.' });
  });
  it('returns field errors keyed by path', async () => {
    const err = (await parseBody(req({}, '{"title":""}'), schema).catch((e) => e)) as AppError;
    expect(err.code).toBe('bad_request');
    expect(err.fields).toEqual({ title: ['Title is required.'] });
  });
  it('refuses bodies over 256 KiB', async () => {
    const big = JSON.stringify({ title: 'x'.repeat(300 * 1024) });
    await expect(parseBody(req({}, big), schema)).rejects.toMatchObject({ code: 'payload_too_large' });
  });
});

describe('errorResponse', () => {
  it('uses the documented shape and status', async () => {
    const res = errorResponse(new AppError('conflict', 'Changed meanwhile.', { fields: { title: ['Taken.'] } }));
    expect(res.status).toBe(409);
    expect(await res.json()).toEqual({ error: { code: 'conflict', message: 'Changed meanwhile.', fields: { title: ['Taken.'] } } });
  });
  it('hides unknown errors behind a generic 500', async () => {
    const res = errorResponse(new Error('relation "secret_table" does not exist'));
    expect(res.status).toBe(500);
    const body = await res.json();
    expect(JSON.stringify(body)).not.toContain('secret_table');
  });
  it('sets Retry-After on rate limits', () => {
    const res = errorResponse(new AppError('rate_limited', 'Slow down.', { retryAfterSeconds: 42 }));
    expect(res.status).toBe(429);
    expect(res.headers.get('retry-after')).toBe('42');
  });
});
