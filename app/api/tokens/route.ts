import { NextResponse } from 'next/server';
import { withErrors, readJson, forbidden } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { createTokenSchema } from '@/lib/schemas/tokens';
import { createApiToken, listApiTokens } from '@/lib/account/api-tokens';

export const POST = withErrors(async (req: Request) => {
  const actor = await requireRole('contributor', req);
  // A token cannot mint further tokens: a leaked bench script must not be able to entrench itself.
  if (actor.via === 'token') throw forbidden('Create tokens from a signed-in browser session, not with another token.');
  const { name } = createTokenSchema.parse(await readJson(req));
  return NextResponse.json(await createApiToken(actor.id, name), { status: 201 });
});

export const GET = withErrors(async (req: Request) => {
  const actor = await requireRole('contributor', req);
  return NextResponse.json({ items: await listApiTokens(actor.id) });
});
