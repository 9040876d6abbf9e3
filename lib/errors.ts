/**
 * One error type for the whole app. Each code maps to one HTTP status; the message is safe to
 * show to the person who caused it. Database and other internal details are logged on the
 * server and never sent to the client.
 */
import { noteDatabaseDown } from '@/db/availability';
import { logger } from './log';

const log = logger('errors');

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

/**
 * SQLSTATE codes with which PostgreSQL says it cannot serve this connection now: class 08
 * (connection exception), 57P01–57P03 (shutting down, crashed, starting up) and 53300 (too many
 * connections). Only PostgreSQL sends five-character SQLSTATEs.
 */
const UNAVAILABLE_SQLSTATE = /^(?:08[0-9A-Z]{3}|57P0[123]|53300)$/;
/** Failures to open a connection: only an outgoing connection (to the database) can end in these. */
const CONNECT_CODES = new Set(['ECONNREFUSED', 'ETIMEDOUT', 'ENOTFOUND', 'EAI_AGAIN', 'EHOSTUNREACH', 'ENETUNREACH']);
/** Resets of an open socket: the database's when the socket was ours (a failed system call), a browser's otherwise. */
const RESET_CODES = new Set(['ECONNRESET', 'EPIPE']);
/** What node-postgres (pg, pg-pool) says when its connection is lost or cannot be made in time. */
const DRIVER_MESSAGE = /^(?:Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error and is not queryable|Client was closed and is not queryable)/;

interface ErrorShape {
  name?: unknown;
  code?: unknown;
  syscall?: unknown;
  message?: unknown;
  cause?: unknown;
  errors?: unknown;
}

/**
 * A request that its client gave up on: the browser closed the connection or aborted the fetch
 * while the body was read or the answer computed (Node's `aborted`, an AbortError, Next's
 * ResponseAborted). Nothing is wrong on our side, and the answer reaches nobody.
 */
export function isClientAbort(err: unknown): boolean {
  const e = err as ErrorShape | null | undefined;
  if (!e || typeof e !== 'object') return false;
  return e.name === 'AbortError' || e.name === 'ResponseAborted' || e.code === 'ABORT_ERR' || e.message === 'aborted';
}

/**
 * A connection-level failure of PostgreSQL (server down, refused, restarting, connection lost):
 * the request may succeed once the database is back, so it is answered 503, and a worker waits
 * and tries again. Errors about the query itself (a constraint, a syntax error) are not, and
 * neither is a client that went away: its ECONNRESET comes from the HTTP side (no failed system
 * call of ours; message `aborted`). Looks through `cause` and through the attempts of an
 * AggregateError (a host name with several addresses).
 */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  const e = err as ErrorShape | null | undefined;
  if (!e || typeof e !== 'object' || depth > 4 || isClientAbort(e)) return false;
  const code = typeof e.code === 'string' ? e.code : '';
  if (UNAVAILABLE_SQLSTATE.test(code) || CONNECT_CODES.has(code)) return true;
  if (RESET_CODES.has(code) && typeof e.syscall === 'string') return true;
  if (typeof e.message === 'string' && DRIVER_MESSAGE.test(e.message)) return true;
  if (Array.isArray(e.errors) && e.errors.some((inner) => isDatabaseUnavailable(inner, depth + 1))) return true;
  return isDatabaseUnavailable(e.cause, depth + 1);
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
    noteDatabaseDown(err, 'a request');
    return new AppError('unavailable', 'The database is not reachable right now. Try again in a moment.', { retryAfterSeconds: 5 });
  }
  if (isClientAbort(err)) {
    log.info('the client closed the connection before the answer was ready');
    return new AppError('bad_request', 'The request was cut off before it arrived in full. Send it again.');
  }
  log.error('unexpected error', err);
  return new AppError('internal', 'Something went wrong on our side. The error has been logged.');
}
