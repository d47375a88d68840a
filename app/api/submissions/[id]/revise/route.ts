import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { readSubmission } from '@/moderation/multipart';
import { reviseSubmission } from '@/moderation/submissions';
import { parseId } from '@/lib/http/ids';

export const POST = withErrors(async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const actor = await requireRole('contributor', req);
  const id = parseId((await ctx.params).id);
  const { metadata, files } = await readSubmission(req, actor.id);
  return NextResponse.json(await reviseSubmission(actor, id, metadata, files));
});
