/// <reference types="vite/client" />
/**
 * Fuzzing every route under app/api/v1, every method: 10 batches of 50 generated requests per route
 * and method (fast-check, fixed seeds), each sent to the route handler directly with a Request, as one of
 * the study's members by role, a workspace member outside the study, an outsider, a stale session
 * or nobody. Bodies start from valid examples and are mutated (wrong types, huge and unparseable
 * numbers, NUL and lone surrogates, deep nesting, huge arrays, long strings, __proto__ keys) or
 * replaced by junk; path parameters are known ids, random UUIDs, 36 dashes, percent-encoded junk
 * or broken text; queries likewise.
 *
 * After every request:
 * - no 5xx, and every 4xx carries the JSON error shape;
 * - the row count of every table (public, and pg-boss's jobs) changed by exactly what the answer
 *   says was created: nothing for a non-2xx, the documented rows for a 2xx (EXPECTED below);
 * - the net in lib/errors.ts for input PostgreSQL refuses (DATABASE_INPUT_MESSAGE) never fired:
 *   the schemas catch every such value first.
 * The counts, the status histogram and the routes covered are printed at the end. For a longer
 * run locally: FUZZ_BATCHES=50 (batches of FUZZ_RUNS requests, seeds SEED + 1 … SEED + n).
 */
import fc from 'fast-check';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { CLASSROOM_DESIGN, SLEEP_DESIGN } from '@/db/demo/designs';
import { CALCULATION_EXAMPLES } from '@/lib/api/calculation-examples';
import { insertSignoff } from '@/db/repositories/signoffs';
import { upsertStudyMember } from '@/db/repositories/studies';
import { upsertWorkspaceMember } from '@/db/repositories/workspaces';
import { API_ROUTES } from '@/lib/api/openapi';
import { db } from '@/lib/db';
import { unsubscribeToken } from '@/lib/notifications/unsubscribe-token';
import { createThread } from '@/lib/data/threads';
import { createSuggestion } from '@/lib/data/suggestions';
import { DATABASE_INPUT_MESSAGE } from '@/lib/errors';
import { inviteToStudy } from '@/lib/data/invitations';
import { deliverWaitingMail } from '@/lib/mail/queue';
import { createSimulation } from '@/lib/data/simulations';
import { getBoss, stopBoss } from '@/lib/jobs/boss';
import { simulationRunSchema } from '@/lib/validation/simulation-run';
import { BASE, makeUser, makeWorld, SMALL_SPEC, type TestUser } from '../support/fixtures';
import { sentMail } from '../support/mail';

const BATCHES = Number(process.env.FUZZ_BATCHES ?? 10);
/** Fixed; adding routes reshuffles which cases each route gets (20261209: review threads, versions, sign-offs and notifications added). */
const SEED = 20_261_209;

// ------------------------------------------------------------------ the routes, from the files

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response> | Response;
interface Route {
  key: string;
  method: string;
  path: string;
  params: string[];
  handler: Handler;
}

const modules = import.meta.glob<Record<string, unknown>>('/app/api/v1/**/route.ts', { eager: true });
const ROUTES: Route[] = Object.entries(modules)
  .flatMap(([file, mod]) => {
    const path = file.replace(/^\/app/, '').replace(/\/route\.ts$/, '').replace(/\[(\w+)\]/g, '{$1}');
    const params = [...file.matchAll(/\[(\w+)\]/g)].map((m) => m[1]!);
    return ['GET', 'POST', 'PUT', 'PATCH', 'DELETE']
      .filter((method) => typeof mod[method] === 'function')
      .map((method) => ({ key: `${method} ${path}`, method, path, params, handler: mod[method] as Handler }));
  })
  .sort((a, b) => a.key.localeCompare(b.key));

/**
 * Requests per batch: 50 per route and method, so that each route keeps its share of the run as
 * routes are added (a write reached past its checks in every run — a sign-off, an owner changing a
 * workspace role, accepting an invitation — needs about that many tries).
 */
const RUNS_PER_BATCH = Number(process.env.FUZZ_RUNS ?? 50 * ROUTES.length);

// ------------------------------------------------------------------ what a 2xx may change

/** Per table: the exact change, or a [min, max] range where it depends on the state. */
type Delta = Record<string, number | [number, number]>;

/** What telling the study's members may add: a notification each, and an e-mail with its job for those told at once. */
const TOLD: Delta = { notifications: [0, 20], mail: [0, 20], 'pgboss.job': [0, 20] };

