/**
 * The bad input that answered 500 before: a path id that is not a UUID (a member's userId, an
 * invitation id of 36 dashes, percent-encoded junk), and NUL or a lone UTF-16 surrogate in a text
 * field — PostgreSQL refuses NUL in text and JSON, and a lone surrogate in JSON. Each now gets a
 * 404 (an address that names nothing) or a 400 whose field error says what to fix, and nothing is
 * written. The server actions of the sign-in forms answer such input with field errors too.
 */
import { sql } from 'kysely';
import { describe, expect, it, vi } from 'vitest';
import { CLASSROOM_DESIGN } from '@/db/demo/designs';
import { db } from '@/lib/db';
import { DATABASE_INPUT_MESSAGE } from '@/lib/errors';
import * as calculations from '@/app/api/v1/calculations/route';
import * as invitation from '@/app/api/v1/invitations/[invitationId]/route';
import * as accept from '@/app/api/v1/invitations/accept/route';
import * as simulation from '@/app/api/v1/simulations/[simulationId]/route';
import * as simulations from '@/app/api/v1/simulations/route';
import * as studies from '@/app/api/v1/studies/route';
import * as study from '@/app/api/v1/studies/[studyId]/route';
import * as design from '@/app/api/v1/studies/[studyId]/design/route';
import * as notes from '@/app/api/v1/studies/[studyId]/finding-notes/route';
import * as studyMember from '@/app/api/v1/studies/[studyId]/members/[userId]/route';
import * as plans from '@/app/api/v1/studies/[studyId]/plans/route';
import * as workspaces from '@/app/api/v1/workspaces/route';
import * as wsMember from '@/app/api/v1/workspaces/[workspaceId]/members/[userId]/route';
import { actorFromSessionToken } from '@/lib/auth/session';
import { ctx, makeWorld, request, type World } from '../support/fixtures';

// The auth actions import next-auth and next/headers, which need a running Next server; the
// parts that read input are what is tested here.
vi.mock('next/headers', () => ({ headers: async () => new Headers() }));
vi.mock('next-auth', () => ({ AuthError: class AuthError extends Error {} }));
vi.mock('@/lib/auth/next-auth', () => ({ signIn: vi.fn(async () => undefined), signOut: vi.fn(async () => undefined) }));
const actions = await import('@/app/(auth)/actions');

type Handler = (req: Request, c: ReturnType<typeof ctx>) => Promise<Response>;

/** Rows of every table of ours: a refused request changes none. */
async function rowCounts(): Promise<Record<string, number>> {
  const { rows } = await sql<{ name: string }>`
    select tablename as name from pg_tables where schemaname = 'public' and tablename not like 'kysely_%' and tablename <> 'rate_limits'`.execute(db());
  const counts: Record<string, number> = {};
  for (const { name } of rows) {
    const r = await sql<{ n: number }>`select count(*)::int as n from ${sql.table(name)}`.execute(db());
    counts[name] = r.rows[0]!.n;
  }
  return counts;
}

async function call(handler: Handler, method: string, params: Record<string, string>, options: Parameters<typeof request>[2] = {}, query = '') {
  const res = await handler(request(method, `/api/v1/x${query}`, options), ctx(params));
  return { status: res.status, body: res.status === 204 ? null : await res.json() };
}

describe('path parameters that are not ids', () => {
  const cases: [string, (w: World) => [Handler, string, Record<string, string>, unknown?], string][] = [
    ['DELETE a study member "abc"', (w) => [studyMember.DELETE, 'DELETE', { studyId: w.studyId, userId: 'abc' }], 'userId'],
    ['PATCH a study member "abc"', (w) => [studyMember.PATCH, 'PATCH', { studyId: w.studyId, userId: 'abc' }, { role: 'viewer' }], 'userId'],
    ['DELETE a workspace member "abc"', (w) => [wsMember.DELETE, 'DELETE', { workspaceId: w.workspaceId, userId: 'abc' }], 'userId'],
    ['PATCH a workspace member of 36 dashes', (w) => [wsMember.PATCH, 'PATCH', { workspaceId: w.workspaceId, userId: '-'.repeat(36) }, { role: 'admin' }], 'userId'],
    ['DELETE an invitation of 36 dashes', () => [invitation.DELETE, 'DELETE', { invitationId: '-'.repeat(36) }], 'invitationId'],
    ['GET a study of percent-encoded junk', () => [study.GET, 'GET', { studyId: '%E0%A4%A' }], 'studyId'],
    ['GET a study id with a NUL', (w) => [study.GET, 'GET', { studyId: `${w.studyId}\u0000` }], 'studyId'],
    ['GET a study id with a lone surrogate', (w) => [study.GET, 'GET', { studyId: `${w.studyId.slice(0, 35)}\uD800` }], 'studyId'],
    ['GET a stress test "not-a-uuid"', () => [simulation.GET, 'GET', { simulationId: 'not-a-uuid' }], 'simulationId'],
  ];

  it.each(cases)('%s → 404 naming the parameter, nothing changed', async (_label, make, param) => {
    const w = await makeWorld();
    const [handler, method, params, body] = make(w);
    const before = await rowCounts();
    const r = await call(handler, method, params, { user: w.byRole.owner, body });
    expect(r.status).toBe(404);
    expect(r.body.error.code).toBe('not_found');
    expect(Object.keys(r.body.error.fields)).toEqual([param]);
    expect(r.body.error.message).toMatch(/was not found: the address does not hold a valid id/);
    expect(await rowCounts()).toEqual(before);
  });

  it('signed out, a bad id still answers 401 first, as every route answers 401 before anything else', async () => {
    const w = await makeWorld();
    expect((await call(studyMember.DELETE, 'DELETE', { studyId: w.studyId, userId: 'abc' })).status).toBe(401);
    expect((await call(studyMember.DELETE, 'DELETE', { studyId: w.studyId, userId: 'abc' }, { user: w.byRole.owner })).status).toBe(404);
  });
});

