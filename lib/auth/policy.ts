/**
 * Who may see what: every visibility rule of the product, written once.
 *
 * Curves have two rules that rightly differ:
 * - READ (a curve's page, its points and downloads, the model run on a stored
 *   curve, compare and study): everyone reads verified curves, and superseded
 *   ones that were once verified, so a citation of an older revision keeps
 *   working (a replaced, never-verified revision is not public); a contributor
 *   also reads their own, whatever their state; moderators read all.
 * - SEARCH (the catalogue, its facets and exports): the current library.
 *   Visitors see verified curves only and may not ask for another status; a
 *   contributor sees verified curves and their own that are not superseded
 *   (status= narrows to their own, or `any` adds their superseded ones);
 *   moderators see everything but superseded revisions, or the one status asked
 *   for (`any` for all).
 * Optics: the public examples, and a signed-in reader's own.
 *
 * Each rule is a list of alternatives (OR) of conditions (AND), rendered as a
 * Sequelize `where`, an SQL fragment and a predicate from the same list, so the
 * three can never disagree (tests/integration/policy.test.ts checks them
 * against the database for every role).
 */

import { Op, type WhereOptions } from 'sequelize';
import { hasRole, type Actor } from './actor';
import { forbidden } from '@/lib/http/errors';
import { CURVE_STATUSES, type CurveStatus } from '@/db/models/curve';

/** One alternative: every condition it names holds. */
export interface Clause {
  status?: CurveStatus;
  notStatus?: CurveStatus;
  /** The reader contributed the curve. */
  own?: true;
  /** A moderator verified this curve at some time (verified_at is set). */
  everVerified?: true;
}

/** Every curve, or the curves matching any one clause (none: no curve). */
export type CurveRule = { all: true } | { any: Clause[] };

/** The columns a rule reads, as a row holds them. */
export interface CurveRow {
  status: string;
  contributorId: string;
  verifiedAt: Date | string | null;
}

const ALL: CurveRule = { all: true };
const PUBLIC_SEARCH: Clause = { status: 'verified' };

/** READ: what a curve's page, points and downloads may show this reader. */
export function curveReadRule(actor: Actor | null): CurveRule {
  if (hasRole(actor, 'moderator')) return ALL;
  const pub: Clause[] = [{ status: 'verified' }, { status: 'superseded', everVerified: true }];
  return { any: actor ? [...pub, { own: true }] : pub };
}

/** The status filters a search may ask for, besides a curve status. */
export type StatusFilter = CurveStatus | 'any';

/** SEARCH: what the catalogue lists for this reader and status filter; a 403 for a visitor asking for another status than verified. */
export function curveSearchRule(actor: Actor | null, status?: StatusFilter): CurveRule {
  if (hasRole(actor, 'moderator')) {
    if (!status) return { any: [{ notStatus: 'superseded' }] };
    return status === 'any' ? ALL : { any: [{ status }] };
  }
  if (!actor) {
    if (status && status !== 'verified') throw forbidden('Only moderators filter by status; the public catalogue holds verified curves.');
    return { any: [PUBLIC_SEARCH] };
  }
  if (!status) return { any: [PUBLIC_SEARCH, { own: true, notStatus: 'superseded' }] };
  if (status === 'verified') return { any: [PUBLIC_SEARCH] };
  if (status === 'any') return { any: [PUBLIC_SEARCH, { own: true }] };
  return { any: [{ status, own: true }] };
}

/**
 * Whether the public copy of the catalogue (verified curves only) can answer
 * this reader's search: 'yes'; 'no'; or 'unless-own-open' when the search adds
 * the reader's own curves that are neither verified nor superseded, so it can
 * unless they have any.
 */
export function searchWithinPublic(actor: Actor | null, status?: StatusFilter): 'yes' | 'no' | 'unless-own-open' {
  let rule: CurveRule;
  try {
    rule = curveSearchRule(actor, status);
  } catch {
    return 'no'; // the SQL search gives the refusal
  }
  if ('all' in rule) return 'no';
  const isPublic = (c: Clause) => sameClause(c, PUBLIC_SEARCH);
  if (rule.any.every(isPublic)) return 'yes';
  if (rule.any.every((c) => isPublic(c) || sameClause(c, { own: true, notStatus: 'superseded' }))) return 'unless-own-open';
  return 'no';
}

function sameClause(a: Clause, b: Clause): boolean {
  const keys = new Set([...Object.keys(a), ...Object.keys(b)]) as Set<keyof Clause>;
  return [...keys].every((k) => a[k] === b[k]);
}

