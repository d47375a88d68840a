import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { json, signIn, type Client } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize, getSequelize } from '@/db/connection';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';

// Least privilege and verified data that stays as verified (db/migrations/0005). The refused
// side is tried as the app role itself; the allowed side runs through the real endpoints,
// which the test server serves as that role. PostgreSQL error codes are from its manual,
// Appendix A: 42501 insufficient_privilege, 23000 integrity_constraint_violation.

const APP_URL = process.env.TEST_APP_DATABASE_URL;
let app: pg.Client;
let contributor: Client;
let moderator: Client;

afterAll(async () => {
  await app?.end();
  await closeSequelize();
});

beforeAll(async () => {
  expect(APP_URL, 'scripts/test.sh sets TEST_APP_DATABASE_URL').toBeTruthy();
  app = new pg.Client({ connectionString: APP_URL });
  await app.connect();
  const u = await makeUser();
  contributor = await signIn(u.email, u.password);
  moderator = await signIn('moderator@bandcone.test');
});

async function refusedAsApp(sql: string, params: unknown[] = [], code?: string) {
  let error: (Error & { code?: string }) | undefined;
  try {
    await app.query('BEGIN');
    await app.query(sql, params);
  } catch (err) {
    error = err as Error & { code?: string };
  } finally {
    await app.query('ROLLBACK');
  }
  expect(error, `refused: ${sql}`).toBeDefined();
  if (code) expect(error?.code).toBe(code);
  return error!;
}

async function submitAndVerify(): Promise<number> {
  const res = await contributor.fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve('guarded.csv')], metadataFor()) });
  expect(res.status).toBe(201);
  const { id, curveIds } = await json<{ id: number; curveIds: number[] }>(res);
  const review = await moderator.fetch(`/api/submissions/${id}/review`, {
    method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ decision: 'verify', note: 'fine' }),
  });
  expect(review.status).toBe(200);
  return curveIds[0];
}

describe('the app role', () => {
  it('is its own login, not a superuser, and the test server is connected as it', async () => {
    const { rows } = await app.query(`SELECT current_user AS who, r.rolsuper, r.rolcreaterole, r.rolcreatedb
      FROM pg_roles r WHERE r.rolname = current_user`);
    expect(rows[0]).toEqual({ who: 'bandcone_app', rolsuper: false, rolcreaterole: false, rolcreatedb: false });
    expect((await contributor.fetch('/api/submissions')).status).toBe(200);
    const serving = await query<{ n: string }>(`SELECT count(*) AS n FROM pg_stat_activity WHERE usename = 'bandcone_app' AND datname = current_database()`);
    // our own client is one; the server's pool adds at least one more
    expect(Number(serving[0].n)).toBeGreaterThanOrEqual(2);
  });

  it('cannot change the schema', async () => {
    await refusedAsApp('CREATE TABLE intruder (id int)', [], '42501');
    await refusedAsApp('ALTER TABLE curves ADD COLUMN intruder int', [], '42501');
    await refusedAsApp('DROP TABLE audit_events', [], '42501');
    await refusedAsApp('ALTER TABLE curves DISABLE TRIGGER curves_guard_verified', [], '42501');
    await refusedAsApp('CREATE SCHEMA intruder', [], '42501');
    await refusedAsApp(`DELETE FROM schema_migrations`, [], '42501');
  });
});

