/** The OpenAPI document describes exactly the route handlers that exist under app/api/v1. */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { openApiDocument } from '@/lib/api/openapi';
import * as route from '@/app/api/v1/openapi.json/route';

function routeFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = path.join(dir, name);
    if (statSync(p).isDirectory()) return routeFiles(p);
    return name === 'route.ts' ? [p] : [];
  });
}

const root = path.resolve(__dirname, '../../app');

describe('OpenAPI 3.1 document', () => {
  const doc = openApiDocument() as unknown as { openapi: string; paths: Record<string, Record<string, unknown>> };

  it('is version 3.1 and served at /api/v1/openapi.json', async () => {
    expect(doc.openapi).toBe('3.1.0');
    const res = route.GET();
    expect(res.status).toBe(200);
    expect((await res.json()).openapi).toBe('3.1.0');
  });

  it('lists every method of every route handler, and nothing else', () => {
    const fromFiles = new Set<string>();
    for (const file of routeFiles(path.join(root, 'api/v1'))) {
      const rel = path.relative(root, path.dirname(file)).split(path.sep).join('/');
      if (rel === 'api/v1/openapi.json') continue;
      const apiPath = `/${rel}`.replace(/\[(\w+)\]/g, '{$1}');
      const src = readFileSync(file, 'utf8');
      for (const m of src.matchAll(/export const (GET|POST|PUT|PATCH|DELETE)\b/g)) fromFiles.add(`${m[1]!.toLowerCase()} ${apiPath}`);
    }
    const fromDoc = new Set<string>();
    for (const [p, methods] of Object.entries(doc.paths)) {
      if (!p.startsWith('/api/v1')) continue;
      for (const m of Object.keys(methods)) fromDoc.add(`${m} ${p}`);
    }
    expect([...fromDoc].sort()).toEqual([...fromFiles].sort());
  });

  it('names every successful answer of /api/v1 by its one declared schema (or a list of one)', () => {
    const named = (schema: unknown) => typeof (schema as { $ref?: unknown }).$ref === 'string';
    const unnamed: string[] = [];
    for (const [p, methods] of Object.entries(doc.paths)) {
      if (!p.startsWith('/api/v1')) continue;
      for (const [m, op] of Object.entries(methods as Record<string, { responses: Record<string, { content?: Record<string, { schema: unknown }> }> }>)) {
        for (const [status, response] of Object.entries(op.responses)) {
          const schema = response.content?.['application/json']?.schema as { properties?: { items?: { items?: unknown } } } | undefined;
          if (!status.startsWith('2') || !schema) continue;
          const items = schema.properties?.items?.items;
          if (!named(schema) && !(items && named(items) && Object.keys(schema.properties!).length === 1)) unnamed.push(`${m} ${p} ${status}`);
        }
      }
    }
    expect(unnamed).toEqual([]);
  });

  it('documents the error shape and request bodies from the zod schemas', () => {
    const json = JSON.stringify(doc);
    expect(json).toContain('"Error"');
    expect(json).toContain('"StudyCreate"');
    const post = doc.paths['/api/v1/studies']!.post as { requestBody: unknown; responses: Record<string, unknown> };
    expect(post.requestBody).toBeDefined();
    expect(Object.keys(post.responses)).toEqual(expect.arrayContaining(['201', '400', '401', '403', '404']));
  });
});
