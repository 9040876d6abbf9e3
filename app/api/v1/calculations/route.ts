import { api, parseBody } from '@/lib/api/handler';
import { runCalculation } from '@/lib/api/calculations';
import { actorFromRequest } from '@/lib/auth/session';
import { db } from '@/lib/db';
import { clientAddress, enforce, LIMITS } from '@/lib/rate-limit';
import { calculationSchema } from '@/lib/stats/calculations/request';

/**
 * POST /api/v1/calculations — sample size, power or smallest detectable effect; no sign-in.
 *
 * Cross-site browser calls stay refused (the shell's default for every POST): the calculator
 * pages compute in the browser, and scripts and servers (no Origin or Sec-Fetch-Site header) are
 * unaffected.
 *
 * Rate limit, by the most precise identity there is: a signed-in caller (session cookie) has
 * their own allowance, so does each client behind a trusted proxy (TRUST_PROXY); callers that
 * cannot be told apart (no proxy, not signed in) share one allowance ten times as large. One
 * script can use that shared allowance up, but never a signed-in user's or a known client's;
 * and what it uses up is what the server would otherwise spend on it.
 */
export const POST = api(
  async ({ req }) => {
    const actor = await actorFromRequest(req);
    const client = clientAddress(req.headers);
    if (actor) await enforce(db(), `calc:user:${actor.id}`, LIMITS.calculationsPerClient, 'calculations from your account');
    else if (client) await enforce(db(), `calc:client:${client}`, LIMITS.calculationsPerClient, 'calculations from your network');
    else await enforce(db(), 'calc:anonymous', LIMITS.calculationsAnonymous, 'calculations from callers who are not signed in; sign in for an allowance of your own');
    const request = await parseBody(req, calculationSchema, { maxBytes: 16 * 1024 });
    return runCalculation(request);
  },
  { public: true },
);