/** The rows each successful answer creates or removes; every other table must not change. */
const EXPECTED: Record<string, (body: Record<string, unknown>) => Delta> = {
  'POST /api/v1/workspaces': () => ({ workspaces: 1, workspace_members: 1, activity_log: 1 }),
  'PATCH /api/v1/workspaces/{workspaceId}/members/{userId}': () => ({ activity_log: 1 }),
  // Leaving a workspace ends the person's study memberships in it.
  'DELETE /api/v1/workspaces/{workspaceId}/members/{userId}': () => ({ workspace_members: -1, study_members: [-1_000, 0], activity_log: 1 }),
  // An invitation queues its e-mail (a mail row and its pg-boss job) in the same transaction.
  'POST /api/v1/workspaces/{workspaceId}/invitations': () => ({ invitations: 1, mail: 1, 'pgboss.job': 1, activity_log: 1 }),
  'POST /api/v1/studies': () => ({ studies: 1, study_members: 1, study_revisions: 1, study_versions: 1, activity_log: 1 }),
  'PATCH /api/v1/studies/{studyId}': () => ({ activity_log: 1 }),
  // Archiving an archived study (restoring an active one) answers the study as it is.
  'POST /api/v1/studies/{studyId}/archive': () => ({ activity_log: [0, 1] }),
  'POST /api/v1/studies/{studyId}/restore': () => ({ activity_log: [0, 1] }),
  'PATCH /api/v1/studies/{studyId}/members/{userId}': () => ({ activity_log: 1 }),
  'DELETE /api/v1/studies/{studyId}/members/{userId}': () => ({ study_members: -1, activity_log: 1 }),
  'POST /api/v1/studies/{studyId}/invitations': () => ({ invitations: 1, mail: 1, 'pgboss.job': 1, activity_log: 1 }),
  // A save continues its author's open version or opens a new one.
  'PUT /api/v1/studies/{studyId}/design': () => ({ study_revisions: 1, study_versions: [0, 1], activity_log: 1 }),
  'PATCH /api/v1/studies/{studyId}/versions/{version}': () => ({ activity_log: 1 }),
  'POST /api/v1/studies/{studyId}/versions/{version}/restore': () => ({ study_revisions: 1, study_versions: 1, activity_log: 1 }),
  // Signing off names the version first when the request names it; owners, editors and writers are
  // told (a notification each, and an e-mail with its job for those who take them at once).
  'POST /api/v1/studies/{studyId}/signoffs': () => ({ study_signoffs: 1, activity_log: [1, 2], ...TOLD }),
  'POST /api/v1/studies/{studyId}/signoffs/{signoffId}/withdraw': () => ({ activity_log: 1, ...TOLD }),
  // Review threads: a thread is its first comment; mentions, replies and suggestions tell members.
  'POST /api/v1/studies/{studyId}/threads': () => ({ review_threads: 1, review_comments: 1, activity_log: 1, ...TOLD }),
  // A reply to a resolved thread reopens it.
  'POST /api/v1/studies/{studyId}/threads/{threadId}/replies': () => ({ review_comments: 1, activity_log: [1, 2], ...TOLD }),
  'POST /api/v1/studies/{studyId}/threads/{threadId}/resolve': () => ({ activity_log: [0, 1] }),
  'POST /api/v1/studies/{studyId}/threads/{threadId}/reopen': () => ({ activity_log: [0, 1] }),
  'POST /api/v1/studies/{studyId}/suggestions': () => ({ review_suggestions: 1, activity_log: 1, ...TOLD }),
  // Accepting saves the design: a revision, a version of its own (closing the open one first).
  'POST /api/v1/studies/{studyId}/suggestions/{suggestionId}/accept': () => ({ study_revisions: 1, study_versions: [0, 1], activity_log: [1, 3], ...TOLD }),
  'POST /api/v1/studies/{studyId}/suggestions/{suggestionId}/decline': () => ({ activity_log: 1, ...TOLD }),
  'POST /api/v1/studies/{studyId}/finding-notes': () => ({ finding_notes: 1, activity_log: 1 }),
  'POST /api/v1/studies/{studyId}/plans': () => ({ plan_results: 1, activity_log: 1 }),
  'DELETE /api/v1/invitations/{invitationId}': () => ({ activity_log: 1 }),
  'POST /api/v1/invitations/{invitationId}/resend': () => ({ mail: 1, 'pgboss.job': 1, activity_log: 1 }),
  // Joining: the membership rows are upserts (0 when already a member).
  'POST /api/v1/invitations/accept': () => ({ workspace_members: [0, 1], study_members: [0, 1], activity_log: 1 }),
  'POST /api/v1/simulations': (b) => ({ simulations: 1, 'pgboss.job': Number(b.chunkCount), activity_log: b.studyId ? 1 : 0 }),
  // Cancelling a run that has already ended answers it as it is.
  'DELETE /api/v1/simulations/{simulationId}': () => ({ activity_log: [0, 1] }),
  // Downloading the activity log is itself logged.
  'GET /api/v1/studies/{studyId}/activity/export': () => ({ activity_log: 1 }),
  // A setting is a row per person and kind, written on first change (upserts after).
  'PUT /api/v1/me/notification-settings': () => ({ notification_settings: [0, 6] }),
  'POST /api/v1/unsubscribe/{token}': () => ({ notification_settings: [0, 6] }),
};

/** Tables whose rows are bookkeeping of attempts, refused ones included: the rate limiter's. */
const NOT_DATA = new Set(['rate_limits']);

