import { NextResponse } from 'next/server';
import { withErrors, readJson, notFound, conflict } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { roleChangeSchema } from '@/lib/schemas/account';
import { db } from '@/db/models';
import { audit } from '@/lib/audit';
import { revokeAllSessions } from '@/lib/auth/sessions';
import { parseUuid } from '@/lib/http/ids';

export const PATCH = withErrors(async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const admin = await requireRole('admin', req);
  const id = parseUuid((await ctx.params).id, 'user');
  const change = roleChangeSchema.parse(await readJson(req));
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
  return NextResponse.json({ id: user.id, email: user.email, role: user.role, disabled: !!user.disabledAt });
});
