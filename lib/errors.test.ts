import { describe, expect, it, vi } from 'vitest';
import { AppError, DATABASE_INPUT_MESSAGE, ERROR_STATUS, isClientAbort, isDatabaseUnavailable, toAppError } from './errors';

describe('AppError', () => {
  it.each(Object.entries(ERROR_STATUS))('%s → %i', (code, status) => {
    expect(new AppError(code as keyof typeof ERROR_STATUS, 'x').status).toBe(status);
  });
});

/** An error as Node's net module raises it for a socket this process opened. */
const socketError = (code: string, syscall: string, message = `${syscall} ${code}`) => Object.assign(new Error(message), { code, syscall, errno: -104 });
/** An error as node-postgres raises it from a PostgreSQL ErrorResponse. */
const serverError = (code: string, message: string) => Object.assign(new Error(message), { code, severity: 'FATAL' });

describe('database unavailability', () => {
  it.each([
    ['connection refused', true, socketError('ECONNREFUSED', 'connect', 'connect ECONNREFUSED 127.0.0.1:5432')],
    ['refused, as a plain object', true, { code: 'ECONNREFUSED', message: 'connect ECONNREFUSED 127.0.0.1:5432' }],
    ['server shut down (57P01)', true, serverError('57P01', 'terminating connection due to administrator command')],
    ['server starting up (57P03)', true, serverError('57P03', 'the database system is starting up')],
    ['connection failure (08006)', true, serverError('08006', 'connection failure')],
    ['too many connections (53300)', true, serverError('53300', 'sorry, too many clients already')],
    ['connection lost mid-query', true, new Error('Connection terminated unexpectedly')],
    ['connect timeout', true, new Error('timeout exceeded when trying to connect')],
    ['the database socket reset', true, socketError('ECONNRESET', 'read')],
    ['host name not found', true, socketError('ENOTFOUND', 'getaddrinfo', 'getaddrinfo ENOTFOUND db.internal')],
    ['several addresses, all refused', true, Object.assign(new AggregateError([socketError('ECONNREFUSED', 'connect'), socketError('ECONNREFUSED', 'connect')]), { code: 'ECONNREFUSED' })],
    ['wrapped as a cause', true, new Error('saving the chunk failed', { cause: new Error('Connection terminated unexpectedly') })],
    ['unique violation', false, serverError('23505', 'duplicate key value violates unique constraint')],
    ['bad input (22P02)', false, serverError('22P02', 'invalid input syntax for type uuid: "x"')],
    ['a browser closed the request', false, Object.assign(new Error('aborted'), { code: 'ECONNRESET' })],
    ['a fetch aborted', false, new DOMException('This operation was aborted', 'AbortError')],
    ['Next.js: response aborted', false, Object.assign(new Error('ResponseAborted'), { name: 'ResponseAborted' })],
    ['a reset without a failed system call of ours', false, { code: 'ECONNRESET', message: 'socket hang up' }],
    ['the mail server refused', false, Object.assign(new Error('Connection error: connect ECONNREFUSED 127.0.0.1:2525'), { code: 'ESOCKET' })],
    ['a message that merely mentions it', false, new Error('SMTP connection terminated unexpectedly')],
    ['nothing', false, undefined],
  ])('%s → %s', (_, down, err) => expect(isDatabaseUnavailable(err)).toBe(down));

  it('becomes a 503 that says what is happening', () => {
    const e = toAppError(socketError('ECONNREFUSED', 'connect', 'connect ECONNREFUSED 127.0.0.1:5432'));
    expect(e.status).toBe(503);
    expect(e.message).toMatch(/database is not reachable/);
  });
});

describe('a client that went away', () => {
  it.each([
    ['Node: request aborted', Object.assign(new Error('aborted'), { code: 'ECONNRESET' })],
    ['AbortError', new DOMException('This operation was aborted', 'AbortError')],
    ['ABORT_ERR', Object.assign(new Error('The operation was aborted'), { code: 'ABORT_ERR' })],
  ])('%s is a client abort, answered 400 and not logged as the database', (_, err) => {
    expect(isClientAbort(err)).toBe(true);
    const warnings = vi.spyOn(console, 'error').mockImplementation(() => {});
    const info = vi.spyOn(console, 'log').mockImplementation(() => {});
    try {
      const e = toAppError(err);
      expect(e.status).toBe(400);
      expect(warnings).not.toHaveBeenCalled();
      expect(info.mock.calls.join('\n')).not.toMatch(/database/i);
    } finally {
      warnings.mockRestore();
      info.mockRestore();
    }
  });

  it('is not a database failure', () => {
    expect(isClientAbort(socketError('ECONNREFUSED', 'connect'))).toBe(false);
    expect(isClientAbort(new Error('Connection terminated unexpectedly'))).toBe(false);
  });
});

describe('input PostgreSQL refuses', () => {
  it.each([
    ['22P02', 'invalid input syntax for type uuid: "abc"'],
    ['22P05', 'unsupported Unicode escape sequence'],
    ['22021', 'invalid byte sequence for encoding "UTF8": 0x00'],
    ['22001', 'value too long for type character varying(200)'],
    ['22003', 'value "99999999999" is out of range for type integer'],
    ['22007', 'invalid input syntax for type timestamp with time zone'],
    ['22008', 'date/time field value out of range'],
    ['22025', 'invalid escape string'],
  ])('%s becomes a 400 with a plain message, logged (and only these input errors do)', (code, message) => {
    const logged = vi.spyOn(console, 'error').mockImplementation(() => {});
    const e = toAppError(Object.assign(new Error(message), { code }));
    expect(e.status).toBe(400);
    expect(e.message).toBe(DATABASE_INPUT_MESSAGE);
    expect(e.message).not.toContain(message);
    expect(logged.mock.calls.flat().join(' ')).toContain(code);
    // Other database errors stay a logged 500.
    expect(toAppError(Object.assign(new Error('duplicate key value violates unique constraint'), { code: '23505' })).status).toBe(500);
    logged.mockRestore();
  });
});
