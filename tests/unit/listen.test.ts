import { describe, expect, it } from 'vitest';
// @ts-expect-error -- plain JavaScript helper of scripts/start.mjs, without type declarations
import { isLoopbackHost, listenPlan } from '../../scripts/lib/listen.mjs';

describe('npm start listens on loopback unless opened on purpose', () => {
  it('defaults to 127.0.0.1 with the outbox on', () => {
    expect(listenPlan([], {}, 3000)).toEqual({ host: '127.0.0.1', outbox: true, origin: 'http://127.0.0.1:3000' });
  });

  it('opens with --host or LISTEN_HOST, and then serves no outbox', () => {
    expect(listenPlan(['--host', '0.0.0.0'], {}, 3000)).toEqual({ host: '0.0.0.0', outbox: false, origin: 'http://127.0.0.1:3000' });
    expect(listenPlan([], { LISTEN_HOST: '192.0.2.7' }, 3000)).toEqual({ host: '192.0.2.7', outbox: false, origin: 'http://192.0.2.7:3000' });
    expect(listenPlan(['--host', '::'], { LISTEN_HOST: '10.0.0.1' }, 3000)).toMatchObject({ host: '::', outbox: false });
  });

  it.each([
    ['127.0.0.1', true],
    ['127.8.9.10', true],
    ['localhost', true],
    ['::1', true],
    ['[::1]', true],
    ['0.0.0.0', false],
    ['::', false],
    ['192.168.1.20', false],
    ['example.org', false],
  ])('%s is loopback: %s', (host, loopback) => {
    expect(isLoopbackHost(host)).toBe(loopback);
  });
});
