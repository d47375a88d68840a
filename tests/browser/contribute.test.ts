import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launch, screenshot } from '../support/browser';
import { BASE, anonymous, json } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { angleScale, curveCsv, HA_NM } from '../integration/submissions-fixtures';
import { closeSequelize } from '@/db/connection';
import { bucketOrigin } from '@/lib/storage/config';
import { exists, rawKey } from '@/lib/storage/objects';

// One filter measured at two angles, generated with n_eff = 2.0 (docs/model.md §Angle shift): the
// fitted effective index must come back as 2.0 and the normal-incidence CWL as 656.3 nm.
const N_EFF = 2.0;
const ANGLES = [0, 15];

let browser: Browser;
let dir: string;
let contributor: { id: string; email: string; password: string };
const label = `Walkthrough Hα 3 nm ${Date.now()}`;

beforeAll(async () => {
  browser = await launch();
  contributor = await makeUser('contributor');
  dir = mkdtempSync(path.join(tmpdir(), 'bandcone-contribute-'));
});
afterAll(async () => {
  await browser?.close();
  await closeSequelize();
});

function writeSet(tag: string, seed: number) {
  return ANGLES.map((aoi, i) => {
    const file = path.join(dir, `wt-${tag}-aoi${aoi}.csv`);
    writeFileSync(file, curveCsv({ cwlNm: HA_NM, fwhmNm: 3, aoiDeg: aoi, nEff: N_EFF, noiseSeed: (Date.now() % 1_000_000) + seed + i }));
    return file;
  });
}

// Signs in through the form by its field ids (the label text carries a "required" mark).
async function signIn(page: Page, email: string, password = process.env.DEMO_PASSWORD ?? 'bandcone-demo') {
  await page.goto(`${BASE}/signin`, { waitUntil: 'networkidle' });
  await page.locator('#email').fill(email);
  await page.locator('#password').fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForSelector('[data-testid=signed-in-as]', { state: 'attached' });
}

async function addFiles(page: Page, files: string[]) {
  await page.waitForSelector('.uppy-Dashboard-input', { state: 'attached' });
  await page.locator('.uppy-Dashboard-input').first().setInputFiles(files);
  await page.waitForFunction((n) => document.querySelectorAll('[data-testid=derived-numbers]').length >= n, files.length, { timeout: 30_000 });
}

async function newPage(width = 1440) {
  const context = await browser.newContext({ viewport: { width, height: 900 } });
  return context.newPage();
}

