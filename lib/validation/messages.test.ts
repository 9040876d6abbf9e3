/**
 * Every message a refused input can get is a plain sentence: this walks every input schema — the
 * bodies, queries and path parameters of every route in the API document, the forms' server
 * actions, and the engine's contracts (the calculation request, the stress-test specification, the
 * design) — and offers each field in it a bad value of every kind (wrong type, too big, too small,
 * missing, not a whole number, not one of the options, too long, an empty list). No message may
 * carry zod's own wording or an input's API name (camelCase) or an internal id.
 */
import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { API_ROUTES } from '@/lib/api/openapi';
import { zodFieldErrors, invalid } from '@/lib/api/handler';
import { designSchema } from '@/lib/design/schema';
import { fieldLabel, fieldMessage } from '@/lib/field-messages';
import { simulationSpecSchema } from '@/lib/sim/spec';
import { calculationSchema } from '@/lib/stats/calculations/request';
import { magicLinkSchema, resetPasswordSchema, resetRequestSchema, signInSchema, signUpSchema } from './auth';

type Def = { type: string; [key: string]: unknown };
const defOf = (s: unknown): Def => (s as { _zod: { def: Def } })._zod.def;
const INNER = new Set(['optional', 'nullable', 'default', 'prefault', 'readonly', 'catch', 'nonoptional']);

/** zod's own phrases (its English locale) and the ids that must never reach a reader. */
const ZOD_WORDING = /Invalid input|Invalid option|Invalid string|Invalid element|Invalid key|Too big|Too small|expected .* received|Unrecognized key|must be one of|Required\b/;
const CAMEL_CASE = /\b[a-z]+[A-Z][A-Za-z0-9]*\b/;
const INTERNAL_IDS = /\b(?:targetPower|glmm|kenward-roger|ols-hc3|log-ols|glm-nb|cr2|hc3)\b/i;

/** Bad values offered to a field, by the kind of schema it is. */
function badValues(def: Def): unknown[] {
  switch (def.type) {
    case 'number':
    case 'int':
      return ['x', 1e15, -1e15, 1.5, null, true];
    case 'string':
      return [42, '', 'x'.repeat(200_000), null];
    case 'enum':
    case 'literal':
      return ['not-an-option', 42];
    case 'boolean':
      return ['x'];
    case 'array':
      return ['x', [], Array.from({ length: 100_001 }, () => 0)];
    case 'tuple':
      return ['x', []];
    case 'object':
      return ['x', []];
    default:
      return ['x'];
  }
}

/** Objects that put `value` at `path`, with the discriminators (kind, violation) met on the way. */
function setAt(path: (string | number)[], value: unknown, fixed: Record<string, unknown>[]): unknown {
  let out: unknown = value;
  for (let i = path.length - 1; i >= 0; i--) {
    const key = path[i]!;
    out = typeof key === 'number' ? [out] : { ...fixed[i], [key]: out };
  }
  return out;
}

/** Every input to try on `schema`: each field given each bad value, and the empty object. */
function probes(schema: unknown): unknown[] {
  const out: unknown[] = [{}, 'x', null];
  const seen = new Set<unknown>();
  const walk = (s: unknown, path: (string | number)[], fixed: Record<string, unknown>[], own: Record<string, unknown>) => {
    if (seen.has(s) && path.length > 6) return;
    seen.add(s);
    const def = defOf(s);
    if (INNER.has(def.type)) return walk(def.innerType, path, fixed, own);
    if (def.type === 'pipe') return walk(def.in, path, fixed, own);
    if (path.length > 0) for (const v of badValues(def)) out.push(setAt(path, v, [...fixed, own]));
    if (def.type === 'object') {
      const shape = def.shape as Record<string, unknown>;
      const literals: Record<string, unknown> = {};
      for (const [k, v] of Object.entries(shape)) if (defOf(v).type === 'literal') literals[k] = (defOf(v).values as unknown[])[0];
      for (const [k, v] of Object.entries(shape)) walk(v, [...path, k], [...fixed, own], literals);
    } else if (def.type === 'array') walk(def.element, [...path, 0], [...fixed, own], {});
    else if (def.type === 'union') for (const o of def.options as unknown[]) walk(o, path, fixed, own);
    else if (def.type === 'record') walk(def.valueType, [...path, 'key'], [...fixed, own], {});
  };
  walk(schema, [], [], {});
  return out;
}