describe('NUL and lone surrogates in text fields', () => {
  const NUL = 'Reading\u0000 score';
  const HALF = 'Reading \uD83D score';
  const outcome = (name: string) => ({ baseRevision: 1, design: { ...CLASSROOM_DESIGN, outcome: { ...CLASSROOM_DESIGN.outcome, name } } });
  const level = (name: string) => ({
    baseRevision: 1,
    design: { ...CLASSROOM_DESIGN, structure: { levels: [{ ...CLASSROOM_DESIGN.structure!.levels![0]!, name }, CLASSROOM_DESIGN.structure!.levels![1]!] } },
  });
  const note = (key: string, reason = 'Handled by a random intercept.') => ({ ruleId: 'unit-of-analysis', key, status: 'addressed', reason });
  const spec = (name: string) => ({
    spec: { design: { arms: 2, unitsPerArm: 20 }, truth: { effect: 0.5, sd: 1 }, scenarios: [{ violation: 'none', name }], analyses: ['ols'], replicates: 100 },
  });

  const cases: [string, (w: World) => [Handler, string, Record<string, string>, unknown, string?], string][] = [
    ['workspace name, NUL', () => [workspaces.POST, 'POST', {}, { name: NUL }], 'name'],
    ['workspace name, lone surrogate', () => [workspaces.POST, 'POST', {}, { name: HALF }], 'name'],
    ['study title, NUL', (w) => [studies.POST, 'POST', {}, { workspaceId: w.workspaceId, title: NUL }], 'title'],
    ['study description, lone surrogate', (w) => [study.PATCH, 'PATCH', { studyId: w.studyId }, { description: HALF }], 'description'],
    ['design outcome name, NUL', (w) => [design.PUT, 'PUT', { studyId: w.studyId }, outcome(NUL)], 'design.outcome.name'],
    ['design outcome name, lone surrogate', (w) => [design.PUT, 'PUT', { studyId: w.studyId }, outcome(HALF)], 'design.outcome.name'],
    ['design level name, lone surrogate', (w) => [design.PUT, 'PUT', { studyId: w.studyId }, level(HALF)], 'design.structure.levels.0.name'],
    ['finding-note key, NUL', (w) => [notes.POST, 'POST', { studyId: w.studyId }, note('class\u0000room')], 'key'],
    ['finding-note key, lone surrogate', (w) => [notes.POST, 'POST', { studyId: w.studyId }, note('class\uDC00room')], 'key'],
    ['finding-note reason, lone surrogate', (w) => [notes.POST, 'POST', { studyId: w.studyId }, note('classroom', HALF)], 'reason'],
    ['search query q, NUL', (w) => [studies.GET, 'GET', {}, undefined, `?workspaceId=${w.workspaceId}&q=read%00ing`], 'q'],
    ['plan note, lone surrogate', (w) => [plans.POST, 'POST', { studyId: w.studyId }, { request: { kind: 'two-group-means', delta: 3, sd: 10, power: 0.8 }, note: HALF }], 'note'],
    ['calculation solveFor, NUL', () => [calculations.POST, 'POST', {}, { kind: 'two-group-means', delta: 3, sd: 10, power: 0.8, solveFor: 'nPer\u0000Group' }], 'solveFor'],
    ['stress-test scenario name, lone surrogate', () => [simulations.POST, 'POST', {}, spec(HALF)], 'spec.scenarios.0.name'],
    ['invitation token, NUL', () => [accept.POST, 'POST', {}, { token: `${'a'.repeat(40)}\u0000` }], 'token'],
  ];

  it.each(cases)('%s → 400 with a field error that says what to fix, nothing saved', async (_label, make, field) => {
    const w = await makeWorld();
    const [handler, method, params, body, query] = make(w);
    const before = await rowCounts();
    const r = await call(handler, method, params, { user: w.byRole.owner, body }, query);
    expect(r.status).toBe(400);
    expect(r.body.error.fields[field]).toEqual([expect.stringMatching(/contains an invisible NUL character: remove it|contains a broken character \(half of an emoji or symbol\): retype it or remove it/)]);
    expect(r.body.error.message).not.toBe(DATABASE_INPUT_MESSAGE);
    expect(await rowCounts()).toEqual(before);
  });

  it('refuses half of an emoji but keeps whole emoji and every script', async () => {
    const w = await makeWorld();
    expect((await call(workspaces.POST, 'POST', {}, { user: w.byRole.owner, body: { name: 'Λέσχη 読書 \uD83C lab' } })).status).toBe(400);
    const r = await workspaces.POST(request('POST', '/api/v1/workspaces', { user: w.byRole.owner, body: { name: 'Λέσχη 読書 🌱 lab' } }), ctx({}));
    expect(r.status).toBe(201);
    expect((await r.json()).name).toBe('Λέσχη 読書 🌱 lab');
  });
});