describe('a verified curve never changes what it says', () => {
  let id: number;
  beforeAll(async () => {
    id = await submitAndVerify();
  });

  it.each([
    ['its points', `UPDATE curves SET transmission[1] = transmission[1] + 0.01 WHERE id = $1`],
    ['its wavelengths', `UPDATE curves SET wavelength_nm[1] = wavelength_nm[1] + 0.01 WHERE id = $1`],
    ['its points hash', `UPDATE curves SET points_hash = 'forged' WHERE id = $1`],
    ['its method', `UPDATE curves SET method = method || '{"beam":"forged"}' WHERE id = $1`],
    ['its AOI', `UPDATE curves SET aoi_deg = aoi_deg + 1 WHERE id = $1`],
    ['its derived CWL', `UPDATE curves SET cwl_nm = cwl_nm + 1 WHERE id = $1`],
    ['its derived peak', `UPDATE curves SET peak_t = 0.99 WHERE id = $1`],
    ['its line transmission', `UPDATE curves SET line_transmission = '{}' WHERE id = $1`],
    ['its licence', `UPDATE curves SET licence = 'CC0-1.0' WHERE id = $1`],
    ['its attribution', `UPDATE curves SET contributor_id = (SELECT id FROM users WHERE email = 'admin@bandcone.test') WHERE id = $1`],
    ['its status, back to submitted', `UPDATE curves SET status = 'submitted' WHERE id = $1`],
    ['by a delete', `DELETE FROM curves WHERE id = $1`],
    ['its raw file hash', `UPDATE submission_files SET sha256 = 'forged' WHERE id = (SELECT file_id FROM curves WHERE id = $1)`],
    ['its raw file bytes', `UPDATE submission_files SET content = 'x'::bytea WHERE id = (SELECT file_id FROM curves WHERE id = $1)`],
  ])('refuses a change to %s as the app role', async (_what, sql) => {
    const err = await refusedAsApp(sql, [id], '23000');
    expect(err.message).toMatch(/verified|exactly as uploaded/);
  });

  it('refuses it as the owner too, unless the owner deliberately lifts the guard', async () => {
    await expect(getSequelize().query(`UPDATE curves SET peak_t = 0.99 WHERE id = $1`, { bind: [id] })).rejects.toThrow(/was verified/);
    const [row] = await query<{ peak_t: number }>('SELECT peak_t FROM curves WHERE id = :id', { id });
    expect(row.peak_t).not.toBe(0.99);
  });

  it('the app role cannot lift the guard', async () => {
    await app.query('BEGIN');
    await app.query(`SET LOCAL bandcone.maintenance = 'on'`);
    await expect(app.query(`UPDATE curves SET peak_t = 0.99 WHERE id = $1`, [id])).rejects.toThrow(/was verified/);
    await app.query('ROLLBACK');
  });
});

describe('the audit trail is append-only', () => {
  it('refuses UPDATE, DELETE and TRUNCATE as the app role, and UPDATE or DELETE even as the owner', async () => {
    const [{ id }] = await query<{ id: string }>('SELECT max(id) AS id FROM audit_events');
    await refusedAsApp(`UPDATE audit_events SET action = 'forged' WHERE id = $1`, [id], '42501');
    await refusedAsApp(`DELETE FROM audit_events WHERE id = $1`, [id], '42501');
    await refusedAsApp(`TRUNCATE audit_events`, [], '42501');
    await expect(getSequelize().query(`UPDATE audit_events SET action = 'forged' WHERE id = $1`, { bind: [id] })).rejects.toThrow(/append-only/);
    await expect(getSequelize().query(`DELETE FROM audit_events WHERE id = $1`, { bind: [id] })).rejects.toThrow(/append-only/);
    // adding is the app's ordinary work
    await app.query(`INSERT INTO audit_events (action, detail) VALUES ('test.append', '{}')`);
  });
});

describe('what the workflow does stays allowed', () => {
  it('verifying (through the endpoints) stores the fitness rows and bumps the catalogue version', async () => {
    const [before] = await query<{ version: string }>('SELECT version FROM catalogue_version');
    const id = await submitAndVerify();
    const [after] = await query<{ version: string }>('SELECT version FROM catalogue_version');
    expect(BigInt(after.version)).toBeGreaterThan(BigInt(before.version));
    const [curve] = await query<{ status: string; verified_at: Date | null }>('SELECT status, verified_at FROM curves WHERE id = :id', { id });
    expect(curve.status).toBe('verified');
    expect(curve.verified_at).not.toBeNull();
    expect((await query('SELECT 1 FROM curve_fitness WHERE curve_id = :id', { id })).length).toBeGreaterThan(0);
  });

  it('a verified curve becomes superseded when its revision is verified', async () => {
    const oldId = await submitAndVerify();
    // The revision is made by the service the seeds use (no endpoint offers it yet); it is verified
    // through the review endpoint, so the verified → superseded step runs in the server, as the app role.
    const { createSubmission, parseMetadata } = await import('@/moderation/submissions');
    const [owner] = await query<{ contributor_id: string }>('SELECT contributor_id FROM curves WHERE id = :id', { id: oldId });
    const file = singleCurve('revision.csv');
    const revision = await createSubmission(
      { id: owner.contributor_id, role: 'contributor' },
      parseMetadata(metadataFor()),
      [{ name: file.name, bytes: Buffer.from(file.text as string) }],
      { replacesCurveId: oldId, notify: false },
    );
    const review = await moderator.fetch(`/api/submissions/${revision.id}/review`, {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ decision: 'verify', note: 'corrected' }),
    });
    expect(review.status).toBe(200);
    const rows = await query<{ id: number; status: string }>('SELECT id, status FROM curves WHERE id IN (:ids) ORDER BY id', { ids: [oldId, revision.curveIds[0]] });
    expect(rows.map((r) => r.status)).toEqual(['superseded', 'verified']);
  });
});
