import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { getCurveDetail, parseCurveId } from '@/lib/catalogue/detail';
import { publicOrigin } from '@/lib/http/site';

type Ctx = { params: Promise<{ id: string }> };

// Public for verified curves; the actor decides whether an unverified one is readable.
export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const detail = await getCurveDetail(await currentActor(req), id, publicOrigin(new URL(req.url).origin));
  return NextResponse.json(detail);
});
