import { NextResponse } from 'next/server';
import { withErrors, readJson } from '@/lib/http/errors';
import { resetConfirmSchema } from '@/lib/schemas/account';
import { resetPassword, type PasswordResetAnswer } from '@/lib/account/flows';

export const POST = withErrors(async (req: Request) => {
  const { token, password, revokeTokens } = resetConfirmSchema.parse(await readJson(req));
  const { sessionsEnded, tokensRevoked } = await resetPassword(token, password, { revokeTokens });
  return NextResponse.json<PasswordResetAnswer>({ reset: true, sessionsEnded, tokensRevoked });
});
