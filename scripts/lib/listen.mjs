/**
 * Where `npm start` lets the web server listen. Loopback (127.0.0.1) unless the developer opens it
 * on purpose with `npm start -- --host <address>` or LISTEN_HOST: the development outbox lists
 * every password-reset link the app sends, so it is served only while nobody but this machine can
 * connect (see lib/outbox.ts).
 */
import net from 'node:net';

export const DEFAULT_HOST = '127.0.0.1';

const unbracket = (host) => host.trim().toLowerCase().replace(/^\[(.*)\]$/, '$1');

/** True for an address or name that only this machine can reach. */
export function isLoopbackHost(host) {
  const h = unbracket(host);
  return h === 'localhost' || h === '::1' || (net.isIPv4(h) && h.startsWith('127.'));
}

/**
 * From the command line (`--host x`, which wins) and the environment (LISTEN_HOST):
 *   host    the address to listen on
 *   outbox  whether the development outbox may be served (only on loopback)
 *   origin  where this machine reaches the server, for the health check
 */
export function listenPlan(argv, env, port) {
  const i = argv.indexOf('--host');
  const host = (i >= 0 ? argv[i + 1] : undefined) || env.LISTEN_HOST || DEFAULT_HOST;
  const h = unbracket(host);
  const local = h === '0.0.0.0' || h === '::' ? '127.0.0.1' : h;
  return { host: h, outbox: isLoopbackHost(h), origin: `http://${net.isIPv6(local) ? `[${local}]` : local}:${port}` };
}
