import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { getSequelize, closeSequelize } from '@/db/connection';
import { angleScale, angleScaleSql } from '@/lib/engine/angles';

// The search's SQL form of s(θ) = sqrt(1 − sin²θ / n²) (docs/model.md §Angle shift) against the
// engine's, evaluated by PostgreSQL's own sin and radians.
afterAll(() => closeSequelize());

describe('the angle scale in SQL', () => {
  it.each([1, 1.7, 2.05, 4])('agrees with the engine at n_eff %s', async (n) => {
    const angles = [0, 4, 12.5, 30, 60, 80];
    const rows = await getSequelize().query<{ s: number }>(`SELECT ${angleScaleSql('a', n)} AS s FROM unnest($1::float8[]) WITH ORDINALITY AS t(a, i) ORDER BY i`, {
      bind: [angles],
      type: QueryTypes.SELECT,
    });
    rows.forEach((r, i) => expect(r.s).toBeCloseTo(angleScale(angles[i], n), 12));
  });
});
