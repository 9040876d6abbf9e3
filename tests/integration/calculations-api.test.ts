/**
 * POST /api/v1/calculations through the real route handler, signed out: every kind answers with
 * its solved value, bad input answers 400 with field errors, and the rate limits (per network
 * behind a trusted proxy, per signed-in user, one shared allowance otherwise) answer 429 with
 * Retry-After (the count lives in PostgreSQL).
 *
 * Reference values: R 4.2.2 (Debian r-base-core), stats::power.t.test(..., strict = TRUE), which
 * counts both rejection tails as the engine does:
 *   power.t.test(delta = 3, sd = 10, power = .8, strict = TRUE)$n            = 175.3846694 → 176
 *   power.t.test(delta = 3, sd = 10, n = 176, strict = TRUE)$power           = 0.80137944355
 *   cluster means, m = 25, ICC = 0.15, cv = 0.3: DE = 1 + ((cv² + 1)·m − 1)·ICC = 4.9375,
 *   power.t.test(delta = 4, sd = 12 * sqrt(DE / 25), power = .8, strict = TRUE)$n = 28.895 → 29
 */
import { afterEach, describe, expect, it } from 'vitest';
import * as calculations from '@/app/api/v1/calculations/route';
import { CALCULATION_EXAMPLES } from '@/lib/api/calculation-examples';
import { openApiDocument } from '@/lib/api/openapi';
import { calculate } from '@/lib/stats/calculations';
import { LIMITS } from '@/lib/rate-limit';
import { CALCULATION_KINDS, calculationSchema, SOLVABLE } from '@/lib/stats/calculations/request';
import { BASE, ctx, makeUser, request } from '../support/fixtures';

const PATH = '/api/v1/calculations';

async function post(body: unknown, options: { headers?: Record<string, string> } = {}) {
  const res = await calculations.POST(request('POST', PATH, { body, headers: options.headers }), ctx({}));
  return { res, body: await res.json() };
}

/** |got − want| ≤ rel·|want|, printing inputs, expected, got, difference and tolerance otherwise. */
function expectClose(label: string, got: unknown, want: number, rel: number) {
  const diff = Math.abs(Number(got) - want);
  expect(diff <= rel * Math.abs(want), `${label}: expected ${want}, got ${got}, difference ${diff}, tolerance ${rel * Math.abs(want)} (relative ${rel})`).toBe(true);
}