async function countedTables(): Promise<string[]> {
  const { rows } = await sql<{ name: string }>`
    select tablename as name from pg_tables
    where schemaname = 'public' and tablename not like 'kysely_%' order by 1`.execute(db());
  const tables = rows.map((r) => r.name).filter((t) => !NOT_DATA.has(t));
  const { rows: boss } = await sql<{ t: string | null }>`select to_regclass('pgboss.job')::text as t`.execute(db());
  return boss[0]?.t ? [...tables, 'pgboss.job'] : tables;
}

/** Every table's row count, in one statement. */
async function counts(tables: string[]): Promise<Record<string, number>> {
  const ident = (t: string) =>
    t
      .split('.')
      .map((p) => `"${p}"`)
      .join('.');
  const select = tables.map((t, i) => `(select count(*) from ${ident(t)})::int as c${i}`).join(', ');
  const { rows } = await sql.raw<Record<string, number>>(`select ${select}`).execute(db());
  return Object.fromEntries(tables.map((t, i) => [t, rows[0]![`c${i}`]!]));
}

function unexpectedChanges(before: Record<string, number>, after: Record<string, number>, expected: Delta): string[] {
  const problems: string[] = [];
  for (const table of new Set([...Object.keys(before), ...Object.keys(after)])) {
    const change = (after[table] ?? 0) - (before[table] ?? 0);
    const want = expected[table] ?? 0;
    const ok = typeof want === 'number' ? change === want : change >= want[0] && change <= want[1];
    if (!ok) problems.push(`${table} changed by ${change}, expected ${JSON.stringify(want)}`);
  }
  return problems;
}

// ------------------------------------------------------------------ generators

/** Written as is into the JSON text: numbers JSON can spell but JavaScript cannot keep, deep nesting. */
class Raw {
  constructor(readonly text: string) {}
}

