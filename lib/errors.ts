import { logger } from './log';

const log = logger('errors');

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

/**
 * PostgreSQL's data exceptions that only a value sent by a client can cause: text it cannot
 * represent or store (NUL, broken UTF-8, a malformed uuid or JSON text), a value too long or out
 * of range for its column, a malformed date. The schemas in lib/validation refuse all of these
 * first with a field error; this is the net for a field they missed, so that it is a 400 and not
 * a 500 — logged, because it means a schema has a gap.
 */
const DATABASE_INPUT_ERRORS: Record<string, string> = {
  '22P02': 'invalid_text_representation',
  '22P05': 'untranslatable_character',
  '22021': 'character_not_in_repertoire',
  '22001': 'string_data_right_truncation',
  '22003': 'numeric_value_out_of_range',
  '22007': 'invalid_datetime_format',
  '22008': 'datetime_field_overflow',
  '22025': 'invalid_escape_sequence',
};

/** The message of the net above; tests/integration/fuzz.test.ts counts how often it is answered. */
export const DATABASE_INPUT_MESSAGE = 'A value sent cannot be stored: check the text for invisible characters and the numbers for their range.';

export function isDatabaseInputError(err: unknown): boolean {
  const code = (err as { code?: unknown } | undefined)?.code;
  return typeof code === 'string' && code in DATABASE_INPUT_ERRORS;
}

/** Turns any thrown value into an AppError that is safe to send. Logs what is not. */
export function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (isDatabaseInputError(err)) {
    const { code, message } = err as { code: string; message?: string };
    log.warn(`input refused by PostgreSQL, answered 400 (a schema missed it): ${code} ${DATABASE_INPUT_ERRORS[code]}: ${message ?? ''}`);
    return new AppError('bad_request', DATABASE_INPUT_MESSAGE, { cause: err });
  }
  if (isDatabaseUnavailable(err)) {
    console.error('[db] unavailable:', (err as Error).message);
    return new AppError('unavailable', 'The database is not reachable right now. Try again in a moment.', { retryAfterSeconds: 5 });
  }
  console.error('[internal]', err);
  return new AppError('internal', 'Something went wrong on our side. The error has been logged.');
}
