import 'server-only';
import type { z } from 'zod';
import { actorFromRequest, type Actor } from '@/lib/auth/session';
import { env } from '@/lib/env';
import { AppError, toAppError, unauthorized, type FieldErrors } from '@/lib/errors';
import { idempotent } from './idempotency';

/**
 * The thin shell around every /api/v1 route handler: refuses cross-site writes, resolves the
 * signed-in user, turns thrown AppErrors into `{"error": {"code", "message", "fields"?}}` with
 * the matching status, and hides every other error behind a logged 500. Writes honour an
 * Idempotency-Key header (lib/api/idempotency.ts).
 */
export interface ApiContext<P> {
  req: Request;
  actor: Actor | null;
  /** The path parameters as parsed by the route's `params` schema; `{}` for a route without one. */
  params: P;
}

type RouteContext = { params: Promise<Record<string, string | string[] | undefined>> };

/** A schema of a route's path parameters (lib/validation/params.ts). */
type ParamsSchema = z.ZodType<Record<string, string>>;

interface ApiOptions<S extends ParamsSchema> {
  status?: number;
  public?: boolean;
  /** Validates the path parameters after the sign-in check; without it the handler sees none. */
  params?: S;
}

const MUTATING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
const MAX_BODY_BYTES = 256 * 1024;

export function errorResponse(err: unknown): Response {
  const e = toAppError(err);
  const headers: Record<string, string> = {};
  if (e.retryAfterSeconds) headers['Retry-After'] = String(e.retryAfterSeconds);
  return Response.json(
    { error: { code: e.code, message: e.message, ...(e.fields ? { fields: e.fields } : {}) } },
    { status: e.status, headers },
  );
}

/** Browsers mark cross-site requests (Sec-Fetch-Site, Origin); a write from another site is refused. */
export function assertSameOrigin(req: Request): void {
  const site = req.headers.get('sec-fetch-site');
  if (site && site !== 'same-origin' && site !== 'none') {
    throw new AppError('forbidden', 'Cross-site requests are not accepted.');
  }
  const origin = req.headers.get('origin');
  if (origin) {
    let originHost: string;
    try {
      originHost = new URL(origin).host;
    } catch {
      throw new AppError('forbidden', 'Cross-site requests are not accepted.');
    }
    const appHost = new URL(env().APP_URL).host;
    const requestHost = req.headers.get('host');
    if (originHost !== appHost && originHost !== requestHost) {
      throw new AppError('forbidden', 'Cross-site requests are not accepted.');
    }
  }
}

export function api<S extends ParamsSchema = z.ZodObject<Record<string, never>>>(
  fn: (ctx: ApiContext<z.output<S>>) => Promise<unknown>,
  options: ApiOptions<S> = {},
) {
  return async (req: Request, context: RouteContext): Promise<Response> => {
    try {
      if (MUTATING.has(req.method)) assertSameOrigin(req);
      const actor = options.public ? null : await actorFromRequest(req);
      if (!options.public && !actor) throw unauthorized();
      const params = (options.params ? parseParams((await context?.params) ?? {}, options.params) : {}) as z.output<S>;
      const respond = async (): Promise<Response> => {
        const out = await fn({ req, actor, params });
        if (out instanceof Response) return out;
        if (out === undefined) return new Response(null, { status: 204 });
        return Response.json(out, { status: options.status ?? 200 });
      };
      // A write with an Idempotency-Key is carried out once however often it is sent.
      return MUTATING.has(req.method) ? await idempotent(req, actor, respond) : await respond();
    } catch (err) {
      return errorResponse(err);
    }
  };
}

export function zodFieldErrors(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

export function invalid(error: z.ZodError): AppError {
  const fields = zodFieldErrors(error);
  const first = Object.entries(fields)[0];
  const message = first ? first[1][0] : 'The request is not valid.';
  return new AppError('bad_request', `Check the highlighted fields. ${message}`.trim(), { fields });
}

export async function parseBody<S extends z.ZodType>(req: Request, schema: S, { maxBytes = MAX_BODY_BYTES } = {}): Promise<z.infer<S>> {
  const length = Number(req.headers.get('content-length') ?? '0');
  if (length > maxBytes) throw new AppError('payload_too_large', `The request body is over ${maxBytes / 1024} KiB.`);
  const raw = await req.text();
  if (raw.length > maxBytes) throw new AppError('payload_too_large', `The request body is over ${maxBytes / 1024} KiB.`);
  let json: unknown;
  try {
    json = raw ? JSON.parse(raw) : {};
  } catch {
    throw new AppError('bad_request', 'The request body is not valid JSON.');
  }
  const parsed = schema.safeParse(json);
  if (!parsed.success) throw invalid(parsed.error);
  return parsed.data;
}

/** Designs can be large when pasted from elsewhere; the schema, not the byte limit, says what is wrong. */
export const DESIGN_BODY_BYTES = 2 * 1024 * 1024;

export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.infer<S> {
  const params = Object.fromEntries(new URL(req.url).searchParams.entries());
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw invalid(parsed.error);
  return parsed.data;
}

/**
 * Path parameters name a resource: one that cannot be valid names nothing, so the answer is the
 * same 404 as for an id that does not exist or is not visible, with the offending field.
 */
export function parseParams<S extends z.ZodType>(params: unknown, schema: S): z.output<S> {
  const parsed = schema.safeParse(params);
  if (parsed.success) return parsed.data;
  const fields = zodFieldErrors(parsed.error);
  throw new AppError('not_found', Object.values(fields)[0]?.[0] ?? 'Nothing was found at this address.', { fields });
}
