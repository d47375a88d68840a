import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { parseCurveId } from '@/lib/catalogue/detail';
import { loadReadableSamples } from '@/lib/catalogue/points';

type Ctx = { params: Promise<{ id: string }> };

export const GET = withErrors(async (req: Request, ctx: Ctx) => {
  const id = parseCurveId((await ctx.params).id);
  const { points } = await loadReadableSamples(await currentActor(req), id);
  return NextResponse.json({ wavelengthNm: points.wavelengthNm, transmission: points.transmission });
});
