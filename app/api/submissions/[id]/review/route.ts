import { NextResponse } from 'next/server';
import { withErrors, readJson } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { reviewDecisionSchema } from '@/lib/schemas/submission';
import { decide } from '@/moderation/decisions';
import { parseId } from '@/lib/http/ids';

export const POST = withErrors(async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const moderator = await requireRole('moderator', req);
  const id = parseId((await ctx.params).id);
  const { decision, note } = reviewDecisionSchema.parse(await readJson(req));
  return NextResponse.json(await decide(moderator, id, decision, note));
});
