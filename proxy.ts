import { NextResponse, type NextRequest } from 'next/server';

/**
 * A path whose percent-encoding is not valid UTF-8 (e.g. /api/curves/%E0%A4%A) makes Next
 * fail while decoding route params, answering a bare 500. It is the client's mistake:
 * answer 400 with a reason before routing. Paths without a '%' skip the check.
 */
export function proxy(req: NextRequest) {
  const raw = req.nextUrl.pathname;
  if (raw.includes('%')) {
    try {
      decodeURIComponent(raw);
    } catch {
      return NextResponse.json({ error: 'The address holds broken percent-encoding; encode it as UTF-8.', details: [] }, { status: 400 });
    }
  }
  return NextResponse.next();
}