describe('every kind answers signed out with its solved value', () => {
  it.each(CALCULATION_KINDS)('%s', async (kind) => {
    const example = CALCULATION_EXAMPLES[kind];
    const { res, body } = await post(example.request);
    expect(res.status, `${kind} ${JSON.stringify(example.request)} → ${JSON.stringify(body)}`).toBe(200);
    expect(body.kind).toBe(kind);
    expect(typeof body.method).toBe('string');
    expect(typeof body.formula).toBe('string');
    expect(body.references.length).toBeGreaterThan(0);
    expect(Array.isArray(body.warnings)).toBe(true);
    expect(['ok', 'unreachable', 'already-met']).toContain(body.feasibility);
    if (SOLVABLE[kind].length > 0) {
      expect(SOLVABLE[kind]).toContain(body.solvedFor);
      expect(Object.keys(example.request)).not.toContain(body.solvedFor);
      expect(Number.isFinite(body.result[body.solvedFor]), `result.${body.solvedFor} = ${body.result[body.solvedFor]}`).toBe(true);
    }
    // Every input comes back by its own name, after defaults; a target power given beside a
    // solved size or effect comes back as targetPower, and power is then the power achieved.
    for (const [name, value] of Object.entries(example.request)) {
      if (name === 'kind') continue;
      const key = name === 'power' && body.solvedFor !== null && body.solvedFor !== 'power' ? 'targetPower' : name;
      expect(body.result[key], key).toEqual(value);
    }
    // The route adds nothing and loses nothing on the way from the engine to JSON.
    expect(body).toEqual(JSON.parse(JSON.stringify(calculate(calculationSchema.parse(example.request)))));
    // (That the documented response schema describes the answer is checked for every 2xx
    // response of the suite: tests/support/api-contract.ts.)
  });

  it('two-group-means: 176 per group for 3 points with SD 10 at 80% power, as R power.t.test', async () => {
    const { res, body } = await post({ kind: 'two-group-means', delta: 3, sd: 10, power: 0.8 });
    expect(res.status).toBe(200);
    expect(body.solvedFor).toBe('nPerGroup');
    expect(body.result.nPerGroup).toBe(176);
    expect(body.result.targetPower).toBe(0.8);
    expectClose('achieved power, n = 176, delta 3, sd 10', body.result.power, 0.80137944355, 1e-6);
  });

  it('two-group-means: the power of 176 per group when power is left out', async () => {
    const { res, body } = await post({ kind: 'two-group-means', delta: 3, sd: 10, nPerGroup: 176 });
    expect(res.status).toBe(200);
    expect(body.solvedFor).toBe('power');
    expectClose('power, n = 176, delta 3, sd 10', body.result.power, 0.80137944355, 1e-6);
  });

  it('cluster-means: 29 classrooms per arm, as R power.t.test on cluster means', async () => {
    const { res, body } = await post({ kind: 'cluster-means', delta: 4, sd: 12, icc: 0.15, clusterSize: 25, cv: 0.3, power: 0.8 });
    expect(res.status, JSON.stringify(body)).toBe(200);
    expect(body.solvedFor).toBe('clustersPerArm');
    expect(body.result.clustersPerArm).toBe(29);
    expectClose('design effect, m 25, icc 0.15, cv 0.3', body.result.designEffect, 4.9375, 1e-12);
  });

  it('names the quantity to solve for in solveFor when all are given', async () => {
    const { res, body } = await post({ kind: 'two-group-means', delta: 3, sd: 10, power: 0.8, nPerGroup: 50, solveFor: 'nPerGroup' });
    expect(res.status, JSON.stringify(body)).toBe(200);
    expect(body.result.nPerGroup).toBe(176);
  });

  it('works the same for a signed-in caller', async () => {
    const user = await makeUser('calc');
    const res = await calculations.POST(request('POST', PATH, { user, body: CALCULATION_EXAMPLES['two-group-means'].request }), ctx({}));
    expect(res.status).toBe(200);
    expect((await res.json()).result.nPerGroup).toBe(176);
  });
});

