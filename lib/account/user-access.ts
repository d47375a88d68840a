import 'server-only';
import { db } from '@/db/models';
import { audit } from '@/lib/audit';
import { revokeAllSessions } from '@/lib/auth/sessions';
import { conflict, notFound } from '@/lib/http/errors';
import type { Actor } from '@/lib/auth/actor';
import type { RoleChange } from '@/lib/schemas/account';

/** What PATCH /api/admin/users/:id answers. */
export type UserAccessAnswer = { id: string; email: string; role: string; disabled: boolean };

/** An admin changes a user's role or disables the account; the row lock keeps two admins from interleaving. */
export async function changeUserAccess(admin: Pick<Actor, 'id'>, id: string, change: RoleChange): Promise<UserAccessAnswer> {
  const { User, sequelize } = db();
  if (id === admin.id && (change.disabled || (change.role && change.role !== 'admin'))) {
    throw conflict('You cannot demote or disable your own account; ask another admin.');
  }
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
    await audit(admin.id, roleChanged ? 'user.role_changed' : 'user.access_changed', { type: 'user', id }, {
      email: user.email, before, after: { role: user.role, disabled: !!user.disabledAt }, sessionsEnded,
    }, transaction);
    return user;
  });
  return { id: user.id, email: user.email, role: user.role, disabled: !!user.disabledAt };
}
