import { describe, expect, it } from 'vitest';
import { AppError, ERROR_STATUS, isDatabaseUnavailable, toAppError } from './errors';

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
