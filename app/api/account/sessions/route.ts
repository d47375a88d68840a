import { NextResponse } from 'next/server';
import { withErrors } from '@/lib/http/errors';
import { requireRole } from '@/lib/auth/actor';
import { signOutEverywhere, type SignOutEverywhereAnswer } from '@/lib/account/flows';

/** "Sign out everywhere": ends every session of the caller, this one included. */
export const DELETE = withErrors(async (req: Request) => {
  const actor = await requireRole('contributor', req);
  const sessionsEnded = await signOutEverywhere(actor.id);
  return NextResponse.json<SignOutEverywhereAnswer>({ sessionsEnded });
});
