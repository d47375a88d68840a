import NextAuth from 'next-auth';
import { authOptions } from '@/lib/auth/options';
import { guardLinkRequest, isLinkRequest } from '@/lib/auth/link-sign-in';

async function handler(req: Request, ctx: { params: Promise<{ nextauth: string[] }> }) {
  if (isLinkRequest(req)) {
    const refusal = await guardLinkRequest(req);
    if (refusal) return refusal;
  }
  return NextAuth(req as never, ctx as never, authOptions());
}

export { handler as GET, handler as POST };
