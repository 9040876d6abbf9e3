import { describe, expect, it, vi } from 'vitest';
import { AppError, DATABASE_INPUT_MESSAGE, ERROR_STATUS, isDatabaseUnavailable, toAppError } from './errors';

describe('AppError', () => {
  it.each(Object.entries(ERROR_STATUS))('%s → %i', (code, status) => {
    expect(new AppError(code as keyof typeof ERROR_STATUS, 'x').status).toBe(status);
  });
});

describe('database unavailability', () => {
  it.each([
    [{ code: 'ECONNREFUSED', message: 'connect ECONNREFUSED 127.0.0.1:5432' }, true],
    [{ code: '57P01', message: 'terminating connection due to administrator command' }, true],
    [new Error('Connection terminated unexpectedly'), true],
    [new Error('timeout exceeded when trying to connect'), true],
    [{ code: '23505', message: 'duplicate key value violates unique constraint' }, false],
  ])('%j → %s', (err, down) => expect(isDatabaseUnavailable(err)).toBe(down));

  it('becomes a 503 that says what is happening', () => {
    const e = toAppError(Object.assign(new Error('connect ECONNREFUSED'), { code: 'ECONNREFUSED' }));
    expect(e.status).toBe(503);
    expect(e.message).toMatch(/database is not reachable/);
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
