import { afterAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import { closeSequelize, getSequelize } from '@/db/connection';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { loadReadableCurve, readableWhere } from '@/lib/catalogue/points';
import { getStudyCurves } from '@/lib/study/load';
import { getCompareBoard } from '@/lib/catalogue/compare-board';
import { query } from '../support/db';

afterAll(() => closeSequelize());

/** The study's former loader, one curve at a time (two queries a curve): the batched one must answer exactly the same. */
async function studyCurvesOneByOne(actor: Actor | null, ids: number[]) {
  const found: { id: number; set: { curveId: number; aoiDeg: number; cwlNm: number }[] | null }[] = [];
  const missing: number[] = [];
  for (const id of ids) {
    let c;
    try {
      c = await loadReadableCurve(actor, id);
    } catch {
      missing.push(id);
      continue;
    }
    let set = null;
    if (c.setKey) {
      const members = await db().Curve.findAll({
        where: { [Op.and]: [{ setKey: c.setKey }, { cwlNm: { [Op.ne]: null } }, readableWhere(actor)] },
        attributes: ['id', 'aoiDeg', 'cwlNm'],
        order: [['aoiDeg', 'ASC'], ['id', 'ASC']],
      });
      if (members.length >= 2) set = members.map((m) => ({ curveId: m.id, aoiDeg: m.aoiDeg, cwlNm: m.cwlNm as number }));
    }
    found.push({ id: c.id, set });
  }
  return { found, missing };
}

async function countingQueries<T>(fn: () => Promise<T>): Promise<{ result: T; queries: number }> {
  let queries = 0;
  const hook = () => {
    queries++;
  };
  getSequelize().addHook('beforeQuery', 'count', hook);
  try {
    return { result: await fn(), queries };
  } finally {
    getSequelize().removeHook('beforeQuery', 'count');
  }
}

describe('page views read in a fixed number of queries and answer what the one-by-one reads answered', async () => {
  const [setA, setB] = await query<{ id: number }>(
    `SELECT id FROM curves WHERE set_key = (SELECT set_key FROM curves WHERE set_key IS NOT NULL AND status = 'verified' AND cwl_nm IS NOT NULL GROUP BY set_key HAVING count(*) >= 2 LIMIT 1) ORDER BY id LIMIT 2`,
  );
  const [single] = await query<{ id: number }>(`SELECT id FROM curves WHERE set_key IS NULL AND status = 'verified' ORDER BY id LIMIT 1`);
  const [hidden] = await query<{ id: number; contributor_id: string }>(`SELECT id, contributor_id FROM curves WHERE status IN ('submitted', 'rejected', 'changes_requested') ORDER BY id LIMIT 1`);
  const owner = { id: hidden.contributor_id, email: 'owner@bandcone.test', name: null, role: 'contributor', via: 'session' } as Actor;
  // order matters (the page keeps it); a hidden curve and one that does not exist are in the address too
  const ids = [single.id, setB.id, hidden.id, 999_999, setA.id];

  it.each([
    ['a visitor', null],
    ['the hidden curve\'s contributor', owner],
  ])('the study, for %s', async (_who, actor) => {
    const expected = await studyCurvesOneByOne(actor, ids);
    const { result, queries } = await countingQueries(() => getStudyCurves(actor, ids));
    expect(result.missing).toEqual(expected.missing);
    expect(result.curves.map((c) => ({ id: c.id, set: c.set }))).toEqual(expected.found);
    expect(result.curves.find((c) => c.id === setA.id)?.set?.length).toBeGreaterThanOrEqual(2);
    expect(result.missing.includes(hidden.id)).toBe(actor === null);
    // one query for the curves, one for the units of their sets
    expect(queries).toBe(2);
  });

  it('the compare board keeps the address\'s order and reports what the reader may not see', async () => {
    const { result, queries } = await countingQueries(() => getCompareBoard(null, ids));
    expect(result.curves.map((c) => c.id)).toEqual([single.id, setB.id, setA.id]);
    expect(result.missing).toEqual([hidden.id, 999_999]);
    expect(result.curves.every((c) => c.points.wavelengthNm.length === c.points.transmission.length && c.points.wavelengthNm.length > 1)).toBe(true);
    // the curves, then the optic choices (examples, and the reader's own when signed in)
    expect(queries).toBeLessThanOrEqual(3);
  });
});
