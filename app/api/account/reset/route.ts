import { NextResponse } from 'next/server';
import { withErrors, readJson, HttpError } from '@/lib/http/errors';
import { resetRequestSchema } from '@/lib/schemas/account';
import { requestPasswordReset, type ResetRequestAnswer } from '@/lib/account/flows';
import { clientAddress, overLimit } from '@/lib/rate-limit';

export const POST = withErrors(async (req: Request) => {
  if (await overLimit(`reset:${clientAddress(req.headers)}`, 20, 3600)) {
    throw new HttpError(429, 'Too many reset requests from this address; try again in an hour.');
  }
  const { email } = resetRequestSchema.parse(await readJson(req));
  await requestPasswordReset(email);
  return NextResponse.json<ResetRequestAnswer>({ sent: true }, { status: 202 });
});