describe('the sign-in, sign-up and reset actions', () => {
  const PASSWORD = 'correct horse battery staple';
  const cases: [string, () => Promise<{ status: string; fields?: Record<string, string[]> }>, string][] = [
    ['sign-up, NUL in the name', () => actions.signUpAction({ name: 'A\u0000da', email: 'ada@example.org', password: PASSWORD }), 'name'],
    ['sign-up, half an emoji in the name', () => actions.signUpAction({ name: 'Ada \uD83D', email: 'ada@example.org', password: PASSWORD }), 'name'],
    ['sign-up, NUL in the return address', () => actions.signUpAction({ name: 'Ada', email: 'ada@example.org', password: PASSWORD, callbackUrl: '/studies\u0000' }), 'callbackUrl'],
    ['sign-in, half an emoji in the password', () => actions.signInAction({ email: 'ada@example.org', password: 'pass\uD800word' }), 'password'],
    ['sign-in link, NUL in the return address', () => actions.magicLinkAction({ email: 'ada@example.org', callbackUrl: '\u0000' }), 'callbackUrl'],
    ['reset, half an emoji in the token', () => actions.resetPasswordAction({ token: `${'a'.repeat(30)}\uD800`, password: PASSWORD, confirm: PASSWORD }), 'token'],
    ['reset, NUL in the new password', () => actions.resetPasswordAction({ token: 'a'.repeat(43), password: `${PASSWORD}\u0000`, confirm: `${PASSWORD}\u0000` }), 'password'],
  ];

  it.each(cases)('%s → an error state naming the field, nothing stored', async (_label, run, field) => {
    const before = await rowCounts();
    const state = await run();
    expect(state.status).toBe('error');
    expect(state.fields?.[field]).toEqual([expect.stringMatching(/invisible NUL character|broken character/)]);
    expect(await rowCounts()).toEqual(before);
  });
});

describe('a session cookie that names no session', () => {
  // A broken %-escape made the cookie's decoding throw (500); NUL reached PostgreSQL (400 on the
  // API, 500 on every page that reads the session). Neither is a session: 401, like a stale one.
  const values = ['%ZZ', '%', '%00', 'abc%00def', '%ED%A0%80', 'a b', `${'a'.repeat(201)}`];

  it.each(values)('authjs.session-token=%s → 401 from the API', async (value) => {
    for (const name of ['authjs.session-token', '__Secure-authjs.session-token']) {
      const r = await call(studies.GET, 'GET', {}, { headers: { cookie: `${name}=${value}` } });
      expect(r.status).toBe(401);
      expect(r.body.error.code).toBe('unauthorized');
    }
  });

  it.each(['\u0000', 'abc\u0000', '\uD800', 'a;b', ''])('the decoded token %j names nobody, without asking PostgreSQL', async (token) => {
    await expect(actorFromSessionToken(token)).resolves.toBeNull();
  });
});

describe('sign-in while the database is down', () => {
  it('says the database is not reachable, not "something went wrong"', async () => {
    const { signIn } = await import('@/lib/auth/next-auth');
    const { AuthError } = await import('next-auth');
    // What next-auth throws when authorize() fails: a CallbackRouteError whose cause is { err, provider }.
    const refused = Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:5432'), { code: 'ECONNREFUSED', syscall: 'connect' });
    const wrapped = Object.assign(new AuthError(), { type: 'CallbackRouteError', cause: { err: refused, provider: 'credentials' } });
    vi.mocked(signIn).mockRejectedValueOnce(wrapped);
    const state = await actions.signInAction({ email: 'ada@example.org', password: 'correct horse battery staple' });
    expect(state).toMatchObject({ status: 'error', message: 'The database is not reachable right now. Try again in a moment.' });
  });
});
