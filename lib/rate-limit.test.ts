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
    ['a public IPv4 peer', '198.51.100.7', '198.51.100.7'],
    ['a public IPv4 peer, as an IPv4-mapped address', '::ffff:203.0.113.9', '203.0.113.9'],
    ['the /64 network of a public IPv6 peer', '2001:db8:0:12:a:b:c:d', '2001:db8:0:12::/64'],
    ['no loopback peer (a proxy on this machine)', '127.0.0.1', null],
    ['no loopback IPv6 peer', '::1', null],
    ['no private peer (a proxy in the same network)', '10.1.2.3', null],
    ['no private peer in 172.16/12', '172.20.0.5', null],
    ['no private peer in 192.168/16', '::ffff:192.168.1.9', null],
    ['no unique-local IPv6 peer', 'fd00::5', null],
    ['no link-local IPv6 peer', 'fe80::1', null],
    ['nothing that is not an address', 'not-an-ip', null],
  ])('without a trusted proxy, the connection’s peer (set by the server): %s', (_what, peer, want) => {
    expect(clientAddress(h({ 'x-unitwise-peer': peer, 'x-forwarded-for': '192.0.2.55' }))).toBe(want);
  });

  it('behind a trusted proxy, X-Forwarded-For and not the peer (the proxy)', () => {
    process.env.TRUST_PROXY = 'true';
    expect(clientAddress(h({ 'x-unitwise-peer': '198.51.100.1', 'x-forwarded-for': '203.0.113.9' }))).toBe('203.0.113.9');
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
