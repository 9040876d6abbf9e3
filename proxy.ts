import { NextResponse, type NextRequest } from 'next/server';
import { cachedReader, configSchema } from '@/lib/config';
import { ERROR_STATUS, type ErrorCode } from '@/lib/errors';
import {
  SECURITY_HEADERS,
  STRICT_TRANSPORT_SECURITY,
  contentSecurityPolicy,
  isCrossSite,
  newNonce,
  pathProblem,
  PROBLEM_HEADER,
  servedOverHttps,
} from '@/lib/http/security';

/**
 * Runs before every route, static files and 404s included (no matcher):
 *  - every answer gets the security headers, a Content-Security-Policy with a nonce of its own
 *    (Next reads the policy from the request and puts the nonce on its scripts), and HSTS when the
 *    app is served over https;
 *  - a path that Next cannot decode is answered in the app's shape instead of Next's bare 500:
 *    400 with the API's JSON error under /api, the not-found page for a page address;
 *  - a write to a page from another site (a cross-site server action) is refused with 403 before
 *    Next's action handler, which would answer 500.
 * The API's own writes are checked by lib/api/handler.ts, next-auth's by its CSRF token.
 */
const settings = cachedReader(configSchema.pick({ APP_URL: true, TRUST_PROXY: true }));
const dev = process.env.NODE_ENV === 'development';
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
/** Marks this process's own rewrites, which Next passes through the proxy a second time. */
const REWRITE_MARK = newNonce();
const UNREADABLE_PATH = '/unreadable-address';

export function proxy(request: NextRequest) {
  if (request.headers.get(PROBLEM_HEADER) === REWRITE_MARK) return NextResponse.next();
  const { APP_URL: appUrl, TRUST_PROXY } = settings();
  const https = servedOverHttps(appUrl, TRUST_PROXY === 'true', request.headers);
  const csp = contentSecurityPolicy({ nonce: newNonce(), dev, https });
  const path = request.nextUrl.pathname;
  const api = path === '/api' || path.startsWith('/api/');
  const safe = SAFE_METHODS.has(request.method);

  const headers = new Headers(request.headers);
  headers.set('content-security-policy', csp);
  headers.delete(PROBLEM_HEADER); // only this proxy sets it, on the rewrite below

  let response: NextResponse;
  const problem = pathProblem(path);
  if (problem && (api || !safe)) {
    response = jsonError('bad_request', problem);
  } else if (problem) {
    // No route has this path, so Next answers 404 with app/not-found.tsx, which the mark tells to
    // say that the address is broken. (A page render cannot set 400: Next answers 200 or 404.)
    headers.set(PROBLEM_HEADER, REWRITE_MARK);
    response = NextResponse.rewrite(new URL(UNREADABLE_PATH, request.url), { request: { headers } });
  } else if (!api && !safe && isCrossSite(request.headers, appUrl)) {
    response = jsonError('forbidden', 'Cross-site requests are not accepted.');
  } else {
    response = NextResponse.next({ request: { headers } });
  }

  for (const [name, value] of SECURITY_HEADERS) response.headers.set(name, value);
  response.headers.set('Content-Security-Policy', csp);
  if (https) response.headers.set('Strict-Transport-Security', STRICT_TRANSPORT_SECURITY);
  return response;
}

function jsonError(code: ErrorCode, message: string): NextResponse {
  return NextResponse.json({ error: { code, message } }, { status: ERROR_STATUS[code] });
}
