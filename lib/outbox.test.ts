import { afterEach, describe, expect, it } from 'vitest';
import { isLocalRequest, outboxDir } from './outbox';

// Next fills X-Forwarded-For with the peer's address when the client sent none.
const local = { host: 'localhost:3000', 'x-forwarded-host': 'localhost:3000', 'x-forwarded-for': '::ffff:127.0.0.1' };

describe('the development outbox answers only this machine', () => {
  it.each([
    [local],
    [{ ...local, 'x-forwarded-for': '127.0.0.1' }],
    [{ ...local, 'x-forwarded-for': '::1' }],
    [{ host: '127.0.0.1:3000', 'x-forwarded-for': '127.0.0.1' }],
    [{ host: '[::1]:3000', 'x-forwarded-for': '::1' }],
  ])('serves %j', (headers) => {
    expect(isLocalRequest(new Headers(headers))).toBe(true);
  });

  it.each([
    ['a peer on the network', { ...local, 'x-forwarded-for': '::ffff:192.0.2.2' }],
    ['a client behind a proxy', { ...local, 'x-forwarded-for': '203.0.113.9, 127.0.0.1' }],
    ['a proxy on this machine', { ...local, 'x-forwarded-for': '127.0.0.1', 'x-real-ip': '203.0.113.9' }],
    ['an RFC 7239 proxy', { ...local, forwarded: 'for=203.0.113.9' }],
    ['another host name (DNS rebinding)', { ...local, host: 'evil.example:3000', 'x-forwarded-host': 'evil.example:3000' }],
    ['a forwarded host', { ...local, 'x-forwarded-host': 'unitwise.example.org' }],
    ['a network address as host', { ...local, host: '192.0.2.2:3000', 'x-forwarded-host': '192.0.2.2:3000' }],
    ['no peer address', { host: 'localhost:3000' }],
  ])('refuses %s', (_what, headers) => {
    expect(isLocalRequest(new Headers(headers))).toBe(false);
  });
});

describe('the outbox exists only while npm start runs the local sink', () => {
  const saved = { ...process.env };
  afterEach(() => {
    process.env = { ...saved };
  });
  const base = { DATABASE_URL: 'postgres://u:p@127.0.0.1:5432/x', AUTH_SECRET: 'x'.repeat(32), OUTBOX_DIR: '/tmp/outbox', SMTP_HOST: '127.0.0.1' };

  it.each([
    [{ ...base, DEV_OUTBOX: 'true' }, '/tmp/outbox'],
    [{ ...base, DEV_OUTBOX: 'false' }, undefined],
    [{ ...base }, undefined],
    [{ ...base, DEV_OUTBOX: 'true', SMTP_HOST: 'smtp.example.org' }, undefined],
    [{ ...base, DEV_OUTBOX: 'true', OUTBOX_DIR: '' }, undefined],
  ])('%j → %s', (vars, dir) => {
    process.env = { ...vars } as unknown as NodeJS.ProcessEnv;
    expect(outboxDir()).toBe(dir);
  });
});