describe('a curve set from the bench to the public library', () => {
  let submissionId: number;

  it('a contributor uploads a two-angle set, sees the preview and the fitted effective index, and submits', async () => {
    const page = await newPage();
    await signIn(page, contributor.email, contributor.password);
    await page.goto(`${BASE}/submit`);
    await expect(page.getByRole('note', { name: 'Safety' }).textContent()).resolves.toMatch(/IEC 60825-1/);

    // The draft survives a reload: type, reload, find it again.
    await page.waitForSelector('#m-label');
    await page.locator('#m-label').fill(label);
    await page.locator('#m-nominalCwlNm').fill(String(HA_NM));
    await page.waitForTimeout(400);
    await page.reload();
    await page.waitForSelector('#m-label');
    await expect(page.locator('#m-label').inputValue()).resolves.toBe(label);
    await expect(page.locator('#m-nominalCwlNm').inputValue()).resolves.toBe(String(HA_NM));

    await addFiles(page, writeSet('a', 11));
    const aoiInputs = page.getByTestId('aoi-input');
    await expect(aoiInputs.count()).resolves.toBe(2);
    await aoiInputs.nth(0).fill('0');
    await aoiInputs.nth(1).fill('15');

    // Each preview reports the CWL the model predicts at its angle: 656.3 nm · s(θ).
    const cwls = await page.locator('[data-metric="CWL"]').allTextContents();
    expect(cwls.map((t) => parseFloat(t))).toEqual(ANGLES.map((a) => expect.closeTo(HA_NM * angleScale(a, N_EFF), 1)));
    await page.waitForFunction(() => !!document.querySelector('[data-testid=neff-value]'));
    const nEff = Number(await page.getByTestId('neff-value').textContent());
    expect(nEff).toBeCloseTo(N_EFF, 1);
    // the fit is drawn: the measured CWLs and the fitted curve over the angles
    const fitChart = page.getByTestId('neff-panel').locator('figure').filter({ hasText: 'CWL against angle of incidence' });
    await expect(fitChart.locator('canvas').count()).resolves.toBeGreaterThan(0);
    await expect(fitChart.textContent()).resolves.toContain(`Fit, n_eff ${nEff.toFixed(3)}`);
    const chart = page.locator('figure').filter({ hasText: 'Preview of' }).first();
    await expect(chart.locator('canvas').count()).resolves.toBeGreaterThan(0);

    // A required field left empty is named beside it, and nothing is sent.
    await page.getByRole('button', { name: 'Submit for review' }).click();
    await expect(page.locator('#m-method\\.instrument-error').textContent()).resolves.toMatch(/instrument/i);
    await expect(page.locator('#m-lines-error').textContent()).resolves.toMatch(/line/i);

    await page.getByLabel('Hα').check();
    await page.locator('#m-nominalFwhmNm').fill('3');
    await page.locator('#m-method\\.instrument').selectOption('spectrophotometer');
    await page.locator('#m-method\\.resolutionNm').fill('0.05');
    await page.locator('#m-method\\.beam').selectOption('collimated');
    await page.locator('#m-method\\.lab').fill('Walkthrough bench');
    await screenshot(page, 'contribute-submit-1440');
    // Each file goes from the browser straight to the file store (a presigned PUT through Uppy's S3 plugin).
    const puts: string[] = [];
    page.on('requestfinished', (req) => {
      if (req.method() === 'PUT' && req.url().startsWith(bucketOrigin())) puts.push(new URL(req.url()).pathname);
    });
    // The first attempt to submit loses its connection; the page sends it again by itself.
    let attempts = 0;
    await page.route('**/api/submissions', async (route) => {
      attempts += 1;
      if (attempts === 1) return route.abort('connectionreset');
      return route.continue();
    });
    await page.getByRole('button', { name: 'Submit for review' }).click();
    await page.waitForURL(/\/account\/submissions\/\d+/, { timeout: 30_000 });
    submissionId = Number(new URL(page.url()).pathname.split('/').pop());
    expect(attempts).toBe(2);
    await expect(page.locator('[data-status]').first().textContent()).resolves.toBe('waiting');
    await screenshot(page, 'contribute-sent-1440');

    const [row] = await query<{ status: string; files: number; curves: number }>(
      `SELECT s.status, (SELECT count(*)::int FROM submission_files f WHERE f.submission_id = s.id) AS files,
              (SELECT count(*)::int FROM curves c WHERE c.submission_id = s.id) AS curves FROM submissions s WHERE s.id = :id`, { id: submissionId });
    expect(row).toEqual({ status: 'submitted', files: 2, curves: 2 });
    expect(puts).toHaveLength(2);
    expect(puts.every((p) => p.includes('/staging/'))).toBe(true);
    // The rows keep hash, size, name and type; the bytes are in the bucket under raw/<sha256>, the staging copies gone.
    const files = await query<{ sha256: string; in_row: boolean }>('SELECT sha256, content IS NOT NULL AS in_row FROM submission_files WHERE submission_id = :id', { id: submissionId });
    for (const f of files) {
      expect(f.in_row).toBe(false);
      expect(await exists(rawKey(f.sha256))).toBe(true);
    }
    for (const p of puts) expect(await exists(p.slice(p.indexOf('/staging/') + 1))).toBe(false);
    await page.context().close();
  });

  it('a refusal from the server lands beside the field and the file it names, and the draft survives it', async () => {
    const page = await newPage(390);
    await signIn(page, contributor.email, contributor.password);
    await page.goto(`${BASE}/submit`);
    const [file] = writeSet('refused', 41);
    await addFiles(page, [file]);
    await page.locator('#m-label').fill('Refusal check Hα');
    await page.getByLabel('Hα').check();
    await page.locator('#m-nominalCwlNm').fill(String(HA_NM));
    await page.locator('#m-nominalFwhmNm').fill('3');
    await page.locator('#m-method\\.instrument').selectOption('monochromator');
    await page.locator('#m-method\\.resolutionNm').fill('0.1');
    await page.locator('#m-method\\.beam').selectOption('collimated');
    const name = path.basename(file);
    // What docs/api.md §Errors promises for a 422: a sentence, then per-field and per-line details.
    await page.route('**/api/submissions', (route) => route.fulfill({
      status: 422,
      contentType: 'application/json',
      body: JSON.stringify({ error: `${name}: Line 7: "x" is not a readable number.`, details: [{ line: 7, message: `${name}: "x" is not a readable number` }, { field: 'serial', message: 'Serial is already used by another unit' }] }),
    }));
    await page.getByRole('button', { name: 'Submit for review' }).click();
    await expect(page.getByTestId('submit-summary').textContent()).resolves.toContain('Line 7');
    await expect(page.locator(`[data-file="${name}"] [data-testid=file-problem]`).textContent()).resolves.toMatch(/line 7.*not a readable number/);
    await expect(page.locator('#m-serial-error').textContent()).resolves.toBe('Serial is already used by another unit');
    await screenshot(page, 'contribute-refused-390');
    await page.reload();
    await page.waitForSelector('#m-label');
    await expect(page.locator('#m-label').inputValue()).resolves.toBe('Refusal check Hα');
    await expect(page.locator('#m-method\\.instrument').inputValue()).resolves.toBe('monochromator');
    await page.context().close();
  });

  it('a moderator asks for changes with a note', async () => {
    const page = await newPage();
    await signIn(page, 'moderator@bandcone.test');
    await page.goto(`${BASE}/review`);
    await page.getByRole('link', { name: label }).click();
    await page.waitForURL(`${BASE}/review/${submissionId}`);
    await expect(page.locator('figure canvas').count()).resolves.toBeGreaterThan(0);
    await expect(page.getByTestId('files-table').locator('a').count()).resolves.toBe(2);
    await page.getByLabel(/Request changes/).check();
    await page.locator('#decision-note').fill('Please state the temperature of the measurement.');
    await page.getByRole('button', { name: 'Record the decision' }).click();
    await expect(page.getByTestId('decision-done').textContent()).resolves.toMatch(/changes requested/);
    await screenshot(page, 'contribute-review-1440');
    await page.context().close();
  });

  it('the contributor revises with new files and a temperature', async () => {
    const page = await newPage(390);
    await signIn(page, contributor.email, contributor.password);
    await page.goto(`${BASE}/account/submissions/${submissionId}`);
    await expect(page.getByText('Please state the temperature of the measurement.').first().isVisible()).resolves.toBe(true);
    await addFiles(page, writeSet('b', 23));
    await page.getByTestId('aoi-input').nth(0).fill('0');
    await page.getByTestId('aoi-input').nth(1).fill('15');
    await page.locator('#m-method\\.temperatureC').fill('21');
    await screenshot(page, 'contribute-revise-390');
    await page.getByRole('button', { name: 'Send the revision' }).click();
    await page.waitForURL(/revised=1/, { timeout: 30_000 });
    await expect(page.getByText(/Revision 2 sent/).isVisible()).resolves.toBe(true);
    const [row] = await query<{ status: string; revision: number; temp: string }>(`SELECT status, revision, metadata->'method'->>'temperatureC' AS temp FROM submissions WHERE id = :id`, { id: submissionId });
    expect(row).toEqual({ status: 'submitted', revision: 2, temp: '21' });
    await page.context().close();
  });

  it('another moderator verifies; the curves go public and both decisions are in the mailbox', async () => {
    const page = await newPage();
    await signIn(page, 'moderator2@bandcone.test');
    await page.goto(`${BASE}/review/${submissionId}`);
    await page.getByLabel(/^Verify/).check();
    await page.getByRole('button', { name: 'Record the decision' }).click();
    await expect(page.getByTestId('decision-done').textContent()).resolves.toMatch(/verified/);
    await page.context().close();

    const curves = await query<{ id: number; status: string }>(`SELECT id, status FROM curves WHERE submission_id = :id AND revision = 2 ORDER BY aoi_deg`, { id: submissionId });
    expect(curves.map((c) => c.status)).toEqual(['verified', 'verified']);
    for (const c of curves) {
      const res = await anonymous().fetch(`/api/curves/${c.id}`);
      expect(res.status).toBe(200);
      expect((await json(res)).status).toBe('verified');
    }
    // The first revision's curves are kept, superseded, never public.
    const old = await query<{ status: string }>(`SELECT status FROM curves WHERE submission_id = :id AND revision = 1`, { id: submissionId });
    expect(old.map((c) => c.status)).toEqual(['superseded', 'superseded']);

    const deadline = Date.now() + 10_000;
    let subjects: string[] = [];
    while (Date.now() < deadline) {
      subjects = (await query<{ subject: string }>(`SELECT subject FROM mail_messages WHERE :email = ANY(envelope_to) ORDER BY id`, { email: contributor.email })).map((m) => m.subject);
      if (subjects.some((s) => /verified/.test(s))) break;
      await new Promise((r) => setTimeout(r, 250));
    }
    expect(subjects).toEqual(expect.arrayContaining([expect.stringMatching(/request for changes/), expect.stringMatching(/verified and published/)]));

    const mine = await newPage(390);
    await signIn(mine, contributor.email, contributor.password);
    await mine.goto(`${BASE}/account`);
    await expect(mine.locator(`tr:has-text("${label}") [data-status]`).textContent()).resolves.toBe('verified');
    await screenshot(mine, 'contribute-account-390');
    await mine.context().close();
  });
  it('a revision that keeps its files can correct the angle they were measured at', async () => {
    // a demo submission sent back for changes, with one file kept as it is
    const [sent] = await query<{ id: number; revision: number }>(
      `SELECT s.id, s.revision FROM submissions s JOIN users u ON u.id = s.contributor_id
       WHERE u.email = 'contributor2@bandcone.test' AND s.status = 'changes_requested' ORDER BY s.id LIMIT 1`,
    );
    expect(sent).toBeDefined();
    const page = await newPage();
    await signIn(page, 'contributor2@bandcone.test');
    await page.goto(`${BASE}/account/submissions/${sent.id}`);
    const kept = page.getByTestId('kept-aoi-input');
    await expect.poll(() => kept.count(), { timeout: 20_000 }).toBe(1);
    await expect(kept.inputValue()).resolves.toBe('0');
    await kept.fill('75');
    await page.getByRole('button', { name: 'Send the revision' }).click();
    // out of range: refused beside the field, nothing sent
    await expect.poll(() => page.locator('[data-testid="kept-files"] [role="alert"]').textContent()).toMatch(/60/);
    const [still] = await query<{ revision: number }>(`SELECT revision FROM submissions WHERE id = :id`, { id: sent.id });
    expect(still.revision).toBe(sent.revision);

    await kept.fill('7.5');
    await page.getByRole('button', { name: 'Send the revision' }).click();
    await page.waitForURL(/revised=1/, { timeout: 30_000 });
    const curves = await query<{ aoi_deg: number; status: string }>(
      `SELECT aoi_deg, status FROM curves WHERE submission_id = :id AND revision = :rev`,
      { id: sent.id, rev: sent.revision + 1 },
    );
    expect(curves).toEqual([{ aoi_deg: 7.5, status: 'submitted' }]);
    const files = await query<{ aoi_deg: number }>(`SELECT aoi_deg FROM submission_files WHERE submission_id = :id AND revision = :rev`, { id: sent.id, rev: sent.revision + 1 });
    expect(files).toEqual([{ aoi_deg: 7.5 }]);
    await page.context().close();
  });
});
