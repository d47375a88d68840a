import 'server-only';
import { Op, type WhereOptions } from 'sequelize';
import { db } from '@/db/models';
import { conflict, forbidden, notFound } from '@/lib/http/errors';
import { audit } from '@/lib/audit';
import { revokeAllSessions } from '@/lib/auth/sessions';
import { hasRole, type Actor } from '@/lib/auth/actor';
import type { UsersQuery } from '@/lib/schemas/admin';
import type { RoleChange } from '@/lib/schemas/account';
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

/** What PATCH /api/admin/users/:id answers. */
export type UserAccessAnswer = { id: string; email: string; role: Role; disabled: boolean };

/** A new role or a changed access, audited, in one transaction; never on the admin's own account. */
export async function changeUser(viewer: Pick<Actor, 'id' | 'role'>, id: string, change: RoleChange): Promise<UserAccessAnswer> {
  if (!hasRole(viewer, 'admin')) throw forbidden('Only admins change roles and access.');
  if (id === viewer.id && (change.disabled || (change.role && change.role !== 'admin'))) {
    throw conflict('You cannot demote or disable your own account; ask another admin.');
  }
  const { User, sequelize } = db();
  const user = await sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction, lock: true });
    if (!user) throw notFound('No such user.');
    const before = { role: user.role, disabled: !!user.disabledAt };
    await user.update(
      {
        ...(change.role ? { role: change.role } : {}),
        ...(change.disabled === undefined ? {} : { disabledAt: change.disabled ? new Date() : null }),
      },
      { transaction },
    );
    const roleChanged = !!change.role && change.role !== before.role;
    // A new role or a disabled account starts from a fresh sign-in on every device.
    const sessionsEnded = roleChanged || (!!user.disabledAt && !before.disabled) ? await revokeAllSessions(id, roleChanged ? 'role changed' : 'account disabled', transaction) : 0;
    await audit(viewer.id, roleChanged ? 'user.role_changed' : 'user.access_changed', { type: 'user', id }, {
      email: user.email, before, after: { role: user.role, disabled: !!user.disabledAt }, sessionsEnded,
    }, transaction);
    return user;
  });
  return { id: user.id, email: user.email, role: user.role, disabled: !!user.disabledAt };
}
