import { NextResponse } from 'next/server';
import { LINES, EXTRA_LINES } from '@/lib/engine/lines';

// The catalogue never changes at run time: computed once, cached by browsers for a day.
export const dynamic = 'force-static';

export function GET() {
  const items = [...LINES, ...EXTRA_LINES].map((l) => ({ id: l.id, name: l.name, airNm: l.airNm, vacuumNm: Number(l.vacuumNm.toFixed(4)) }));
  return NextResponse.json(items, { headers: { 'cache-control': 'public, max-age=86400' } });
}
