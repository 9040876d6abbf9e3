/**
 * The API document as a contract: every 2xx response that a route handler gives in the
 * integration suite is checked against the response the document declares for its route,
 * method and status (integration-setup.ts wraps `api()` so that no test can skip it).
 *
 * The document is generated from `API_ROUTES` and `HEALTH_ROUTE` (lib/api/openapi.ts), so the zod schema found
 * there is the one the document names. A response fails when
 * - no route of the document matches its method and path,
 * - the route does not declare its status,
 * - the status declares a JSON body and the body does not parse with the schema, or has fields
 *   the schema does not declare (zod drops unknown keys: those are looked for separately),
 * - the status declares no body and one was sent.
 */
import type { RouteConfig } from '@asteasolutions/zod-to-openapi';
import type { z } from 'zod';
import { API_ROUTES, HEALTH_ROUTE } from '@/lib/api/openapi';

/** Every route of the document: the /api/v1 routes and the health probe. */
const DOCUMENTED = [...API_ROUTES, HEALTH_ROUTE];

export interface ContractCheck {
  /** `METHOD /template status`, e.g. `GET /api/v1/studies/{studyId} 200`; null when no route matched. */
  key: string | null;
  problems: string[];
}

const pattern = (template: string) => new RegExp(`^${template.replace(/\{[^}]+\}/g, '[^/]+')}$`);
const ROUTES = DOCUMENTED.map((route) => ({ route, pattern: pattern(route.path), params: (route.path.match(/\{/g) ?? []).length }));

/** The document's route for a method and a concrete path; a literal segment wins over a parameter. */
export function findRoute(method: string, pathname: string): RouteConfig | undefined {
  const matches = ROUTES.filter((r) => r.route.method === method.toLowerCase() && r.pattern.test(pathname));
  return matches.sort((a, b) => a.params - b.params)[0]?.route;
}

function jsonSchemaOf(route: RouteConfig, status: number): { declared: boolean; schema: z.ZodType | null; other: boolean } {
  const response = route.responses[status] as { content?: Record<string, { schema?: unknown }> } | undefined;
  if (!response) return { declared: false, schema: null, other: false };
  const schema = response.content?.['application/json']?.schema;
  // A body declared in another type only (a CSV file): the document says a body comes, not its shape.
  const other = !schema && Object.keys(response.content ?? {}).length > 0;
  return { declared: true, schema: (schema as z.ZodType | undefined) ?? null, other };
}

/** Paths of keys that `sent` has and `parsed` (the schema's output) lacks: fields the schema does not declare. */
export function undeclaredFields(sent: unknown, parsed: unknown, at = ''): string[] {
  if (Array.isArray(sent) && Array.isArray(parsed)) return sent.flatMap((v, i) => undeclaredFields(v, parsed[i], `${at}[${i}]`));
  if (!isPlainObject(sent) || !isPlainObject(parsed)) return [];
  return Object.keys(sent).flatMap((k) => {
    const path = at ? `${at}.${k}` : k;
    return k in parsed ? undeclaredFields(sent[k], parsed[k], path) : [path];
  });
}

const isPlainObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Checks one response; only 2xx responses are checked (the error body is one shape for all). */
export function checkResponse(method: string, url: string, status: number, text: string): ContractCheck {
  const pathname = new URL(url).pathname;
  const where = `${method} ${pathname} → ${status}`;
  if (status < 200 || status > 299) return { key: null, problems: [] };
  const route = findRoute(method, pathname);
  if (!route) return { key: null, problems: [`${where}: no route of the API document matches this method and path`] };
  const key = `${method.toUpperCase()} ${route.path} ${status}`;
  const { declared, schema, other } = jsonSchemaOf(route, status);
  if (!declared) return { key, problems: [`${where}: the document does not declare status ${status} for ${method.toUpperCase()} ${route.path}`] };
  if (other) return { key, problems: [] };
  if (!schema) return { key, problems: text === '' ? [] : [`${where}: the document declares no body for this status, but one was sent`] };
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    return { key, problems: [`${where}: the body is not JSON`] };
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) {
    return { key, problems: parsed.error.issues.map((i) => `${where}: ${i.path.join('.') || '(body)'}: ${i.message}`) };
  }
  return { key, problems: undeclaredFields(body, parsed.data).map((path) => `${where}: ${path} is sent but not declared in the document`) };
}

/** Every route × method × 2xx status the document declares, as `METHOD /template status`. */
export function declaredSuccesses(): string[] {
  return DOCUMENTED.flatMap((route) =>
    Object.keys(route.responses)
      .map(Number)
      .filter((s) => s >= 200 && s <= 299)
      .map((s) => `${route.method.toUpperCase()} ${route.path} ${s}`),
  );
}

/** What this test file's responses exercised and broke (integration-setup.ts reads and resets it). */
export const contract = { exercised: new Set<string>(), problems: [] as string[] };

/** Checks a handler's response (read from a clone, so the test still reads the original). */
export async function recordResponse(req: Request, res: Response): Promise<void> {
  const text = res.status >= 200 && res.status <= 299 ? await res.clone().text() : '';
  const { key, problems } = checkResponse(req.method, req.url, res.status, text);
  if (key) contract.exercised.add(key);
  contract.problems.push(...problems);
}

/** The problems recorded since the last call, which are then forgotten. */
export function takeProblems(): string[] {
  return contract.problems.splice(0);
}