function serialize(v: unknown): string {
  if (v instanceof Raw) return v.text;
  if (Array.isArray(v)) return `[${Array.from(v, serialize).join(',')}]`;
  if (v !== null && typeof v === 'object') {
    return `{${Object.keys(v)
      .map((k) => `${JSON.stringify(k)}:${serialize((v as Record<string, unknown>)[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(v) ?? 'null';
}

/** Own properties only, so that a "__proto__" key stays a key. */
function setOwn(target: object, key: string | number, value: unknown) {
  Object.defineProperty(target, key, { value, enumerable: true, writable: true, configurable: true });
}

function clone(v: unknown): unknown {
  if (v instanceof Raw || v === null || typeof v !== 'object') return v;
  if (Array.isArray(v)) return Array.from(v, clone); // not v.map: an own "constructor" key would be used
  const out = {};
  for (const k of Object.keys(v)) setOwn(out, k, clone((v as Record<string, unknown>)[k]));
  return out;
}

/** Any UTF-16 code unit: NUL, control characters and lone surrogates included. */
const anyUnit = fc.integer({ min: 0, max: 0xffff }).map((c) => String.fromCharCode(c));

const BAD_STRINGS = [
  '',
  ' ',
  'NaN',
  'Infinity',
  '-Infinity',
  '1e309',
  '0x10',
  '1',
  'true',
  'null',
  '\u0000',
  'a\u0000b',
  '\uD800',
  'x\uDC00',
  '\uDC00\uD800',
  '🙂',
  '%00',
  '%E0%A4%A',
  "'; drop table studies; --",
  '<script>alert(1)</script>',
  '__proto__',
  'constructor',
  '00000000-0000-0000-0000-000000000000',
  '-'.repeat(36),
];

const PROTO_OBJECTS = [
  JSON.parse('{"__proto__": {"isAdmin": true, "role": "owner"}}') as unknown,
  JSON.parse('{"constructor": {"prototype": {"polluted": true}}}') as unknown,
  JSON.parse('{"__proto__": null, "toString": "x", "valueOf": 1}') as unknown,
];

const junk: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 3, arbitrary: fc.constantFrom<unknown>(null, true, false, 0, -1, 1.5, -0, 2 ** 31, 2 ** 53 + 2, Number.MAX_SAFE_INTEGER, -Number.MAX_VALUE, 5e-324) },
  { weight: 2, arbitrary: fc.constantFrom(new Raw('1e999'), new Raw('-1e999'), new Raw('1e-999'), new Raw('123456789012345678901234567890'), new Raw('-0.0')) },
  { weight: 4, arbitrary: fc.constantFrom(...BAD_STRINGS) },
  { weight: 3, arbitrary: fc.string({ unit: anyUnit, maxLength: 30 }) },
  { weight: 1, arbitrary: fc.integer({ min: 1_000, max: 300_000 }).map((n) => 'a'.repeat(n)) },
  { weight: 1, arbitrary: fc.integer({ min: 1_000, max: 60_000 }).map((n) => new Array<number>(n).fill(1)) },
  { weight: 1, arbitrary: fc.integer({ min: 100, max: 20_000 }).map((n) => new Raw('['.repeat(n) + ']'.repeat(n))) },
  { weight: 1, arbitrary: fc.integer({ min: 100, max: 5_000 }).map((n) => new Raw('{"a":'.repeat(n) + '1' + '}'.repeat(n))) },
  { weight: 2, arbitrary: fc.constantFrom(...PROTO_OBJECTS) },
  { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
);

interface Mutation {
  at: number;
  op: 'replace' | 'delete' | 'insert';
  key: string;
  value: unknown;
}

const mutation: fc.Arbitrary<Mutation> = fc.record({
  at: fc.nat(),
  op: fc.constantFrom<Mutation['op']>('replace', 'replace', 'delete', 'insert'),
  key: fc.oneof(fc.constantFrom('__proto__', 'constructor', 'prototype', 'extra', 'id', 'role', 'toString'), fc.string({ unit: anyUnit, maxLength: 8 })),
  value: junk,
});

type Path = (string | number)[];

/** Paths of every value in `v` (the root included); long arrays are not entered. */
function paths(v: unknown, at: Path = [], out: Path[] = []): Path[] {
  out.push(at);
  if (v instanceof Raw || v === null || typeof v !== 'object') return out;
  if (Array.isArray(v)) {
    if (v.length <= 50) v.forEach((x, i) => paths(x, [...at, i], out));
  } else for (const k of Object.keys(v)) paths((v as Record<string, unknown>)[k], [...at, k], out);
  return out;
}

function mutate(base: unknown, mutations: Mutation[]): unknown {
  let root = clone(base);
  for (const { value: shared, ...m } of mutations) {
    const value = clone(shared); // junk values are shared between cases: never insert one into itself
    const all = paths(root);
    const path = all[m.at % all.length]!;
    if (path.length === 0) {
      if (m.op === 'replace') root = value;
      else if (m.op === 'insert' && root !== null && typeof root === 'object' && !(root instanceof Raw)) setOwn(root, Array.isArray(root) ? root.length : m.key, value);
      continue;
    }
    const parent = path.slice(0, -1).reduce<unknown>((o, k) => (o as Record<string | number, unknown>)[k], root) as Record<string | number, unknown>;
    const last = path[path.length - 1]!;
    const target = parent[last];
    if (m.op === 'replace') setOwn(parent, last, value);
    else if (m.op === 'delete') {
      if (Array.isArray(parent)) {
        // Not splice: it would use an own "constructor" key put there by an earlier mutation.
        for (let i = Number(last); i < parent.length - 1; i++) parent[i] = parent[i + 1];
        parent.length -= 1;
      }
      else delete parent[last];
    } else if (target !== null && typeof target === 'object' && !(target instanceof Raw)) {
      setOwn(target, Array.isArray(target) ? target.length : m.key, value);
    } else setOwn(parent, m.key, value);
  }
  return root;
}

const CALCULATIONS = Object.values(CALCULATION_EXAMPLES).map((e) => e.request);

/**
 * Valid bodies per route. Placeholders are resolved when the request is sent: '$workspaceId',
 * '$studyId' and '$email' from what exists, '$revision' as the study's newest revision, '$token'
 * as the token of an invitation mailed earlier.
 */
const BODIES: Record<string, unknown[]> = {
  'POST /api/v1/calculations': CALCULATIONS,
  'POST /api/v1/workspaces': [{ name: 'Harrow Vale soil lab' }],
  'PATCH /api/v1/workspaces/{workspaceId}/members/{userId}': [{ role: 'admin' }, { role: 'member' }],
  'POST /api/v1/workspaces/{workspaceId}/invitations': [{ email: '$email', role: 'member' }, { email: '$email', role: 'admin' }],
  'POST /api/v1/studies': [{ workspaceId: '$workspaceId', title: 'Greenhouse trial of two substrates', description: 'Trays share light.' }],
  'PATCH /api/v1/studies/{studyId}': [{ title: 'Reading-support programme, second year' }, { description: 'Now with a waiting-list control.' }, { description: null }],
  'PATCH /api/v1/studies/{studyId}/members/{userId}': [{ role: 'editor' }, { role: 'viewer' }, { role: 'consultant' }],
  'POST /api/v1/studies/{studyId}/invitations': [{ email: '$email', role: 'viewer' }],
  'PUT /api/v1/studies/{studyId}/design': [
    { baseRevision: '$revision', design: CLASSROOM_DESIGN, note: 'Classrooms as clusters' },
    { baseRevision: '$revision', design: SLEEP_DESIGN },
  ],
  'POST /api/v1/studies/{studyId}/checks': [{}, { design: CLASSROOM_DESIGN }],
  'POST /api/v1/studies/{studyId}/finding-notes': [{ ruleId: 'unit-of-analysis', key: 'level-classroom', status: 'addressed', reason: 'The analysis uses classroom means.' }],
  'POST /api/v1/studies/{studyId}/plans': CALCULATIONS.map((request) => ({ request, revision: '$revision', note: 'From the Plan tab' })),
  'POST /api/v1/invitations/accept': [{ token: '$token' }],
  'POST /api/v1/simulations': [{ spec: SMALL_SPEC }, { studyId: '$studyId', spec: SMALL_SPEC }],
  'PATCH /api/v1/studies/{studyId}/versions/{version}': [{ name: 'Sent to the funder' }, { name: null }],
  'POST /api/v1/studies/{studyId}/signoffs': [{ version: 1, name: 'Ethics board v2', statement: 'Reviewed the design and the Plan.', conditions: 'Report the ICC.' }, { version: 1, name: 'Sent to the funder', statement: 'Reviewed.' }],
  'POST /api/v1/studies/{studyId}/signoffs/{signoffId}/withdraw': [{ reason: 'The ICC changed.' }],
  'PUT /api/v1/me/notification-settings': [{ reply: 'none' }, { mention: 'digest', signoff: 'immediate' }],
  'POST /api/v1/unsubscribe/{token}': [{}],
  'POST /api/v1/studies/{studyId}/threads': [{ anchor: { kind: 'section', part: 'outcome' }, body: 'Which outcome is primary?' }, { anchor: { kind: 'field', path: 'outcome.unit' }, body: 'Name the unit.' }],
  'POST /api/v1/studies/{studyId}/threads/{threadId}/replies': [{ body: 'Agreed.' }],
  'POST /api/v1/studies/{studyId}/threads/{threadId}/resolve': [{}],
  'POST /api/v1/studies/{studyId}/suggestions': [{ path: 'outcome.unit', value: 'points', reason: 'Name the unit of the score.' }, { path: 'outcome.name', value: 'Reading score', reason: 'Name the outcome.' }],
  'POST /api/v1/studies/{studyId}/suggestions/{suggestionId}/accept': [{}],
  'POST /api/v1/studies/{studyId}/suggestions/{suggestionId}/decline': [{ reason: 'Already settled.' }],
};

/** Valid queries per route ('$workspaceId' is resolved when sent). */
const QUERIES: Record<string, Record<string, string[]>> = {
  'GET /api/v1/studies': {
    workspaceId: ['$workspaceId'],
    q: ['reading', 'trial'],
    status: ['active', 'archived', 'all', 'draft'],
    sort: ['title', 'status', 'role', 'updated', 'created'],
    dir: ['asc', 'desc'],
    page: ['1', '2'],
    pageSize: ['1', '20', '100'],
  },
  'GET /api/v1/studies/{studyId}/simulations/spec': { revision: ['1', '2'] },
  'GET /api/v1/studies/{studyId}/versions/compare': { from: ['1', '2'], to: ['1', '2'] },
  'GET /api/v1/studies/{studyId}/activity': { kind: ['comments', 'edits'], from: ['2026-01-01'], to: ['2030-12-31'], page: ['1', '2'] },
  'GET /api/v1/studies/{studyId}/activity/export': { kind: ['members', 'exports'], from: ['2026-01-01'], to: ['2030-12-31'] },
};

const ACTORS = ['owner', 'editor', 'consultant', 'writer', 'viewer', 'workspaceOnly', 'target', 'outsider', 'signedOut', 'staleSession'] as const;
type ActorName = (typeof ACTORS)[number];

type ParamValue = { kind: 'known'; pick: number } | { kind: 'any-id'; pick: number } | { kind: 'raw'; value: string };

const uuidLike = fc.string({ unit: fc.constantFrom(...'0123456789abcdef-'), minLength: 36, maxLength: 36 });
const paramValue: fc.Arbitrary<ParamValue> = fc.oneof(
  { weight: 8, arbitrary: fc.nat().map((pick) => ({ kind: 'known' as const, pick })) },
  { weight: 1, arbitrary: fc.nat().map((pick) => ({ kind: 'any-id' as const, pick })) },
  {
    weight: 4,
    arbitrary: fc
      .oneof(
        fc.uuid(),
        uuidLike,
        fc.constantFrom(...BAD_STRINGS, '%', '%zz', '..%2F..%2Fetc%2Fpasswd', '%ED%A0%80', 'a'.repeat(10_000)),
        fc.uuid().map((u) => `${u}\u0000`),
        fc.uuid().map((u) => `${u.slice(0, 35)}\uD800`),
        fc.uuid().map((u) => ` ${u.toUpperCase()} `),
        fc.string({ unit: anyUnit, maxLength: 40 }),
      )
      .map((value) => ({ kind: 'raw' as const, value })),
  },
);

type BodyCase = { kind: 'none' } | { kind: 'raw'; text: string } | { kind: 'json'; base: number; mutations: Mutation[] };

const bodyCase: fc.Arbitrary<BodyCase> = fc.oneof(
  // A third of the JSON bodies are valid, to reach past validation; the rest carry 1 to 3 mutations.
  {
    weight: 14,
    arbitrary: fc.record({
      kind: fc.constant('json' as const),
      base: fc.nat(),
      mutations: fc.oneof({ weight: 1, arbitrary: fc.constant<Mutation[]>([]) }, { weight: 2, arbitrary: fc.array(mutation, { minLength: 1, maxLength: 3 }) }),
    }),
  },
  { weight: 1, arbitrary: fc.jsonValue().map((v) => ({ kind: 'raw' as const, text: serialize(v) })) },
  {
    weight: 1,
    arbitrary: fc
      .constantFrom('', '{', 'null', '[]', '"x"', '{"a":1,}', '\u0000', '{"title":"\\ud800"}', '{"__proto__":{"admin":true}}', '\uFEFF{}', '{"a":"\\u0000"}')
      .map((text) => ({ kind: 'raw' as const, text })),
  },
  { weight: 1, arbitrary: fc.constant({ kind: 'none' as const }) },
);

const queryCase = fc.record({
  /** Per known key: leave out, a valid value, or junk. */
  known: fc.array(
    fc.record({
      choice: fc.constantFrom('absent', 'absent', 'valid', 'valid', 'valid', 'valid', 'valid', 'junk'),
      pick: fc.nat(),
      junk: fc.oneof(fc.constantFrom(...BAD_STRINGS), fc.string({ unit: anyUnit, maxLength: 20 })),
    }),
    { minLength: 8, maxLength: 8 },
  ),
  extra: fc.array(fc.tuple(fc.string({ unit: anyUnit, maxLength: 10 }), fc.string({ unit: anyUnit, maxLength: 10 })), { maxLength: 2 }),
  raw: fc.oneof({ weight: 5, arbitrary: fc.constant('') }, { weight: 1, arbitrary: fc.constantFrom('%', '%zz', 'q=%00', 'q=%ED%A0%80', 'page=%E0%A4%A', '&&==&', 'workspaceId[]=1', 'q') }),
});

type QueryCase = typeof queryCase extends fc.Arbitrary<infer T> ? T : never;

interface Case {
  route: number;
  actor: ActorName;
  crossSite: boolean;
  params: ParamValue[];
  pick: number;
  body: BodyCase;
  query: QueryCase;
}

const caseArb: fc.Arbitrary<Case> = fc.record({
  route: fc.nat({ max: ROUTES.length - 1 }),
  // Owners and consultants weigh more: most writes are theirs alone, and each must be reached.
  actor: fc.oneof(...ACTORS.map((a) => ({ weight: a === 'owner' ? 3 : a === 'consultant' ? 2 : 1, arbitrary: fc.constant<ActorName>(a) }))),
  crossSite: fc.oneof({ weight: 40, arbitrary: fc.constant(false) }, { weight: 1, arbitrary: fc.constant(true) }),
  params: fc.array(paramValue, { minLength: 2, maxLength: 2 }),
  pick: fc.nat(),
  body: bodyCase,
  query: queryCase,
});

// ------------------------------------------------------------------ one batch

interface Pools {
  studyId: string[];
  workspaceId: string[];
  userId: string[];
  invitationId: string[];
  simulationId: string[];
  version: string[];
  signoffId: string[];
  threadId: string[];
  suggestionId: string[];
  token: string[];
  /** One-click unsubscribe tokens: the path parameter `token` of /api/v1/unsubscribe/{token}. */
  unsubscribe: string[];
  email: string[];
}

const stats = {
  total: 0,
  fallback: 0,
  byStatus: new Map<number, number>(),
  byRoute: new Map<string, Map<number, number>>(),
};

function tally(route: string, status: number) {
  stats.total += 1;
  stats.byStatus.set(status, (stats.byStatus.get(status) ?? 0) + 1);
  const r = stats.byRoute.get(route) ?? new Map<number, number>();
  r.set(status, (r.get(status) ?? 0) + 1);
  stats.byRoute.set(route, r);
}

const pickFrom = <T,>(list: T[], n: number): T => list[n % list.length]!;

/** The last invitation link mailed, if any: its token joins the pool. */
function mailedToken(): string | undefined {
  return sentMail.at(-1)?.text.match(/\/invitations\/([A-Za-z0-9_-]+)/)?.[1];
}

async function runBatch(batch: number) {
  const w = await makeWorld();
  const stale: TestUser = { ...(await makeUser('stale')), cookie: 'authjs.session-token=not-a-session-at-all' };
  const users: Record<Exclude<ActorName, 'signedOut'>, TestUser> = { ...w.byRole, workspaceOnly: w.workspaceOnly, target: w.target, outsider: w.outsider, staleSession: stale };
  const owner = { id: w.byRole.owner.id, email: w.byRole.owner.email, name: 'owner' };
  // Two invitations: one whose link the outsider may accept, one for revoking and sending again,
  // so that the fuzzer's revokes do not race its accepts for a single invitation. Invitation
  // e-mails wait in the queue: deliver them, so that the link joins the token pool and the
  // invitation can be sent again (only a delivered or failed e-mail can).
  await inviteToStudy(owner, w.studyId, { email: w.outsider.email, role: 'viewer' });
  await deliverWaitingMail(db());
  const acceptToken = mailedToken();
  const invitation = await inviteToStudy(owner, w.studyId, { email: 'later.colleague@test.example', role: 'writer' });
  await deliverWaitingMail(db());
  const run = await createSimulation({ id: w.byRole.owner.id, email: w.byRole.owner.email, name: 'owner' }, simulationRunSchema.parse({ spec: SMALL_SPEC }));
  const pools: Pools = {
    studyId: [w.studyId],
    workspaceId: [w.workspaceId, w.outsiderWorkspaceId],
    userId: [w.target.id, ...Object.values(users).map((u) => u.id)],
    invitationId: [invitation.id],
    simulationId: [run.id],
    version: ['1', '2'],
    signoffId: [await insertSignoff(db(), { studyId: w.studyId, versionNumber: 1, revisionNumber: 1, signerId: w.byRole.owner.id, statement: 'Reviewed.', conditions: null, at: new Date() })],
    threadId: [(await createThread(owner, w.studyId, { anchor: { kind: 'section', part: 'assumptions' }, body: 'Where does the ICC come from?' })).id],
    suggestionId: [(await createSuggestion(owner, w.studyId, { path: 'outcome.unit', value: 'score points', reason: 'Name the unit.' })).id],
    token: [acceptToken ?? 'x'.repeat(43)],
    unsubscribe: [unsubscribeToken(w.byRole.viewer.id, 'reply'), unsubscribeToken(w.byRole.owner.id, 'digest')],
    email: [...Object.values(users).map((u) => u.email), 'nobody@example.org'],
  };
  const tables = await countedTables();

  async function resolve(v: unknown, c: Case, studyId: string | undefined): Promise<unknown> {
    if (typeof v === 'string' && v.startsWith('$')) {
      const name = v.slice(1);
      if (name === 'revision') {
        if (!studyId || !pools.studyId.includes(studyId)) return 1;
        const row = await db().selectFrom('studies').select('current_revision').where('id', '=', studyId).executeTakeFirst();
        return row?.current_revision ?? 1;
      }
      if (name in pools) return pickFrom(pools[name as keyof Pools], c.pick);
      return v;
    }
    if (v instanceof Raw || v === null || typeof v !== 'object') return v;
    if (Array.isArray(v)) return Promise.all(Array.from(v, (x) => resolve(x, c, studyId)));
    const out = {};
    for (const k of Object.keys(v)) setOwn(out, k, await resolve((v as Record<string, unknown>)[k], c, studyId));
    return out;
  }

  /** Half the known ids are the world's own (its study, workspace, target member), the rest any of the pool. */
  function paramOf(name: string, p: ParamValue): string {
    if (p.kind === 'raw') return p.value;
    if (p.kind === 'any-id') return pickFrom(Object.values(pools).flat(), p.pick);
    const pool = name === 'token' ? pools.unsubscribe : (pools[name as keyof Pools] ?? pools.studyId);
    return p.pick % 2 === 0 ? pool[0]! : pickFrom(pool, p.pick >> 1);
  }

  function queryOf(route: Route, c: Case): string {
    const valid = QUERIES[route.key] ?? {};
    const pairs: [string, string][] = [];
    Object.entries(valid).forEach(([key, values], i) => {
      const q = c.query.known[i]!;
      if (q.choice === 'valid') {
        const value = pickFrom(values, q.pick);
        pairs.push([key, value.startsWith('$') ? pickFrom(pools[value.slice(1) as keyof Pools], c.pick) : value]);
      } else if (q.choice === 'junk') pairs.push([key, q.junk]);
    });
    pairs.push(...c.query.extra);
    const text = [new URLSearchParams(pairs).toString(), c.query.raw].filter(Boolean).join('&');
    return text ? `?${text}` : '';
  }

  async function send(c: Case): Promise<void> {
    const route = ROUTES[c.route]!;
    const params = Object.fromEntries(route.params.map((name, i) => [name, paramOf(name, c.params[i]!)]));
    const safe = (s: string) => {
      try {
        return encodeURIComponent(s);
      } catch {
        return 'x';
      }
    };
    const url = `${BASE}${route.path.replace(/\{(\w+)\}/g, (_, n: string) => safe(params[n]!))}${queryOf(route, c)}`;
    let text: string | undefined;
    if (route.method !== 'GET' && c.body.kind === 'raw') text = c.body.text;
    if (route.method !== 'GET' && c.body.kind === 'json') {
      const bases = BODIES[route.key] ?? [{}];
      text = serialize(mutate(await resolve(pickFrom(bases, c.body.base), c, params.studyId), c.body.mutations));
    }
    const headers: Record<string, string> = {};
    if (c.actor !== 'signedOut') headers.cookie = users[c.actor].cookie;
    if (text !== undefined) headers['content-type'] = 'application/json';
    if (route.method !== 'GET') {
      headers.origin = c.crossSite ? 'https://elsewhere.example' : BASE;
      headers['sec-fetch-site'] = c.crossSite ? 'cross-site' : 'same-origin';
    }
    const req = new Request(url, { method: route.method, headers, body: text });

    const before = await counts(tables);
    const res = await route.handler(req, { params: Promise.resolve(params) });
    const after = await counts(tables);
    tally(route.key, res.status);

    const describeCase = () =>
      `batch ${batch}, ${route.key} as ${c.actor}, params ${JSON.stringify(params)}, url ${url.slice(0, 300)}, body ${(text ?? '(none)').slice(0, 500)}`;
    const answer = res.headers.get('content-type')?.includes('json') ? await res.json() : null;
    if (res.status >= 500) throw new Error(`${res.status} ${JSON.stringify(answer)} for ${describeCase()}`);
    if (res.status >= 400) {
      if (typeof answer?.error?.code !== 'string' || typeof answer.error.message !== 'string') {
        throw new Error(`${res.status} without the error shape: ${JSON.stringify(answer)} for ${describeCase()}`);
      }
      if (answer.error.code === 'bad_request' && answer.error.message === DATABASE_INPUT_MESSAGE) stats.fallback += 1;
    }
    const expected = res.status < 300 ? (EXPECTED[route.key]?.(answer ?? {}) ?? {}) : {};
    const problems = unexpectedChanges(before, after, expected);
    if (problems.length) throw new Error(`${res.status}: ${problems.join('; ')} for ${describeCase()}`);

    // The world's target member is there to have their role changed and to be removed: after a
    // removal they are put back (after the counts above), so later role changes can reach them.
    if (res.status === 204 && route.key.endsWith('/members/{userId}') && params.userId === w.target.id) {
      await upsertWorkspaceMember(db(), w.workspaceId, w.target.id, 'member');
      await upsertStudyMember(db(), w.studyId, w.target.id, 'editor');
    }

    if (res.status < 300 && answer) {
      if (route.key === 'POST /api/v1/workspaces') pools.workspaceId.push(answer.id);
      if (route.key === 'POST /api/v1/studies') pools.studyId.push(answer.id);
      if (route.key === 'POST /api/v1/simulations') pools.simulationId.push(answer.id);
      if (route.key === 'POST /api/v1/studies/{studyId}/signoffs') pools.signoffId.push(answer.id);
      if (route.key === 'POST /api/v1/studies/{studyId}/threads') pools.threadId.push(answer.id);
      if (route.key === 'POST /api/v1/studies/{studyId}/suggestions') pools.suggestionId.push(answer.id);
      if (route.key.endsWith('/invitations') && route.method === 'POST') {
        pools.invitationId.push(answer.id);
        await deliverWaitingMail(db());
        const token = mailedToken();
        if (token) pools.token.push(token);
      }
    }
  }

  await fc.assert(
    fc.asyncProperty(caseArb, async (c) => {
      await send(c);
    }),
    { seed: SEED + batch, numRuns: RUNS_PER_BATCH, endOnFailure: true },
  );
}

// ------------------------------------------------------------------ the test

describe('fuzzing every route under app/api/v1', () => {
  beforeAll(async () => {
    // Limits would answer most requests 429 before their input is read; scale them out of the way.
    vi.stubEnv('RATE_LIMIT_SCALE', '1000');
    await getBoss();
  });

  afterAll(async () => {
    vi.unstubAllEnvs();
    await stopBoss({ timeout: 5_000 });
  });

  it('enumerates every route of the API document from the route files', () => {
    const documented = API_ROUTES.map((r) => `${r.method.toUpperCase()} ${r.path}`).sort();
    expect(ROUTES.map((r) => r.key).filter((k) => k !== 'GET /api/v1/openapi.json').sort()).toEqual(documented);
  });

  it.each(Array.from({ length: BATCHES }, (_, i) => i + 1))(
    'batch %i: no 5xx, and rows change only by what the 2xx answers created',
    async (batch) => {
      await runBatch(batch);
    },
    120_000,
  );

  it('sent at least 10,000 requests to every route; the database-error net never fired', () => {
    const histogram = Object.fromEntries([...stats.byStatus].sort(([a], [b]) => a - b));
    const lines = [...stats.byRoute]
      .sort(([a], [b]) => a.localeCompare(b))
      .map(([route, s]) => `  ${route.padEnd(62)} ${[...s].sort(([a], [b]) => a - b).map(([k, n]) => `${k}:${n}`).join(' ')}`);
    console.log(`fuzz: ${stats.total} requests, statuses ${JSON.stringify(histogram)}, database-error net fired ${stats.fallback} times\n${lines.join('\n')}`);

    expect(stats.total).toBeGreaterThanOrEqual(BATCHES * RUNS_PER_BATCH);
    expect([...stats.byStatus.keys()].filter((s) => s >= 500)).toEqual([]);
    expect(stats.fallback).toBe(0);
    expect([...stats.byRoute.keys()].sort()).toEqual(ROUTES.map((r) => r.key).sort());
    // The generators reach past validation: every write route succeeded at least once.
    const succeeded = new Set([...stats.byRoute].filter(([, s]) => [...s.keys()].some((k) => k < 300)).map(([r]) => r));
    expect(Object.keys(EXPECTED).filter((route) => !succeeded.has(route))).toEqual([]);
    // Nothing leaked onto Object.prototype from the "__proto__" keys.
    expect(({} as Record<string, unknown>).polluted ?? ({} as Record<string, unknown>).isAdmin).toBeUndefined();
  });
});
