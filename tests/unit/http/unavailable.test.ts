import { describe, expect, it } from 'vitest';
import { ConnectionRefusedError, DatabaseError, UniqueConstraintError } from 'sequelize';
import { isDatabaseUnavailable } from '@/lib/http/unavailable';
import { errorResponse } from '@/lib/http/errors';

// SQLSTATE codes from the PostgreSQL 15 manual, Appendix A "PostgreSQL Error Codes".
function pgError(code: string, message = 'x'): Error {
  return Object.assign(new Error(message), { code });
}

describe('a database that cannot be reached is told apart from a bad request', () => {
  it.each([
    ['57P01', 'admin_shutdown'],
    ['57P02', 'crash_shutdown'],
    ['57P03', 'cannot_connect_now'],
    ['08006', 'connection_failure'],
    ['08001', 'sqlclient_unable_to_establish_sqlconnection'],
    ['53300', 'too_many_connections'],
  ])('SQLSTATE %s (%s) means unavailable', (code) => {
    expect(isDatabaseUnavailable(pgError(code))).toBe(true);
    // Sequelize wraps the driver's error as `parent`.
    expect(isDatabaseUnavailable(new DatabaseError(pgError(code) as never))).toBe(true);
  });

  it.each([
    ['23505', 'unique_violation'],
    ['23514', 'check_violation'],
    ['22P02', 'invalid_text_representation'],
    ['40001', 'serialization_failure'],
  ])('SQLSTATE %s (%s) is not an outage', (code) => {
    expect(isDatabaseUnavailable(pgError(code))).toBe(false);
  });

  it('a refused socket and a terminated connection are outages; other errors are not', () => {
    expect(isDatabaseUnavailable(new ConnectionRefusedError(pgError('ECONNREFUSED')))).toBe(true);
    expect(isDatabaseUnavailable(new Error('Connection terminated unexpectedly'))).toBe(true);
    expect(isDatabaseUnavailable(new UniqueConstraintError({}))).toBe(false);
    expect(isDatabaseUnavailable(new TypeError('x is undefined'))).toBe(false);
    expect(isDatabaseUnavailable(null)).toBe(false);
  });

  it('answers 503 with Retry-After and a sentence, not a 500', async () => {
    const res = errorResponse(new DatabaseError(pgError('57P03', 'the database system is starting up') as never));
    expect(res.status).toBe(503);
    expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
    expect((await res.json()).error).toMatch(/briefly unavailable/);
    expect(errorResponse(new TypeError('bug')).status).toBe(500);
  });
});
