import { afterAll, describe, expect, it } from 'vitest';
import { json, signIn } from '../support/http';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';
import { closeSequelize } from '@/db/connection';
import { parseSearchParams } from '@/lib/catalogue/search-params';
import { searchCurves } from '@/lib/catalogue/search';

// The public catalogue's kept counts belong to one catalogue version. This test process is a second
// serving process: it keeps a count, the server verifies a curve (forgetting only its own counts),
// and the count kept here must not outlive the catalogue it counted.
afterAll(() => closeSequelize());

describe('kept catalogue counts across processes', () => {
  it('a verification in another process retires this process’s kept total', async () => {
    const word = `quillmere${Date.now().toString(36)}`;
    const params = parseSearchParams({ q: word });
    const before = await searchCurves(null, params);
    expect(before.total).toBe(0);

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
    expect(after.items.length).toBe(1);
    expect(after.total).toBe(1);
  });
});
