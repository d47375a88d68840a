import { Op } from 'sequelize';
import { db } from '@/db/models';
import { hasRole, type Actor } from '@/lib/auth/actor';
import { notFound } from '@/lib/http/errors';

/** Visitors read verified (and superseded, still citable) curves; contributors also their own; moderators all. */
export function visibilityWhere(actor: Actor | null): Record<string | symbol, unknown> {
  if (hasRole(actor, 'moderator')) return {};
  const publicStatuses = { status: ['verified', 'superseded'] };
  if (!actor) return publicStatuses;
  return { [Op.or]: [publicStatuses, { contributorId: actor.id }] };
}

export async function loadVisibleCurve(actor: Actor | null, id: number, withPoints = true) {
  const { Curve } = db();
  const model = withPoints ? Curve.scope('withPoints') : Curve;
  const curve = await model.findOne({ where: { id, ...visibilityWhere(actor) } });
  if (!curve) throw notFound(`No curve ${id} that you can read.`);
  return curve;
}
