import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { revokeApiToken, type RevokedApiToken } from '@/lib/account/api-tokens';
import { parseId } from '@/lib/http/ids';

export const DELETE = withErrors(async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const actor = await requireRole('contributor', req);
  await revokeApiToken(actor.id, parseId((await ctx.params).id));
  return NextResponse.json<RevokedApiToken>({ revoked: true });
});
