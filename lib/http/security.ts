/**
 * The request policy that proxy.ts applies before any route runs: the Content-Security-Policy with a
 * fresh nonce, HSTS when the app is served over https, the refusal of cross-site writes to pages
 * (server actions), and the refusal of paths that Next itself cannot decode. Pure functions of the
 * request's headers and path, so that they can be tested without a server.
 */
import { SECURITY_HEADERS } from './edge.mjs';

export { SECURITY_HEADERS };

/** 128 random bits, base64: unguessable, and new for every answer. */
export function newNonce(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return btoa(String.fromCharCode(...bytes));
}

/**
 * Scripts run only with this answer's nonce (Next puts it on its own scripts when it finds it in
 * the request's CSP header) or when loaded by such a script ('strict-dynamic'). Development needs
 * 'unsafe-eval' (React rebuilds server error stacks with eval) and inline styles (the dev server
 * injects CSS as <style> elements without a nonce); production has neither.
 *
 * style="" attributes are allowed: React style props and the charts' SVG use them, an attribute
 * cannot carry a nonce, and it cannot run script or load anything outside img-src/font-src.
 */
export function contentSecurityPolicy({ nonce, dev, https }: { nonce: string; dev: boolean; https: boolean }): string {
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ''}`,
    dev ? "style-src 'self' 'unsafe-inline'" : `style-src 'self' 'nonce-${nonce}'`,
    "style-src-attr 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ];
  if (https) directives.push('upgrade-insecure-requests');
  return directives.join('; ');
}

/** Two years, this host and its subdomains; sent only when the app is reached over https. */
export const STRICT_TRANSPORT_SECURITY = 'max-age=63072000; includeSubDomains';

/**
 * Over https when the public URL says so, or when a trusted reverse proxy says the request came
 * in over https (X-Forwarded-Proto, trusted only with TRUST_PROXY=true: otherwise anyone could set it).
 */
export function servedOverHttps(appUrl: string, trustProxy: boolean, headers: Headers): boolean {
  if (new URL(appUrl).protocol === 'https:') return true;
  if (!trustProxy) return false;
  const proto = headers.get('x-forwarded-proto')?.split(',')[0]?.trim().toLowerCase();
  return proto === 'https';
}

/**
 * A browser marks a request from another site (Sec-Fetch-Site) and names the page that sent it
 * (Origin). Same rule as the API's write check: the Origin's host must be the app's public host
 * or the host the request was sent to.
 */
export function isCrossSite(headers: Headers, appUrl: string): boolean {
  const site = headers.get('sec-fetch-site');
  if (site && site !== 'same-origin' && site !== 'none') return true;
  const origin = headers.get('origin');
  if (!origin) return false;
  let originHost: string;
  try {
    originHost = new URL(origin).host;
  } catch {
    return true; // "null" (sandboxed frames, privacy redirects) or garbage
  }
  return originHost !== new URL(appUrl).host && originHost !== headers.get('host');
}

/** No Unitwise address comes near this; longer ones are refused before routing. */
export const MAX_PATH_LENGTH = 2048;

/**
 * Why a path cannot be routed, or null. A %-encoding that is not valid UTF-8 (a stray %, an
 * overlong or truncated sequence, an encoded surrogate) makes Next's parameter decoding throw, and
 * Next then answers a bare 500; an over-long path is refused before it reaches a route.
 * `rawPath` is the path as sent, still %-encoded.
 */
export function pathProblem(rawPath: string): string | null {
  if (rawPath.length > MAX_PATH_LENGTH) return `The address is too long: at most ${MAX_PATH_LENGTH} characters are accepted.`;
  for (const segment of rawPath.split('/')) {
    if (!segment.includes('%')) continue;
    try {
      decodeURIComponent(segment);
    } catch {
      return 'The address contains a broken %-encoding. Check the link you followed.';
    }
  }
  return null;
}

/**
 * proxy.ts sends a page address that it cannot decode to the not-found page with this request
 * header set to a value only that process knows (so the page can say the link is broken), and
 * removes the header from every other request.
 */
export const PROBLEM_HEADER = 'x-unitwise-problem';