function inputSchemas(): [string, z.ZodType][] {
  const out: [string, z.ZodType][] = [];
  for (const r of API_ROUTES) {
    const name = `${r.method.toUpperCase()} ${r.path}`;
    const media = r.request?.body?.content['application/json'];
    const body = media && 'schema' in media ? media.schema : undefined;
    if (body) out.push([`${name} body`, body as z.ZodType]);
    if (r.request?.query) out.push([`${name} query`, r.request.query as z.ZodType]);
    if (r.request?.params) out.push([`${name} params`, r.request.params as z.ZodType]);
  }
  const direct = { signInSchema, signUpSchema, magicLinkSchema, resetRequestSchema, resetPasswordSchema, calculationSchema, simulationSpecSchema, designSchema };
  for (const [name, schema] of Object.entries(direct)) out.push([name, schema as z.ZodType]);
  return out;
}

describe('every message for a refused input', () => {
  const schemas = inputSchemas();
  const messages = new Map<string, string>();
  for (const [name, schema] of schemas) {
    for (const input of probes(schema)) {
      const parsed = schema.safeParse(input);
      if (parsed.success) continue;
      for (const [field, texts] of Object.entries(zodFieldErrors(parsed.error))) for (const t of texts) messages.set(t, `${name} ${field}`);
      messages.set(invalid(parsed.error).message, `${name} (the answer's message)`);
    }
  }

  it('walks the engine’s contracts and every input of the API', () => {
    expect(schemas.map(([n]) => n)).toEqual(expect.arrayContaining(['POST /api/v1/calculations body', 'calculationSchema', 'simulationSpecSchema', 'designSchema']));
    expect(messages.size).toBeGreaterThan(150);
  });

  it('never uses zod’s wording', () => {
    expect([...messages].filter(([m]) => ZOD_WORDING.test(m)).map(([m, where]) => `${where}: ${m}`)).toEqual([]);
  });

  it('never names a field by its API name or shows an internal id', () => {
    expect([...messages].filter(([m]) => CAMEL_CASE.test(m) || INTERNAL_IDS.test(m)).map(([m, where]) => `${where}: ${m}`)).toEqual([]);
  });

  it('says what to enter, with the field’s label', () => {
    const at = (path: string[], input: unknown) => calculationSchema.safeParse(input).error!.issues.find((i) => i.path.join('.') === path.join('.'))!.message;
    expect(at(['costPerUnit'], { kind: 'optimal-allocation', icc: 0.05, costPerCluster: 100, costPerUnit: 0 })).toBe('Enter the cost per unit as a number above 0.');
    expect(at(['outcomes'], { kind: 'two-group-means', sd: 1, delta: 1, outcomes: 1.5 })).toBe('Enter the number of primary outcomes as a whole number.');
    expect(at(['alpha'], { kind: 'two-group-means', sd: 1, delta: 1, alpha: 0.7 })).toBe('Enter the significance level (alpha) as a number of at most 0.5.');
    expect(at(['sd'], { kind: 'two-group-means', delta: 1 })).toBe('Enter the standard deviation.');
    expect(at(['multiplicity'], { kind: 'two-group-means', sd: 1, delta: 1, multiplicity: 'x' })).toBe('Choose the adjustment for several outcomes from the options offered.');
  });

  it('labels read as words', () => {
    expect(fieldLabel('costPerUnit')).toBe('cost per unit');
    expect(fieldLabel('icc')).toBe('intracluster correlation (ICC)');
    expect(fieldMessage({ code: 'too_big', origin: 'number', maximum: 0.5, inclusive: false, input: 0.7, path: ['targetPower'] } as never)).toBe('Enter the target power as a number below 0.5.');
  });
});
