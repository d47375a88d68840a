import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { parseOddsQuery } from '@/lib/schemas/odds';
import { labelOdds } from '@/lib/catalogue/odds';

// Public: it reads only verified curves.
export const GET = withErrors(async (req: Request) => {
  const q = parseOddsQuery(new URL(req.url).searchParams);
  return NextResponse.json(await labelOdds(q), { headers: { 'cache-control': 'no-store' } });
});
