import { afterAll, describe, expect, it } from 'vitest';
import { json, signIn } from '../support/http';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';
import { closeSequelize } from '@/db/connection';
import { parseSearchParams } from '@/lib/catalogue/search-params';
import { searchCurves } from '@/lib/catalogue/search';
import { keptAnswers } from '@/lib/catalogue/count-cache';

// The public catalogue's kept counts and kept answers belong to one catalogue version. This test
// process is a second serving process: it keeps a signed-out visitor's answer (and its count), the
// server verifies a curve (forgetting only its own), and what is kept here must not outlive the
// catalogue it describes.
afterAll(() => closeSequelize());

describe('kept catalogue counts across processes', () => {
  it('a verification in another process retires this process’s kept total and answer', async () => {
    const word = `quillmere${Date.now().toString(36)}`;
    const params = parseSearchParams({ q: word });
    const before = await searchCurves(null, params);
    expect(before.total).toBe(0);
    // the answer is kept: asked again, it is the same (frozen) object
    expect(await searchCurves(null, params)).toBe(before);
    expect(keptAnswers()).toBeGreaterThan(0);

    const contributor = await signIn('contributor2@bandcone.test');
    const moderator = await signIn('moderator@bandcone.test');
    const up = await contributor.fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve('counts.csv')], metadataFor({ label: `Counted ${word}` })) });
    expect(up.status).toBe(201);
    const { id } = await json<{ id: number }>(up);
    const review = await moderator.fetch(`/api/submissions/${id}/review`, {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ decision: 'verify', note: 'checked' }),
    });
    expect(review.status).toBe(200);

    const after = await searchCurves(null, params);
    expect(after).not.toBe(before);
    expect(after.items.length).toBe(1);
    expect(after.total).toBe(1);
  });
});
