import { describe, expect, it } from 'vitest';
import { publicCatalogueSql, curveMatches, curveReadRule, curveSearchRule, curveSql, curveWhere, searchWithinPublic, visibleOpticsSql, type CurveRule } from '@/lib/auth/policy';
import { CURVES, ME, OTHER, READ, ROLES, SEARCH, statusOf, type RoleName } from '../../support/visibility-table';

// Table-driven over every role (tests/support/visibility-table.ts states the rules row by row).
const rows = CURVES.map((c) => ({ name: c.name, status: c.status, contributorId: c.mine ? ME : OTHER, verifiedAt: c.everVerified ? new Date('2026-01-01') : null }));
const seen = (rule: CurveRule, role: RoleName) => rows.filter((r) => curveMatches(rule, ROLES[role], r)).map((r) => r.name);
const roles = Object.keys(ROLES) as RoleName[];

describe('READ: who reads which curve', () => {
  it.each(roles)('%s', (role) => {
    expect(seen(curveReadRule(ROLES[role]), role)).toEqual(READ[role]);
  });
});

describe('SEARCH: what the catalogue lists', () => {
  const cases = Object.entries(SEARCH).flatMap(([status, byRole]) => roles.map((role) => [status, role, byRole[role]] as const));
  it.each(cases)('status=%s, %s', (status, role, expected) => {
    if (expected === 403) {
      expect(() => curveSearchRule(ROLES[role], statusOf(status))).toThrow(expect.objectContaining({ status: 403 }));
      return;
    }
    expect(seen(curveSearchRule(ROLES[role], statusOf(status)), role)).toEqual(expected);
  });

  it('the two rules differ exactly where they should: a once-verified superseded curve is read, not listed', () => {
    const visitor = ROLES.visitor;
    const once = rows.find((r) => r.name === 'superseded-once-verified')!;
    expect(curveMatches(curveReadRule(visitor), visitor, once)).toBe(true);
    expect(curveMatches(curveSearchRule(visitor), visitor, once)).toBe(false);
  });
});

describe('the public copy answers a search when the rule lists verified curves only', () => {
  it.each([
    ['visitor', undefined, 'yes'],
    ['visitor', 'verified', 'yes'],
    ['visitor', 'any', 'no'],
    ['contributor', undefined, 'unless-own-open'],
    ['contributor', 'verified', 'yes'],
    ['contributor', 'any', 'no'],
    ['contributor', 'submitted', 'no'],
    ['moderator', undefined, 'no'],
    ['moderator', 'verified', 'yes'],
    ['admin', undefined, 'no'],
  ] as const)('%s, status=%s: %s', (role, status, answer) => {
    expect(searchWithinPublic(ROLES[role], status)).toBe(answer);
  });

  it('"unless-own-open" means exactly the curves the contributor search adds to the public ones', () => {
    const c = ROLES.contributor;
    const added = rows.filter((r) => curveMatches(curveSearchRule(c), c, r) && !curveMatches(curveSearchRule(null), null, r)).map((r) => r.status);
    expect(new Set(added)).toEqual(new Set(['submitted', 'changes_requested', 'rejected']));
  });
});

describe('renderings', () => {
  const bind = () => {
    const values: unknown[] = [];
    return { values, fn: (v: unknown, cast = '') => `$${values.push(v)}${cast}` };
  };

  it('SQL binds the reader once and writes statuses only from the known list', () => {
    const b = bind();
    expect(curveSql(curveSearchRule(ROLES.contributor, 'any'), ROLES.contributor, b.fn)).toBe(`(c.status = 'verified') OR (c.contributor_id = $1::uuid)`);
    expect(b.values).toEqual([ME]);
    expect(curveSql(curveReadRule(ROLES.moderator), ROLES.moderator, b.fn)).toBe('true');
    expect(() => curveSql({ any: [{ status: "x' OR true --" as never }] }, null, b.fn)).toThrow();
  });

  it('Sequelize: a moderator reads without a condition, a visitor through one OR', () => {
    expect(curveWhere(curveReadRule(ROLES.moderator), ROLES.moderator)).toEqual({});
    expect(Object.getOwnPropertySymbols(curveWhere(curveReadRule(null), null))).toHaveLength(1);
  });

  it("the public catalogue is a visitor's search", () => {
    expect(publicCatalogueSql()).toBe(`c.status = 'verified'`);
  });

  it('optics: examples for a visitor, examples and their own for a signed-in reader', () => {
    const b = bind();
    expect(visibleOpticsSql(null, b.fn)).toBe('o.is_example');
    expect(visibleOpticsSql(ROLES.contributor, b.fn)).toBe('o.is_example OR o.owner_id = $1::uuid');
  });
});
