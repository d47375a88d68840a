import { NextResponse } from 'next/server';
import { withErrors, readJson, HttpError } from '@/lib/http/errors';
import { registerSchema } from '@/lib/schemas/account';
import { register, type RegisterAnswer } from '@/lib/account/flows';
import { clientAddress, overLimit } from '@/lib/rate-limit';

export const POST = withErrors(async (req: Request) => {
  if (await overLimit(`register:${clientAddress(req.headers)}`, 20, 3600)) {
    throw new HttpError(429, 'Too many sign-ups from this address; try again in an hour.');
  }
  const input = registerSchema.parse(await readJson(req));
  // The same answer whether or not the address already has an account (lib/account/flows.ts).
  const { email } = await register(input);
  return NextResponse.json<RegisterAnswer>({ email, confirmationSent: true }, { status: 202 });
});
