import { Op } from 'sequelize';
import { db } from '@/db/models';
import { hasRole, type Actor } from '@/lib/auth/actor';
import { notFound } from '@/lib/http/errors';

/**
 * Who reads which curves. The public reads verified curves, and superseded ones
 * only if they were once verified (a replaced, never-verified revision is not
 * public); contributors also read their own; moderators read all.
 */
export function readableWhere(actor: Actor | null): Record<string | symbol, unknown> {
  if (hasRole(actor, 'moderator')) return {};
  const publicRows = { [Op.or]: [{ status: 'verified' }, { status: 'superseded', verifiedAt: { [Op.ne]: null } }] };
  if (!actor) return publicRows;
  return { [Op.or]: [publicRows, { contributorId: actor.id }] };
}

export async function loadReadableCurve(actor: Actor | null, id: number, withPoints = true) {
  const { Curve } = db();
  const model = withPoints ? Curve.scope('withPoints') : Curve;
  const curve = await model.findOne({ where: { id, ...readableWhere(actor) } });
  if (!curve) throw notFound(`No curve ${id} that you can read.`);
  return curve;
}
