import { NextResponse } from 'next/server';
import { withErrors, readJson } from '@/lib/http/errors';
import { currentActor, requireRole } from '@/lib/auth/actor';
import { deleteOptic, findVisibleOptic, updateOptic, type DeletedOptic } from '@/lib/optics/store';
import { parseId } from '@/lib/http/ids';

type Ctx = { params: Promise<{ id: string }> };

// Public like the list: an example optic is readable by anyone, a private one by its owner.
export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const actor = await currentActor(req);
  return NextResponse.json(await findVisibleOptic(actor, parseId((await ctx.params).id)));
});

export const PATCH = withErrors(async (req: Request, ctx: Ctx) => {
  const actor = await requireRole('contributor', req);
  const id = parseId((await ctx.params).id);
  return NextResponse.json(await updateOptic(actor, id, await readJson(req)));
});

export const DELETE = withErrors(async (req: Request, ctx: Ctx) => {
  const actor = await requireRole('contributor', req);
  const id = parseId((await ctx.params).id);
  await deleteOptic(actor, id);
  return NextResponse.json<DeletedOptic>({ deleted: true, id });
});
