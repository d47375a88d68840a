import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { convert } from 'jcampconverter';
import { anonymous, signIn } from '../support/http';
import { query } from '../support/db';
import { closeSequelize } from '@/db/connection';

afterAll(() => closeSequelize());

type Row = { id: number; revision: number; licence: string; email: string; n: number };

async function verifiedCurve(): Promise<Row> {
  const [c] = await query<Row>(
    `SELECT c.id, c.revision, c.licence, u.email, c.point_count AS n FROM curves c JOIN users u ON u.id = c.contributor_id WHERE c.status = 'verified' ORDER BY c.id LIMIT 1`,
  );
  return c;
}

async function submittedCurve(): Promise<Row> {
  const [c] = await query<Row>(
    `SELECT c.id, c.revision, c.licence, u.email, c.point_count AS n FROM curves c JOIN users u ON u.id = c.contributor_id WHERE c.status = 'submitted' ORDER BY c.id LIMIT 1`,
  );
  return c;
}

describe('GET /api/curves/:id/cite, /jcamp, /votable', () => {
  const visitor = anonymous();

  it('cite: BibTeX by default and CSL-JSON on request, naming revision, licence and the permanent URL', async () => {
    const c = await verifiedCurve();
    const bib = await visitor.fetch(`/api/curves/${c.id}/cite`);
    expect(bib.status).toBe(200);
    expect(bib.headers.get('content-type')).toContain('application/x-bibtex');
    const text = await bib.text();
    expect(text).toContain(`@misc{bandcone-curve-${c.id}-r${c.revision},`);
    expect(text).toContain(`/curves/${c.id}}`);
    expect(text).toContain(`licence ${c.licence}`);
    const csl = await visitor.fetch(`/api/curves/${c.id}/cite?format=csl`);
    expect(csl.status).toBe(200);
    const [item] = (await csl.json()) as { type: string; version: string; URL: string }[];
    expect(item.type).toBe('dataset');
    expect(item.version).toBe(String(c.revision));
    expect(item.URL.endsWith(`/curves/${c.id}`)).toBe(true);
  });

  it('cite: an unknown format is a 422 with a sentence', async () => {
    const c = await verifiedCurve();
    const res = await visitor.fetch(`/api/curves/${c.id}/cite?format=ris`);
    expect(res.status).toBe(422);
    expect(((await res.json()) as { error: string }).error).toContain('bibtex or csl');
  });

  it('JCAMP-DX reads back in jcampconverter with every point', async () => {
    const c = await verifiedCurve();
    const res = await visitor.fetch(`/api/curves/${c.id}/jcamp`);
    expect(res.status).toBe(200);
    const text = await res.text();
    const plain = text.includes('##XYPOINTS=') ? text.replace('##XYPOINTS=(XY..XY)', '##XYDATA=(XY..XY)') : text;
    const spectrum = convert(plain).flatten[0].spectra[0];
    expect(spectrum.data.x.length).toBe(c.n);
    const [pts] = await query<{ w: number[]; t: number[] }>(`SELECT wavelength_nm AS w, transmission AS t FROM curves WHERE id = :id`, { id: c.id });
    for (let i = 0; i < c.n; i += 17) {
      expect(Math.abs(spectrum.data.x[i] - pts.w[i])).toBeLessThan(1e-6);
      expect(Math.abs(spectrum.data.y[i] - pts.t[i])).toBeLessThan(1e-6);
    }
  });

  it('VOTable passes astropy (parse with verify="exception") for a served curve', async () => {
    const c = await verifiedCurve();
    const res = await visitor.fetch(`/api/curves/${c.id}/votable`);
    expect(res.status).toBe(200);
    const file = path.join(mkdtempSync(path.join(tmpdir(), 'bandcone-vot-')), 'c.xml');
    writeFileSync(file, await res.text());
    const py = ['/usr/bin/python3', 'python3'].find((p) => spawnSync(p, ['-c', 'import astropy.io.votable']).status === 0);
    expect(py, 'python3-astropy must be installed (./scripts/test.sh installs it)').toBeTruthy();
    const n = execFileSync(py!, ['-c', 'import sys; from astropy.io.votable import parse; print(len(parse(sys.argv[1], verify="exception").get_first_table().array))', file], { encoding: 'utf8' });
    expect(Number(n.trim())).toBe(c.n);
  });

  it('an unverified curve is 404 for the public and other contributors, readable by its contributor and moderators', async () => {
    const c = await submittedCurve();
    const other = await signIn(c.email === 'contributor@bandcone.test' ? 'contributor2@bandcone.test' : 'contributor@bandcone.test');
    const owner = await signIn(c.email);
    const moderator = await signIn('moderator@bandcone.test');
    for (const suffix of ['cite', 'cite?format=csl', 'jcamp', 'votable']) {
      expect((await visitor.fetch(`/api/curves/${c.id}/${suffix}`)).status, suffix).toBe(404);
      expect((await other.fetch(`/api/curves/${c.id}/${suffix}`)).status, suffix).toBe(404);
      expect((await moderator.fetch(`/api/curves/${c.id}/${suffix}`)).status, suffix).toBe(200);
    }
    if (c.email.endsWith('@bandcone.test')) {
      const res = await owner.fetch(`/api/curves/${c.id}/cite`);
      expect(res.status).toBe(200);
      expect(await res.text()).toContain('not yet verified');
    }
  });

  it('a malformed id is 404, not 500', async () => {
    for (const id of ['abc', '0', '99999999999', '-1']) expect((await visitor.fetch(`/api/curves/${id}/jcamp`)).status, id).toBe(404);
  });
});
