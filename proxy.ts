import { NextResponse, type NextRequest } from 'next/server';
import { pageCsp } from '@/lib/http/security-headers';

// Every page gets a fresh nonce: Next reads it from the request's Content-Security-Policy and
// stamps it on its scripts; the root layout reads `x-nonce` for its own inline script.
// API routes are left out so their bodies stream straight to the handler (a proxy would
// buffer them) and get their fixed headers from next.config.ts.
export function proxy(request: NextRequest) {
  const nonce = Buffer.from(crypto.randomUUID()).toString('base64');
  const csp = pageCsp(nonce);
  const headers = new Headers(request.headers);
  headers.set('x-nonce', nonce);
  headers.set('content-security-policy', csp);
  const response = NextResponse.next({ request: { headers } });
  response.headers.set('Content-Security-Policy', csp);
  return response;
}

export const config = {
  matcher: [{ source: '/((?!api/|_next/static|_next/image|favicon.ico).*)' }],
};
