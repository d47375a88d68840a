import { NextResponse } from 'next/server';
import { openApiDocument } from '@/lib/openapi/document';

// Generated from the registry at build time; the same for everyone.
export const dynamic = 'force-static';

export function GET() {
  return NextResponse.json(openApiDocument(), { headers: { 'cache-control': 'public, max-age=3600' } });
}
