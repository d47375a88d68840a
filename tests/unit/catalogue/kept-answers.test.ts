import { afterEach, describe, expect, it, vi } from 'vitest';
import { ANSWER_TTL_MS, cachedAnswer, cachedCounts, forgetCounts, keptAnswers } from '@/lib/catalogue/count-cache';

// Signed-out visitors' answers kept under the catalogue version (lib/catalogue/count-cache.ts).
// Each test starts past the settling window that follows a change (answers are not kept then).
async function settled() {
  forgetCounts();
  await new Promise((r) => setTimeout(r, 2_050));
}

afterEach(() => vi.useRealTimers());

describe('kept answers', () => {
  it('answers the same key once, frozen, and forgets on a change', async () => {
    await settled();
    let computed = 0;
    const compute = async () => ({ n: ++computed, items: [{ id: 1, sparkline: { wavelengthNm: [500, 501] } }] });
    const a = await cachedAnswer('v1\nq', compute);
    const b = await cachedAnswer('v1\nq', compute);
    expect(b).toBe(a);
    expect(computed).toBe(1);
    expect(Object.isFrozen(a.items[0].sparkline.wavelengthNm)).toBe(true);
    expect(() => (a.items as { id: number }[]).push({ id: 2 })).toThrow(TypeError);
    // another version is another key
    expect((await cachedAnswer('v2\nq', compute)).n).toBe(2);
    forgetCounts();
    expect(keptAnswers()).toBe(0);
    // within the settling window after a change nothing is kept: each ask computes
    await cachedAnswer('v2\nq', compute);
    await cachedAnswer('v2\nq', compute);
    expect(computed).toBe(4);
  }, 10_000);

  it('keeps no failure, and at most 200 answers', async () => {
    await settled();
    let calls = 0;
    const failing = () => (calls++, Promise.reject(new Error('database down')));
    await expect(cachedAnswer('v\nfail', failing)).rejects.toThrow('database down');
    await expect(cachedAnswer('v\nfail', failing)).rejects.toThrow('database down');
    expect(calls).toBe(2);
    for (let i = 0; i < 250; i++) await cachedAnswer(`v\n${i}`, async () => ({ i }));
    expect(keptAnswers()).toBe(200);
    // the oldest went first
    let again = 0;
    await cachedAnswer('v\n0', async () => ({ i: (again++, 0) }));
    expect(again).toBe(1);
  }, 10_000);

  it('lets answers lapse at staggered times between three quarters of their limit and all of it', async () => {
    await settled();
    vi.useFakeTimers({ toFake: ['Date'] });
    const start = Date.now();
    let computed = 0;
    for (let i = 0; i < 40; i++) await cachedAnswer(`v\nlapse${i}`, async () => ({ i, n: ++computed }));
    const stillKept = async () => {
      const before = computed;
      for (let i = 0; i < 40; i++) await cachedAnswer(`v\nlapse${i}`, async () => ({ i, n: ++computed }));
      const recomputed = computed - before;
      return 40 - recomputed;
    };
    vi.setSystemTime(start + ANSWER_TTL_MS * 0.74);
    expect(await stillKept()).toBe(40);
    // recomputed ones are kept afresh; move on from the original start again
    vi.setSystemTime(start + ANSWER_TTL_MS * 0.875);
    const between = await stillKept();
    // at 7/8 of the limit some have lapsed and some not (40 draws: all on one side has odds of 2 × 2^-40)
    expect(between).toBeGreaterThan(0);
    expect(between).toBeLessThan(40);
  }, 10_000);

  it('keeps counts apart from answers', async () => {
    await settled();
    const counts = await cachedCounts('k', async () => [{ n: 1 }]);
    expect(Object.isFrozen(counts)).toBe(false);
    expect(keptAnswers()).toBe(0);
  }, 10_000);
});
