import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { db } from '@/db/models';
import { closeSequelize } from '@/db/connection';
import { curveReadRule, curveSearchRule, curveSql, curveWhere, visibleOpticsSql, visibleOpticsWhere, type CurveRule } from '@/lib/auth/policy';
import type { Actor } from '@/lib/auth/actor';
import { CURVES, ME, OTHER, READ, ROLES, SEARCH, statusOf, type RoleName } from '../support/visibility-table';

// The visibility policy in PostgreSQL: for every role, its Sequelize `where` and its SQL
// fragment pick exactly the curves tests/support/visibility-table.ts says. The fixture
// rows live in one transaction that is rolled back, so no other test ever sees them.
afterAll(() => closeSequelize());

const PREFIX = `policy-${Date.now().toString(36)}-`;
let t: Transaction;

beforeAll(async () => {
  const { sequelize, User } = db();
  t = await sequelize.transaction();
  for (const id of [ME, OTHER]) {
    await User.findOrCreate({ where: { id }, defaults: { id, email: `${id.slice(-4)}-policy@bandcone.test`, name: 'Policy fixture', role: 'contributor' }, transaction: t });
  }
  for (const c of CURVES) {
    await sequelize.query(
      `INSERT INTO curves (contributor_id, status, label, method, instrument, wavelength_nm, transmission, point_count, points_hash, peak_t, verified_at)
       VALUES ($1::uuid, $2, $3, '{}'::jsonb, 'other', '{650,652,654,656,658}', '{0.1,0.5,0.9,0.5,0.1}', 5, $3, 0.9, $4)`,
      { bind: [c.mine ? ME : OTHER, c.status, PREFIX + c.name, c.everVerified ? new Date('2026-01-01') : null], transaction: t },
    );
  }
});

afterAll(async () => {
  await t?.rollback();
});

const names = (labels: string[]) => labels.map((l) => l.slice(PREFIX.length)).sort();

async function bySequelize(rule: CurveRule, actor: Actor | null): Promise<string[]> {
  const rows = await db().Curve.findAll({ where: { [Op.and]: [curveWhere(rule, actor), { label: { [Op.startsWith]: PREFIX } }] }, attributes: ['label'], transaction: t });
  return names(rows.map((r) => r.label));
}

async function bySql(rule: CurveRule, actor: Actor | null): Promise<string[]> {
  const bind: unknown[] = [PREFIX + '%'];
  const cond = curveSql(rule, actor, (v, cast = '') => `$${bind.push(v)}${cast}`);
  const rows = await db().sequelize.query<{ label: string }>(`SELECT c.label FROM curves c WHERE c.label LIKE $1 AND (${cond})`, { bind, type: QueryTypes.SELECT, transaction: t });
  return names(rows.map((r) => r.label));
}

const roles = Object.keys(ROLES) as RoleName[];

describe('READ in the database, every role', () => {
  it.each(roles)('%s', async (role) => {
    const rule = curveReadRule(ROLES[role]);
    const expected = [...READ[role]].sort();
    expect(await bySequelize(rule, ROLES[role])).toEqual(expected);
    expect(await bySql(rule, ROLES[role])).toEqual(expected);
  });
});

describe('SEARCH in the database, every role and status filter', () => {
  const cases = Object.entries(SEARCH).flatMap(([status, byRole]) => roles.filter((r) => byRole[r] !== 403).map((role) => [status, role, byRole[role] as string[]] as const));
  it.each(cases)('status=%s, %s', async (status, role, expected) => {
    const rule = curveSearchRule(ROLES[role], statusOf(status));
    expect(await bySequelize(rule, ROLES[role])).toEqual([...expected].sort());
    expect(await bySql(rule, ROLES[role])).toEqual([...expected].sort());
  });
});

describe('optics in the database', () => {
  it('the where and the SQL pick the same optics for a visitor and for an owner', async () => {
    const { Optic, sequelize } = db();
    const owned = await Optic.findOne({ where: { isExample: false }, transaction: t });
    for (const actor of [null, owned ? { ...ROLES.contributor!, id: owned.ownerId! } : ROLES.contributor]) {
      const viaWhere = (await Optic.findAll({ where: visibleOpticsWhere(actor), attributes: ['id'], transaction: t })).map((o) => o.id).sort((a, b) => a - b);
      const bind: unknown[] = [];
      const cond = visibleOpticsSql(actor, (v, cast = '') => `$${bind.push(v)}${cast}`);
      const viaSql = (await sequelize.query<{ id: number }>(`SELECT o.id FROM optics o WHERE ${cond} ORDER BY o.id`, { bind, type: QueryTypes.SELECT, transaction: t })).map((r) => r.id);
      expect(viaSql).toEqual(viaWhere);
      expect(viaWhere.length).toBeGreaterThan(0);
    }
  });
});
