import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { anonymous, json } from '../support/http';

// The reader's limits and lab-file forms, end to end through the anonymous
// preview route: each refusal is a 422 naming the line, never a 5xx.

async function preview(text: string | Uint8Array, name = 'bench.csv', options?: unknown) {
  const form = new FormData();
  form.append('file', new Blob([text as BlobPart]), name);
  if (options) form.append('options', JSON.stringify(options));
  return anonymous().fetch('/api/curves/preview', { method: 'POST', body: form });
}

const ROWS = ['wl,t', '650,0.1', '652,0.5', '654,0.9', '656,0.5', '658,0.1'];

describe('reader limits through POST /api/curves/preview', () => {
  it('a row of more than 64 columns: 422 naming the line', async () => {
    const wide = ROWS.map((r, i) => (i === 0 ? r : `${r},${Array.from({ length: 70 }, () => '1').join(',')}`));
    const res = await preview(wide.join('\n'));
    expect(res.status).toBe(422);
    const body = await json(res);
    expect(body.details[0]).toMatchObject({ line: 2, message: expect.stringMatching(/more than 64 columns/) });
  });

  it('a long digit run in a data row: 422 naming the line', async () => {
    const rows = [...ROWS];
    rows[3] = `654,${'9'.repeat(160_000)}x`;
    const res = await preview(rows.join('\n'));
    expect(res.status).toBe(422);
    expect((await json(res)).details[0]).toMatchObject({ line: 4, message: expect.stringMatching(/longer than the 64 a number may have/) });
  });

  it('a column option past the cap is refused by the schema (422)', async () => {
    const res = await preview(ROWS.join('\n'), 'bench.csv', { transmissionColumn: 64 });
    expect(res.status).toBe(422);
  });
});

describe('lab files through the preview', () => {
  it('a footer falls away and is reported in assumed', async () => {
    const res = await preview([...ROWS, 'End of data', 'Checksum,0x3F2A'].join('\n'));
    expect(res.status).toBe(200);
    const body = await json(res);
    expect(body.assumed).toMatchObject({ footerLines: 2, skipped: [{ from: 1, to: 1, what: 'header', text: 'wl,t' }, { from: 7, to: 8, what: 'footer', text: 'End of data' }] });
    expect(body.points.wavelengthNm).toEqual([650, 652, 654, 656, 658]);
  });

  it('a compressed JCAMP-DX file (hand-written fixture, IUPAC format)', async () => {
    const file = readFileSync(path.join(import.meta.dirname, '..', 'fixtures', 'jcamp', 'compressed-difdup.jdx'));
    const res = await preview(new Uint8Array(file), 'scan.jdx');
    expect(res.status).toBe(200);
    const body = await json(res);
    expect(body.assumed).toMatchObject({ format: 'jcamp-dx', wavelengthUnit: 'nm' });
    expect(body.points.wavelengthNm).toHaveLength(13);
    expect(body.metrics.peakT).toBeCloseTo(0.9, 6);
  });
});
