import 'server-only';
import { Op, type WhereOptions } from 'sequelize';
import { db } from '@/db/models';
import { forbidden } from '@/lib/http/errors';
import { hasRole, type Actor } from '@/lib/auth/actor';
import type { UsersQuery } from '@/lib/schemas/admin';
import type { Role } from '@/db/models/user';
import { likePattern } from './audit';

export const USERS_PAGE_SIZE = 25;

export type UserRowView = { id: string; name: string; email: string; role: Role; disabled: boolean; confirmed: boolean; createdAt: string };
export type UsersView = { rows: UserRowView[]; total: number; page: number; pages: number; pageSize: number; selfId: string };

/** Users by part of their name or e-mail, a role and a state, oldest first, a page at a time. */
export async function getUsers(viewer: Pick<Actor, 'id' | 'role'>, query: UsersQuery): Promise<UsersView> {
  if (!hasRole(viewer, 'admin')) throw forbidden('Only admins list users.');
  const { User } = db();
  const and: WhereOptions[] = [];
  if (query.q) {
    const like = likePattern(query.q);
    and.push({ [Op.or]: [{ email: { [Op.iLike]: like } }, { name: { [Op.iLike]: like } }] });
  }
  if (query.role) and.push({ role: query.role });
  if (query.access) and.push({ disabledAt: query.access === 'disabled' ? { [Op.ne]: null } : null });
  const { rows, count } = await User.findAndCountAll({
    where: and.length ? { [Op.and]: and } : {},
    order: [['createdAt', 'ASC'], ['id', 'ASC']],
    limit: USERS_PAGE_SIZE,
    offset: (query.page - 1) * USERS_PAGE_SIZE,
    attributes: ['id', 'name', 'email', 'role', 'disabledAt', 'emailVerified', 'createdAt'],
  });
  return {
    rows: rows.map((u) => ({
      id: u.id, name: u.name ?? '', email: u.email, role: u.role, disabled: !!u.disabledAt, confirmed: !!u.emailVerified, createdAt: u.createdAt.toISOString(),
    })),
    total: count,
    page: query.page,
    pages: Math.max(1, Math.ceil(count / USERS_PAGE_SIZE)),
    pageSize: USERS_PAGE_SIZE,
    selfId: viewer.id,
  };
}
