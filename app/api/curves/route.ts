import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { currentActor } from '@/lib/auth/actor';
import { parseSearchParams } from '@/lib/catalogue/search-params';
import { searchCurves } from '@/lib/catalogue/search';

// Public: visitors get verified curves; the actor decides what else is visible.
export const GET = withErrors(async (req: Request) => {
  const params = parseSearchParams(new URL(req.url).searchParams);
  const result = await searchCurves(await currentActor(req), params);
  return NextResponse.json(result, { headers: { 'cache-control': 'no-store' } });
});
