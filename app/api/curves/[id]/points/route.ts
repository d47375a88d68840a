import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { parseCurveId } from '@/lib/catalogue/detail';
import { loadReadableCurve } from '@/lib/catalogue/points';

type Ctx = { params: Promise<{ id: string }> };

export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const curve = await loadReadableCurve(await currentActor(req), id);
  return NextResponse.json({ wavelengthNm: curve.wavelengthNm, transmission: curve.transmission });
});