describe('invalid input answers 400 with field errors', () => {
  it('leaving out two unknowns names them', async () => {
    const { res, body } = await post({ kind: 'two-group-means', sd: 10, nPerGroup: 50 });
    // delta and power both missing: the engine cannot tell which one to solve for.
    const { res: res2, body: body2 } = await post({ kind: 'two-group-means', sd: 10 });
    expect(res.status, JSON.stringify(body)).toBe(400);
    expect(body.error.code).toBe('bad_request');
    expect(Object.keys(body.error.fields)).toEqual(expect.arrayContaining(['delta', 'power']));
    expect(res2.status, JSON.stringify(body2)).toBe(400);
    expect(Object.keys(body2.error.fields).length).toBeGreaterThan(0);
  });

  it.each([
    ['a negative sd', { kind: 'two-group-means', delta: 3, sd: -1, power: 0.8 }, 'sd'],
    ['power above 1', { kind: 'two-group-means', delta: 3, sd: 10, power: 1.5 }, 'power'],
    ['an ICC of 2', { kind: 'cluster-means', delta: 4, sd: 12, icc: 2, clusterSize: 25, power: 0.8 }, 'icc'],
    ['a fractional cluster count', { kind: 'cluster-means', delta: 4, sd: 12, icc: 0.1, clusterSize: 25, clustersPerArm: 10.5 }, 'clustersPerArm'],
    ['a text where a number belongs', { kind: 'two-proportions', p1: '0.5', p2: 0.6, power: 0.8 }, 'p1'],
    ['an unknown kind', { kind: 'anova-of-everything', power: 0.8 }, 'kind'],
  ])('%s', async (_label, input, field) => {
    const { res, body } = await post(input);
    expect(res.status, JSON.stringify(body)).toBe(400);
    expect(body.error.code).toBe('bad_request');
    expect(body.error.fields[field], JSON.stringify(body.error.fields)).toEqual([expect.any(String)]);
  });

  it('a body that is not JSON', async () => {
    const req = new Request(`${BASE}${PATH}`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: BASE, 'sec-fetch-site': 'same-origin' },
      body: '{"kind": "two-group-means", delta: 3',
    });
    const res = await calculations.POST(req, ctx({}));
    expect(res.status).toBe(400);
    expect((await res.json()).error).toMatchObject({ code: 'bad_request', message: expect.stringMatching(/not valid JSON/) });
  });

  it('refuses a browser on another site (403), but a script without Origin is served', async () => {
    const { res } = await post(CALCULATION_EXAMPLES['design-effect'].request, { headers: { origin: 'https://elsewhere.example', 'sec-fetch-site': 'cross-site' } });
    expect(res.status).toBe(403);
    const script = new Request(`${BASE}${PATH}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(CALCULATION_EXAMPLES['design-effect'].request) });
    expect((await calculations.POST(script, ctx({}))).status).toBe(200);
  });
});

describe('rate limits per caller', () => {
  afterEach(() => {
    delete process.env.RATE_LIMIT_SCALE;
    delete process.env.TRUST_PROXY;
  });

  it('answers 429 with Retry-After once the network has used its calls; another network is unaffected', async () => {
    process.env.TRUST_PROXY = 'true';
    process.env.RATE_LIMIT_SCALE = String(3 / LIMITS.calculationsPerClient.limit); // 3 calls per window
    const from = (ip: string) => ({ headers: { 'x-forwarded-for': ip } });
    const body = CALCULATION_EXAMPLES['design-effect'].request;
    for (let i = 0; i < 3; i++) expect((await post(body, from('198.51.100.7'))).res.status).toBe(200);
    const { res, body: limited } = await post(body, from('198.51.100.7'));
    expect(res.status).toBe(429);
    expect(limited.error.code).toBe('rate_limited');
    const retry = Number(res.headers.get('Retry-After'));
    expect(retry).toBeGreaterThan(0);
    expect(retry).toBeLessThanOrEqual(LIMITS.calculationsPerClient.windowSeconds);
    // Invalid calls count too, so a flood of bad bodies is limited as well.
    expect((await post({ kind: 'nothing' }, from('198.51.100.7'))).res.status).toBe(429);
    expect((await post(body, from('198.51.100.8'))).res.status).toBe(200);
  });

  it('without a trusted proxy, a script that uses up the shared allowance does not stop a signed-in caller', async () => {
    process.env.RATE_LIMIT_SCALE = String(3 / LIMITS.calculationsPerClient.limit); // 3 per caller, 30 shared
    const shared = Math.floor(LIMITS.calculationsAnonymous.limit * Number(process.env.RATE_LIMIT_SCALE));
    const body = CALCULATION_EXAMPLES['design-effect'].request;
    // The script forges X-Forwarded-For; without TRUST_PROXY it is ignored.
    for (let i = 0; i < shared; i++) expect((await post(body, { headers: { 'x-forwarded-for': `198.51.100.${i}` } })).res.status).toBe(200);
    const refused = await post(body);
    expect(refused.res.status).toBe(429);
    expect(refused.body.error.message).toMatch(/not signed in/);

    const user = await makeUser('planner');
    const mine = await calculations.POST(request('POST', PATH, { body, user }), ctx({}));
    expect(mine.status).toBe(200);
  });
});

describe('the OpenAPI document', () => {
  type Op = {
    security: unknown[];
    requestBody: { content: Record<string, { examples: Record<string, { value: unknown }> }> };
    responses: Record<string, { content?: Record<string, { examples?: Record<string, { value: unknown }> }> }>;
  };
  const doc = openApiDocument() as unknown as { paths: Record<string, Record<string, Op>> };
  const op = doc.paths['/api/v1/calculations']!.post!;

  it('marks the route public and lists the answers it can give', () => {
    expect(op.security).toEqual([]);
    expect(Object.keys(op.responses).sort()).toEqual(['200', '400', '403', '413', '429']);
  });

  it('has an example request per kind, and each example answer is what the route answers now', async () => {
    const requests = op.requestBody.content['application/json']!.examples;
    const responses = op.responses['200']!.content!['application/json']!.examples!;
    expect(Object.keys(requests).sort()).toEqual([...CALCULATION_KINDS].sort());
    expect(Object.keys(responses).sort()).toEqual([...CALCULATION_KINDS].sort());
    for (const kind of CALCULATION_KINDS) {
      const { res, body } = await post(requests[kind]!.value);
      expect(res.status, kind).toBe(200);
      expect(JSON.parse(JSON.stringify(responses[kind]!.value)), kind).toEqual(body);
    }
  });
});
