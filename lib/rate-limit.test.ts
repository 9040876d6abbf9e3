import { afterEach, describe, expect, it } from 'vitest';
import { accountChecks, clientAddress } from './rate-limit';

const h = (values: Record<string, string>) => new Headers(values);

describe('clientAddress', () => {
  afterEach(() => {
    delete process.env.TRUST_PROXY;
  });

  it('is unknown without a trusted proxy, whatever the request says', () => {
    expect(clientAddress(h({ 'x-forwarded-for': '198.51.100.7' }))).toBeNull();
    expect(clientAddress(h({ 'x-real-ip': '198.51.100.7' }))).toBeNull();
  });

  it.each([
    ['the only address', { 'x-forwarded-for': '198.51.100.7' }, '198.51.100.7'],
    ['the last address: the one the proxy appended, not what the client wrote', { 'x-forwarded-for': '10.0.0.1, 203.0.113.9' }, '203.0.113.9'],
    ['X-Real-IP when there is no X-Forwarded-For', { 'x-real-ip': '198.51.100.8' }, '198.51.100.8'],
    ['the /64 network of an IPv6 client', { 'x-forwarded-for': '2001:db8:0:12:a:b:c:d' }, '2001:db8:0:12::/64'],
    ['the /64 network of a shortened IPv6 address', { 'x-forwarded-for': '2001:DB8::1' }, '2001:db8:0:0::/64'],
    ['the IPv4 address inside an IPv4-mapped one', { 'x-forwarded-for': '::ffff:192.0.2.4' }, '192.0.2.4'],
  ])('behind a trusted proxy: %s', (_what, headers, want) => {
    process.env.TRUST_PROXY = 'true';
    expect(clientAddress(h(headers))).toBe(want);
  });
});

describe('accountChecks', () => {
  afterEach(() => {
    delete process.env.TRUST_PROXY;
  });

  it('checks the address (in lower case) and everybody; the client only when it is known', () => {
    expect(accountChecks('sign-in', 'Ada@Test.Example', h({ 'x-forwarded-for': '198.51.100.7' })).map((c) => c.key)).toEqual([
      'sign-in:address:ada@test.example',
      'sign-in:overall',
    ]);
    process.env.TRUST_PROXY = 'true';
    expect(accountChecks('reset', 'ada@test.example', h({ 'x-forwarded-for': '198.51.100.7' })).map((c) => c.key)).toEqual([
      'reset:address:ada@test.example',
      'reset:client:198.51.100.7',
      'reset:overall',
    ]);
  });
});
