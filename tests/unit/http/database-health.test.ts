import { describe, expect, it } from 'vitest';

describe('the page-side database check', () => {
  it('says down when nothing listens, asks at most once a second, and serves a 503 page with no script', async () => {
    // A port where nothing listens on this machine: the connection is refused at once.
    process.env.APP_DATABASE_URL = 'postgres://nobody:x@127.0.0.1:9/none';
    const { databaseUp, UNAVAILABLE_PAGE } = await import('@/lib/http/database-health');
    const t = Date.now();
    const first = databaseUp(t);
    expect(databaseUp(t + 500)).toBe(first); // the same answer shared within the second
    expect(await first).toBe(false);
    expect(databaseUp(t + 1_000)).not.toBe(first); // asked again after it
    expect(UNAVAILABLE_PAGE).toMatch(/briefly unavailable/);
    expect(UNAVAILABLE_PAGE).not.toMatch(/<script/i);
    delete process.env.APP_DATABASE_URL;
  });
});
