/**
 * What the HTTP edge of Unitwise shares between its three layers, in plain JavaScript so that all
 * three can import it: scripts/serve.ts (the Node server in front of Next), next.config.mjs and
 * proxy.ts (Next's proxy, run before every route).
 */

/** Sent with every answer: pages, API, static files, 404s and the framework's own errors. */
export const SECURITY_HEADERS = Object.freeze([
  ['X-Content-Type-Options', 'nosniff'],
  ['Referrer-Policy', 'strict-origin-when-cross-origin'],
  ['X-Frame-Options', 'DENY'],
  ['Permissions-Policy', 'camera=(), microphone=(), geolocation=()'],
]);

/**
 * scripts/serve.ts gives every request an id in this header (replacing any value a client sent),
 * and instrumentation.ts `onRequestError` reports an id whose render failed because PostgreSQL was
 * unreachable, so that the server answers that request 503 instead of Next's 500.
 */
export const REQUEST_ID_HEADER = 'x-unitwise-request-id';

/** globalThis slot of the `Map` of such request ids to the time reported (created by scripts/serve.ts). */
export const UNAVAILABLE_REQUESTS = Symbol.for('unitwise.requests-without-database');
