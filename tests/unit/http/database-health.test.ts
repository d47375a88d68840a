import { describe, expect, it } from 'vitest';

describe('the page-side database check', () => {
  it('says down when nothing listens, asks at most four times a second, and serves a 503 page with no script', async () => {
    // A port where nothing listens on this machine: the connection is refused at once.
    process.env.APP_DATABASE_URL = 'postgres://nobody:x@127.0.0.1:9/none';
    const { databaseUp, UNAVAILABLE_PAGE } = await import('@/lib/http/database-health');
    const t = Date.now();
    const first = databaseUp(t);
    expect(databaseUp(t + 100)).toBe(first); // the same answer shared within a quarter second
    expect(await first).toBe(false);
    expect(databaseUp(t + 300)).not.toBe(first); // asked again after it
    expect(UNAVAILABLE_PAGE).toMatch(/briefly unavailable/);
    expect(UNAVAILABLE_PAGE).not.toMatch(/<script/i);
    delete process.env.APP_DATABASE_URL;
  });

  it('a lost connection reported by a request marks the database as lost for a few seconds; other errors do not', async () => {
    const { noteRequestError, databaseRecentlyLost } = await import('@/lib/http/database-health');
    const now = Date.now();
    noteRequestError(new TypeError('a bug'));
    expect(databaseRecentlyLost(now)).toBe(false);
    // SQLSTATE 57P01 admin_shutdown (PostgreSQL 15 manual, Appendix A)
    noteRequestError(Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' }));
    expect(databaseRecentlyLost()).toBe(true);
    expect(databaseRecentlyLost(Date.now() + 10_000)).toBe(false);
  });
});
