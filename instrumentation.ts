import type { Instrumentation } from 'next';
import { isDatabaseUnavailable } from '@/lib/errors';
import { REQUEST_ID_HEADER, UNAVAILABLE_REQUESTS } from '@/lib/http/edge.mjs';

/**
 * Next calls `register()` once when the web server starts, before it answers any request: the
 * whole configuration (lib/config.ts) is checked here, so a bad deployment stops at boot with a
 * message naming each bad variable instead of failing later inside a request.
 */
export async function register(): Promise<void> {
  // Inside the condition (not after an early return) so that the Edge build drops process.exit.
  if (process.env.NEXT_RUNTIME === 'nodejs' && process.env.NEXT_PHASE !== 'phase-production-build') {
    const { ConfigError, parseConfig } = await import('@/lib/config');
    try {
      parseConfig(process.env, 'web');
    } catch (err) {
      if (!(err instanceof ConfigError)) throw err;
      const { logger } = await import('@/lib/log');
      logger('web').error(`cannot start. ${err.message}`);
      process.exit(1);
    }
    // The mail sender (lib/mail/sender.ts) runs in the web server, in the background: the server
    // does not wait for the database, and mail queued meanwhile is sent once it is subscribed.
    const { startMailSender } = await import('./lib/mail/sender');
    void startMailSender();
  }
}

/**
 * A page whose render failed because PostgreSQL is unreachable is reported to scripts/serve.ts by
 * its request id; the server then answers 503 (and Retry-After) instead of Next's 500. Runs before
 * Next sends the status line. Outside serve.ts (plain `next start`) there is nothing to report to.
 */
export const onRequestError: Instrumentation.onRequestError = (err, request) => {
  if (!isDatabaseUnavailable(err)) return;
  const id = request.headers[REQUEST_ID_HEADER];
  const unavailable = (globalThis as Record<symbol, unknown>)[UNAVAILABLE_REQUESTS];
  if (typeof id === 'string' && unavailable instanceof Map) unavailable.set(id, Date.now());
};
