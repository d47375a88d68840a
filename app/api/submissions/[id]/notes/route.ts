import { NextResponse } from 'next/server';
import { withErrors, readJson } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { threadReplySchema } from '@/lib/schemas/submission';
import { addNote } from '@/moderation/decisions';
import { parseId } from '@/lib/http/ids';

export const POST = withErrors(async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const actor = await requireRole('contributor', req);
  const id = parseId((await ctx.params).id);
  const { body } = threadReplySchema.parse(await readJson(req));
  return NextResponse.json(await addNote(actor, id, body), { status: 201 });
});
