/**
 * Every string a client can send goes through `rawText`/`text` (or a format that admits neither
 * NUL nor a broken character, like a UUID): this walks every input schema — the bodies, queries
 * and path parameters of every route in the API document, and the forms' server actions — and
 * offers each string in it a NUL and lone surrogates. A new `z.string()` that lets them through
 * fails here with its path.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { API_ROUTES } from '@/lib/api/openapi';
import { magicLinkSchema, resetPasswordSchema, resetRequestSchema, signInSchema, signUpSchema } from './auth';
import { rawText, text } from '@/lib/text-schema';

type Def = { type: string; [key: string]: unknown };
const defOf = (s: unknown): Def => (s as { _zod: { def: Def } })._zod.def;

/** Leaves that cannot carry a string, or check their strings themselves (a literal or enum lists them). */
const NO_STRING = new Set(['number', 'boolean', 'literal', 'enum', 'null', 'undefined', 'bigint', 'nan', 'never']);
/** Wrappers whose inner schema is what matters. */
const INNER = new Set(['optional', 'nullable', 'default', 'prefault', 'readonly', 'catch', 'nonoptional']);

/** Every string schema inside `schema`, with its path. Throws on a kind of schema it does not know. */
function strings(schema: unknown, path: string, out: [string, z.ZodType][] = [], seen = new Set<unknown>()): [string, z.ZodType][] {
  if (seen.has(schema)) return out;
  seen.add(schema);
  const def = defOf(schema);
  const walk = (s: unknown, p: string) => strings(s, p, out, seen);
  if (def.type === 'string') out.push([path, schema as z.ZodType]);
  else if (NO_STRING.has(def.type) || def.type === 'transform') return out;
  else if (INNER.has(def.type)) walk(def.innerType, path);
  else if (def.type === 'object') {
    for (const [k, v] of Object.entries(def.shape as Record<string, unknown>)) walk(v, `${path}.${k}`);
    if (def.catchall) walk(def.catchall, `${path}.*`);
  } else if (def.type === 'array') walk(def.element, `${path}[]`);
  else if (def.type === 'tuple') (def.items as unknown[]).forEach((s, i) => walk(s, `${path}[${i}]`));
  else if (def.type === 'union') (def.options as unknown[]).forEach((s, i) => walk(s, `${path}|${i}`));
  else if (def.type === 'pipe') {
    walk(def.in, path);
    walk(def.out, path);
  } else if (def.type === 'record') {
    walk(def.keyType, `${path}{key}`);
    walk(def.valueType, `${path}{}`);
  } else throw new Error(`${path}: a ${def.type} schema in an input; teach this walk what strings it may hold`);
  return out;
}

/** Strings that are not text: NUL, a lone high or low surrogate, a pair in the wrong order. */
const BAD = ['\u0000', '\uD800', '\uDFFF', '\uDC00\uD83D'];

/** `bad` inside a string of an otherwise acceptable length for the schema. */
function probes(schema: z.ZodType): string[] {
  const { minLength, maxLength } = schema as unknown as { minLength: number | null; maxLength: number | null };
  return BAD.flatMap((bad) => {
    const pad = 'a'.repeat(Math.max(0, Math.min((minLength ?? 1) + 2, (maxLength ?? 100) - bad.length)));
    return [bad + pad, pad + bad, pad.slice(0, 1) + bad + pad.slice(1)];
  });
}

function inputSchemas(): [string, unknown][] {
  const out: [string, unknown][] = [];
  for (const r of API_ROUTES) {
    const name = `${r.method.toUpperCase()} ${r.path}`;
    const media = r.request?.body?.content['application/json'];
    const body = media && 'schema' in media ? media.schema : undefined;
    if (body) out.push([`${name} body`, body]);
    if (r.request?.query) out.push([`${name} query`, r.request.query]);
    if (r.request?.params) out.push([`${name} params`, r.request.params]);
  }
  const forms = { signInSchema, signUpSchema, magicLinkSchema, resetRequestSchema, resetPasswordSchema };
  for (const [name, schema] of Object.entries(forms)) out.push([name, schema]);
  return out;
}

describe('every string of every input', () => {
  const all = inputSchemas().flatMap(([name, schema]) => strings(schema, name));

  it('finds the strings of the routes and forms', () => {
    const paths = all.map(([p]) => p);
    for (const expected of [
      'POST /api/v1/workspaces body.name',
      'GET /api/v1/studies query.q',
      'POST /api/v1/studies/{studyId}/finding-notes body.key',
      'PUT /api/v1/studies/{studyId}/design body.design.outcome.name',
      'DELETE /api/v1/studies/{studyId}/members/{userId} params.userId',
      'DELETE /api/v1/invitations/{invitationId} params.invitationId',
      'signUpSchema.name',
    ]) {
      expect(paths).toContain(expected);
    }
    expect(all.length).toBeGreaterThan(50);
  });

  it('refuses NUL and lone surrogates in each of them', () => {
    const leaks = all.flatMap(([path, schema]) => probes(schema).filter((s) => schema.safeParse(s).success).map((s) => `${path} accepts ${JSON.stringify(s)}`));
    expect(leaks).toEqual([]);
  });
});

describe('rawText() and text()', () => {
  const title = text('Title', 1, 200);

  it('say what to fix', () => {
    expect(title.safeParse('Sleep\u0000 study').error?.issues.map((i) => i.message)).toEqual(['Title contains an invisible NUL character: remove it.']);
    expect(title.safeParse('Sleep \uD83D study').error?.issues.map((i) => i.message)).toEqual([
      'Title contains a broken character (half of an emoji or symbol): retype it or remove it.',
    ]);
    expect(title.safeParse('Sleep\u0007 study').error?.issues.map((i) => i.message)).toEqual(['Title contains control characters: remove them.']);
  });

  it('keep every well-formed character, emoji and other scripts included', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', maxLength: 15 }), (s) => {
        const clean = s.replace(/[\u0000-\u001F\u007F]/g, '');
        expect(rawText('Key').parse(clean)).toBe(clean);
        if (clean.trim().length > 0) expect(title.parse(clean)).toBe(clean.trim());
      }),
      { seed: 9, numRuns: 300 },
    );
  });

  it('refuse any string with a NUL or a lone surrogate (property)', () => {
    const lone = fc.integer({ min: 0xd800, max: 0xdfff }).map((c) => String.fromCharCode(c));
    const bad = fc.oneof(fc.constant('\u0000'), lone);
    fc.assert(
      fc.property(fc.string({ maxLength: 20 }), bad, fc.string({ maxLength: 20 }), (a, b, c) => {
        // A high surrogate followed by a low one is a character: keep the bad one alone.
        const s = `${a}x${b}x${c}`;
        expect(rawText('Key').safeParse(s).success).toBe(false);
        expect(title.safeParse(s).success).toBe(false);
      }),
      { seed: 9, numRuns: 300 },
    );
  });
});
