import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, json, signIn, type Client } from '../support/http';
import { count, query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';

afterAll(() => closeSequelize());

type OpticBody = {
  id: number;
  name: string;
  isExample: boolean;
  mine: boolean;
  fNumber: number;
  obstruction: number;
  fieldAngleDeg: number;
  apertureMm: number | null;
  focalLengthMm: number | null;
  reducerFactor: number | null;
  derived: { fNumber: boolean; obstruction: boolean; fieldAngleDeg: boolean };
};
type ErrorBody = { error: string; details: { field?: string; message: string }[] };

const JSON_HEADERS = { 'content-type': 'application/json' };
const send = (c: Client, method: string, path: string, body?: unknown) =>
  c.fetch(path, { method, headers: JSON_HEADERS, body: body === undefined ? undefined : JSON.stringify(body) });

let owner: Client;
let other: Client;
let ownerId: string;

beforeAll(async () => {
  const a = await makeUser();
  const b = await makeUser();
  ownerId = a.id;
  owner = await signIn(a.email, a.password);
  other = await signIn(b.email, b.password);
});

describe('reading optics', () => {
  it('gives a visitor the example optics only', async () => {
    const res = await anonymous().fetch('/api/optics');
    expect(res.status).toBe(200);
    const { items, total } = await json<{ items: OpticBody[]; total: number }>(res);
    expect(items.length).toBeGreaterThanOrEqual(7);
    expect(total).toBe(items.length);
    expect(items.every((o) => o.isExample && !o.mine)).toBe(true);
    const astrograph = items.find((o) => o.name.startsWith('Obstructed astrograph'))!;
    // f-number = focal length / aperture diameter (the definition; W. J. Smith, Modern Optical Engineering): 500/200.
    expect(astrograph.fNumber).toBeCloseTo(2.5, 6);
    expect(astrograph.obstruction).toBeCloseTo(72 / 200, 6);
    expect((await anonymous().fetch(`/api/optics/${astrograph.id}`)).status).toBe(200);
  });

  it('gives a signed-in user their own optics beside the examples, never someone else’s', async () => {
    const mine = await json<OpticBody>(await send(owner, 'POST', '/api/optics', { name: 'Only mine', fNumber: 3 }));
    const ownerList = await json<{ items: OpticBody[] }>(await owner.fetch('/api/optics'));
    expect(ownerList.items.find((o) => o.id === mine.id)?.mine).toBe(true);
    expect(ownerList.items.some((o) => o.isExample)).toBe(true);

    const otherList = await json<{ items: OpticBody[] }>(await other.fetch('/api/optics'));
    expect(otherList.items.some((o) => o.id === mine.id)).toBe(false);
    expect((await other.fetch(`/api/optics/${mine.id}`)).status).toBe(404);
    expect((await anonymous().fetch(`/api/optics/${mine.id}`)).status).toBe(404);
    const visitorList = await json<{ items: OpticBody[] }>(await anonymous().fetch('/api/optics'));
    expect(visitorList.items.some((o) => o.id === mine.id)).toBe(false);
  });

  it('answers 404 for an id that is not a number or does not exist', async () => {
    expect((await anonymous().fetch('/api/optics/not-a-number')).status).toBe(404);
    expect((await owner.fetch('/api/optics/99999999')).status).toBe(404);
  });
});

describe('saving an optic', () => {
  it('needs a sign-in', async () => {
    const before = await count('optics');
    const res = await send(anonymous(), 'POST', '/api/optics', { name: 'x', fNumber: 2 });
    expect(res.status).toBe(401);
    expect(await count('optics')).toBe(before);
  });

  it('derives the f-number and obstruction ratio from the hardware', async () => {
    const res = await send(owner, 'POST', '/api/optics', { name: 'Astrograph 250/450', apertureMm: 250, focalLengthMm: 450, obstructionMm: 80 });
    expect(res.status).toBe(201);
    const o = await json<OpticBody>(res);
    expect(o.fNumber).toBeCloseTo(450 / 250, 9);
    expect(o.obstruction).toBeCloseTo(0.32, 9);
    expect(o.derived).toEqual({ fNumber: true, obstruction: true, fieldAngleDeg: false });
    expect(o.fieldAngleDeg).toBe(0);
    const [row] = await query<{ owner_id: string; f_number: number }>('SELECT owner_id, f_number FROM optics WHERE id = :id', { id: o.id });
    expect(row.owner_id).toBe(ownerId);
    expect(row.f_number).toBeCloseTo(1.8, 9);
  });

  it('lets a reducer multiply the focal length', async () => {
    // A 0.8× reducer on a 100 mm f/6 refractor gives a 480 mm focal length, f/4.8 (common practice).
    const o = await json<OpticBody>(await send(owner, 'POST', '/api/optics', { name: 'Refractor + reducer', apertureMm: 100, focalLengthMm: 600, reducerFactor: 0.8 }));
    expect(o.fNumber).toBeCloseTo(4.8, 9);
    expect(o.reducerFactor).toBe(0.8);
  });

  it('derives the chief-ray angle from the sensor half-diagonal and the exit-pupil distance', async () => {
    // A 43.27 mm diagonal (the 36 × 24 mm format, common practice) 60 mm from the exit pupil.
    const o = await json<OpticBody>(
      await send(owner, 'POST', '/api/optics', { name: 'Lens on full frame', fNumber: 1.8, sensorDiagonalMm: 43.27, exitPupilDistanceMm: 60 }),
    );
    expect(o.derived.fieldAngleDeg).toBe(true);
    // tan φ = (43.27 / 2) / 60 — checked the other way round, from the angle back to the half-diagonal.
    expect(Math.tan((o.fieldAngleDeg * Math.PI) / 180) * 60).toBeCloseTo(43.27 / 2, 6);
    expect(o.fieldAngleDeg).toBeGreaterThan(19.8);
    expect(o.fieldAngleDeg).toBeLessThan(19.9);
  });

  it('keeps numbers typed directly', async () => {
    const o = await json<OpticBody>(await send(owner, 'POST', '/api/optics', { name: 'Typed', fNumber: 1.8, obstruction: 0.25, fieldAngleDeg: 10 }));
    expect([o.fNumber, o.obstruction, o.fieldAngleDeg]).toEqual([1.8, 0.25, 10]);
    expect(o.derived).toEqual({ fNumber: false, obstruction: false, fieldAngleDeg: false });
  });

  it('works with a bearer token, as a lab script would call it', async () => {
    const created = await json<{ token: string }>(await send(owner, 'POST', '/api/tokens', { name: 'optics script' }));
    const res = await fetch(`${process.env.TEST_BASE_URL ?? 'http://127.0.0.1:3100'}/api/optics`, {
      method: 'POST',
      headers: { ...JSON_HEADERS, authorization: `Bearer ${created.token}` },
      body: JSON.stringify({ name: 'Scripted', fNumber: 5 }),
    });
    expect(res.status).toBe(201);
    expect((await json<OpticBody>(res)).mine).toBe(true);
  });

  const refusals: [string, Record<string, unknown>, string, RegExp][] = [
    ['an f-number below 0.5', { name: 'x', fNumber: 0.3 }, 'fNumber', /at least 0\.5/],
    ['an f-number above 40', { name: 'x', fNumber: 41 }, 'fNumber', /at most 40/],
    ['a derived f-number out of range', { name: 'x', apertureMm: 100, focalLengthMm: 10 }, 'fNumber', /f\/0\.10/],
    ['an obstruction ratio above 0.9', { name: 'x', fNumber: 2, obstruction: 0.95 }, 'obstruction', /at most 0\.9/],
    ['an obstruction diameter too large for the aperture', { name: 'x', apertureMm: 100, focalLengthMm: 400, obstructionMm: 95 }, 'obstructionMm', /0\.95/],
    ['an obstruction diameter without an aperture', { name: 'x', fNumber: 2, obstructionMm: 40 }, 'obstructionMm', /aperture/],
    ['a chief-ray angle above 30°', { name: 'x', fNumber: 2, fieldAngleDeg: 31 }, 'fieldAngleDeg', /at most 30/],
    ['a negative chief-ray angle', { name: 'x', fNumber: 2, fieldAngleDeg: -1 }, 'fieldAngleDeg', /at least 0/],
    ['a derived chief-ray angle above 30°', { name: 'x', fNumber: 2, sensorDiagonalMm: 100, exitPupilDistanceMm: 20 }, 'fieldAngleDeg', /between 0 and 30/],
    ['an aperture without a focal length or f-number', { name: 'x', apertureMm: 100 }, 'focalLengthMm', /focal length/],
    ['no f-number at all', { name: 'x' }, 'fNumber', /f-number/],
    ['a missing name', { fNumber: 2 }, 'name', /name/i],
    ['an f-number that contradicts the hardware', { name: 'x', apertureMm: 200, focalLengthMm: 440, fNumber: 3 }, 'fNumber', /disagrees/],
    ['text where a number belongs', { name: 'x', fNumber: 'fast' }, 'fNumber', /number/],
  ];
  for (const [what, body, field, message] of refusals) {
    it(`refuses ${what} with 422 naming the field, and saves nothing`, async () => {
      const before = await count('optics');
      const res = await send(owner, 'POST', '/api/optics', body);
      expect(res.status).toBe(422);
      const err = await json<ErrorBody>(res);
      expect(typeof err.error).toBe('string');
      const detail = err.details.find((d) => d.field === field);
      expect(detail, JSON.stringify(err.details)).toBeDefined();
      expect(detail!.message).toMatch(message);
      expect(await count('optics')).toBe(before);
    });
  }

  it('refuses a body that is not JSON with 400', async () => {
    const res = await owner.fetch('/api/optics', { method: 'POST', headers: JSON_HEADERS, body: '{name:' });
    expect(res.status).toBe(400);
  });
});

describe('changing and deleting', () => {
  let mine: OpticBody;
  let example: OpticBody;
  beforeAll(async () => {
    mine = await json<OpticBody>(await send(owner, 'POST', '/api/optics', { name: 'Newtonian 250/1000', apertureMm: 250, focalLengthMm: 1000, obstructionMm: 70 }));
    const { items } = await json<{ items: OpticBody[] }>(await anonymous().fetch('/api/optics'));
    example = items[0];
  });

  it('recomputes derived numbers when the owner changes the hardware', async () => {
    const res = await send(owner, 'PATCH', `/api/optics/${mine.id}`, { focalLengthMm: 1200, fieldAngleDeg: 4 });
    expect(res.status).toBe(200);
    const o = await json<OpticBody>(res);
    expect(o.fNumber).toBeCloseTo(1200 / 250, 9);
    expect(o.obstruction).toBeCloseTo(70 / 250, 9);
    expect(o.fieldAngleDeg).toBe(4);
    expect(o.name).toBe('Newtonian 250/1000');
  });

  it('switches to a typed f-number when the hardware is cleared with null', async () => {
    const o = await json<OpticBody>(await send(owner, 'PATCH', `/api/optics/${mine.id}`, { apertureMm: null, focalLengthMm: null, obstructionMm: null, fNumber: 3.9, obstruction: 0.3 }));
    expect([o.fNumber, o.obstruction, o.apertureMm, o.focalLengthMm]).toEqual([3.9, 0.3, null, null]);
    expect(o.derived.fNumber).toBe(false);
  });

  it('refuses an invalid change with 422 and leaves the optic as it was', async () => {
    const res = await send(owner, 'PATCH', `/api/optics/${mine.id}`, { obstruction: 0.95 });
    expect(res.status).toBe(422);
    expect((await json<ErrorBody>(res)).details[0].field).toBe('obstruction');
    const [row] = await query<{ obstruction: number }>('SELECT obstruction FROM optics WHERE id = :id', { id: mine.id });
    expect(row.obstruction).toBe(0.3);
    expect((await send(owner, 'PATCH', `/api/optics/${mine.id}`, {})).status).toBe(422);
    expect((await send(owner, 'PATCH', `/api/optics/${mine.id}`, { name: null })).status).toBe(422);
  });

  it('refuses a change from a visitor (401), another user (404, like a missing optic) or on an example (403)', async () => {
    expect((await send(anonymous(), 'PATCH', `/api/optics/${mine.id}`, { name: 'stolen' })).status).toBe(401);
    const res = await send(other, 'PATCH', `/api/optics/${mine.id}`, { name: 'stolen' });
    const missing = await send(other, 'PATCH', '/api/optics/99999998', { name: 'stolen' });
    expect([res.status, missing.status]).toEqual([404, 404]);
    expect((await json<ErrorBody>(res)).error).not.toMatch(/only the person|belongs/i);
    const admin = await signIn('admin@bandcone.test');
    expect((await send(admin, 'PATCH', `/api/optics/${mine.id}`, { name: 'stolen' })).status).toBe(404);
    const onExample = await send(owner, 'PATCH', `/api/optics/${example.id}`, { name: 'mine now' });
    expect(onExample.status).toBe(403);
    expect((await json<ErrorBody>(onExample)).error).toMatch(/read-only/);
    expect((await send(owner, 'PATCH', '/api/optics/99999999', { name: 'x' })).status).toBe(404);
    const [row] = await query<{ name: string }>('SELECT name FROM optics WHERE id = :id', { id: mine.id });
    expect(row.name).toBe('Newtonian 250/1000');
    const [ex] = await query<{ name: string }>('SELECT name FROM optics WHERE id = :id', { id: example.id });
    expect(ex.name).toBe(example.name);
  });

  it('lets only the owner delete, never an example', async () => {
    expect((await send(anonymous(), 'DELETE', `/api/optics/${mine.id}`)).status).toBe(401);
    expect((await send(other, 'DELETE', `/api/optics/${mine.id}`)).status).toBe(404);
    expect((await send(owner, 'DELETE', `/api/optics/${example.id}`)).status).toBe(403);
    expect(await count('optics', `id = ${example.id}`)).toBe(1);
    const res = await send(owner, 'DELETE', `/api/optics/${mine.id}`);
    expect(res.status).toBe(200);
    expect(await json(res)).toEqual({ deleted: true, id: mine.id });
    expect(await count('optics', `id = ${mine.id}`)).toBe(0);
    expect((await owner.fetch(`/api/optics/${mine.id}`)).status).toBe(404);
    expect((await send(owner, 'DELETE', `/api/optics/${mine.id}`)).status).toBe(404);
  });
});
