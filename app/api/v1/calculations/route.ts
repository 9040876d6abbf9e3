import { api, parseBody } from '@/lib/api/handler';
import { runCalculation } from '@/lib/api/calculations';
import { db } from '@/lib/db';
import { clientIp, enforce, LIMITS } from '@/lib/rate-limit';
import { calculationSchema } from '@/lib/validation/calculations';

/**
 * POST /api/v1/calculations — sample size, power or smallest detectable effect; no sign-in.
 *
 * Cross-site browser calls stay refused (the shell's default for every POST). The computation
 * itself is harmless, but every caller without a trusted proxy shares one per-network budget
 * (lib/rate-limit.ts `clientIp`), so a page elsewhere could spend our visitors' budget; the
 * calculator pages compute in the browser and scripts and servers (no Origin or Sec-Fetch-Site
 * header) are unaffected.
 */
export const POST = api(
  async ({ req }) => {
    await enforce(db(), `calc:ip:${clientIp(req.headers)}`, LIMITS.calculationsPerIp, 'calculations from this network');
    const request = await parseBody(req, calculationSchema, { maxBytes: 16 * 1024 });
    return runCalculation(request);
  },
  { public: true },
);