function checkedStatus(s: string): string {
  if (!(CURVE_STATUSES as readonly string[]).includes(s)) throw new Error(`Unknown curve status ${JSON.stringify(s)}`);
  return `'${s}'`;
}

/** The rule as a Sequelize `where` on the Curve model. */
export function curveWhere(rule: CurveRule, actor: Actor | null): WhereOptions {
  if ('all' in rule) return {};
  const alternatives = rule.any.map((c) => {
    const w: Record<string, unknown> = {};
    if (c.status) w.status = c.status;
    if (c.notStatus) w.status = { [Op.ne]: c.notStatus };
    if (c.own) w.contributorId = ownerOf(actor);
    if (c.everVerified) w.verifiedAt = { [Op.ne]: null };
    return w;
  });
  if (alternatives.length === 0) return { id: null };
  return alternatives.length === 1 ? alternatives[0] : { [Op.or]: alternatives };
}

/**
 * The rule as an SQL condition on the curves table under `alias`; `bind` adds
 * a bind parameter and returns its placeholder (SqlParts.param, or a list's push).
 */
export function curveSql(rule: CurveRule, actor: Actor | null, bind: (value: unknown, cast?: string) => string, alias = 'c'): string {
  if ('all' in rule) return 'true';
  if (rule.any.length === 0) return 'false';
  let me: string | undefined;
  const parts = rule.any.map((c) => {
    const conds: string[] = [];
    if (c.status) conds.push(`${alias}.status = ${checkedStatus(c.status)}`);
    if (c.notStatus) conds.push(`${alias}.status <> ${checkedStatus(c.notStatus)}`);
    if (c.own) conds.push(`${alias}.contributor_id = ${(me ??= bind(ownerOf(actor), '::uuid'))}`);
    if (c.everVerified) conds.push(`${alias}.verified_at IS NOT NULL`);
    return conds.length === 0 ? 'true' : conds.join(' AND ');
  });
  return parts.length === 1 ? parts[0] : parts.map((p) => `(${p})`).join(' OR ');
}

/** The rule as a predicate on a row already read. */
export function curveMatches(rule: CurveRule, actor: Actor | null, row: CurveRow): boolean {
  if ('all' in rule) return true;
  return rule.any.some(
    (c) =>
      (!c.status || row.status === c.status) &&
      (!c.notStatus || row.status !== c.notStatus) &&
      (!c.own || (!!actor && row.contributorId === actor.id)) &&
      (!c.everVerified || row.verifiedAt !== null),
  );
}

function ownerOf(actor: Actor | null): string {
  if (!actor) throw new Error('A rule about own curves needs a reader');
  return actor.id;
}

/** READ as a Sequelize `where` (curve pages, points, compare, study). */
export function readableCurvesWhere(actor: Actor | null): WhereOptions {
  return curveWhere(curveReadRule(actor), actor);
}

/** READ as an SQL condition on `curves` under `alias` (the lean reads of a curve's samples). */
export function readableCurvesSql(actor: Actor | null, bind: (value: unknown, cast?: string) => string, alias = 'c'): string {
  return curveSql(curveReadRule(actor), actor, bind, alias);
}

/** SEARCH as an SQL condition on `curves c` (the catalogue). */
export function searchableCurvesSql(actor: Actor | null, status: StatusFilter | undefined, bind: (value: unknown, cast?: string) => string): string {
  return curveSql(curveSearchRule(actor, status), actor, bind);
}

/** What a visitor's search lists (the public catalogue, which the in-process copy holds), as an SQL condition on `curves` under `alias`. */
export function publicCatalogueSql(alias = 'c'): string {
  return curveSql(curveSearchRule(null), null, () => {
    throw new Error('the public catalogue binds no reader');
  }, alias);
}

/** Optics: the public examples, and a signed-in reader's own, as a Sequelize `where` on Optic. */
export function visibleOpticsWhere(actor: Actor | null): WhereOptions {
  return actor ? { [Op.or]: [{ isExample: true }, { ownerId: actor.id }] } : { isExample: true };
}

/** The same for optics as an SQL condition under `alias`. */
export function visibleOpticsSql(actor: Actor | null, bind: (value: unknown, cast?: string) => string, alias = 'o'): string {
  return actor ? `${alias}.is_example OR ${alias}.owner_id = ${bind(actor.id, '::uuid')}` : `${alias}.is_example`;
}
