import Link from 'next/link';
import { confirmEmail } from '@/lib/account/flows';

export const dynamic = 'force-dynamic';

export default async function ConfirmEmailPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  let message: string;
  let ok = false;
  try {
    if (!token) throw new Error('This link is incomplete; open the whole link from the e-mail.');
    const user = await confirmEmail(token);
    message = `Thank you: ${user.email} is confirmed. You can sign in now.`;
    ok = true;
  } catch (err) {
    message = (err as Error).message;
  }
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-2xl font-semibold">Confirm your e-mail</h1>
      <p role={ok ? 'status' : 'alert'} className={ok ? '' : 'text-bad'}>{message}</p>
      <Link href="/signin" className="underline">Go to sign-in</Link>
    </div>
  );
}
