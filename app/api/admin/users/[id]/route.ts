import { NextResponse } from 'next/server';
import { withErrors, readJson } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { roleChangeSchema } from '@/lib/schemas/account';
import { changeUser } from '@/lib/admin/users';
import { parseUuid } from '@/lib/http/ids';

export const PATCH = withErrors(async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const admin = await requireRole('admin', req);
  const id = parseUuid((await ctx.params).id, 'user');
  const change = roleChangeSchema.parse(await readJson(req));
  return NextResponse.json(await changeUser(admin, id, change));
});
