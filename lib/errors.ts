/**
 * One error type for the whole app. Each code maps to one HTTP status; the message is safe to
 * show to the person who caused it. Database and other internal details are logged on the
 * server and never sent to the client.
 */
export const ERROR_STATUS = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  payload_too_large: 413,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly fields?: FieldErrors;
  readonly retryAfterSeconds?: number;

  constructor(code: ErrorCode, message: string, options: { fields?: FieldErrors; retryAfterSeconds?: number; cause?: unknown } = {}) {
    super(message, { cause: options.cause });
    this.name = 'AppError';
    this.code = code;
    this.fields = options.fields;
    this.retryAfterSeconds = options.retryAfterSeconds;
  }

  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

export const unauthorized = () => new AppError('unauthorized', 'Sign in to continue.');
export const forbidden = (what = 'do that') => new AppError('forbidden', `Your role does not allow you to ${what}.`);
export const notFound = (what = 'That item') => new AppError('not_found', `${what} was not found.`);

/** Connection-level failures of PostgreSQL (server down, refused, terminated). */
export function isDatabaseUnavailable(err: unknown): boolean {
  const e = err as { code?: string; message?: string } | undefined;
  if (!e) return false;
  const codes = ['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'ENOTFOUND', '57P01', '57P02', '57P03', '08006', '08001', '08004'];
  if (e.code && codes.includes(e.code)) return true;
  const msg = e.message ?? '';
  return /connection terminated|timeout exceeded when trying to connect|Connection terminated|ECONNREFUSED/i.test(msg);
}

/** Turns any thrown value into an AppError that is safe to send. Logs what is not. */
export function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (isDatabaseUnavailable(err)) {
    console.error('[db] unavailable:', (err as Error).message);
    return new AppError('unavailable', 'The database is not reachable right now. Try again in a moment.', { retryAfterSeconds: 5 });
  }
  console.error('[internal]', err);
  return new AppError('internal', 'Something went wrong on our side. The error has been logged.');
}
