import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { getSubmission } from '@/moderation/views';
import { parseId } from '@/lib/http/ids';

export const GET = withErrors(async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const actor = await requireRole('contributor', req);
  const id = parseId((await ctx.params).id);
  return NextResponse.json(await getSubmission(actor, id));
});
