import type { Metadata } from 'next';
import { SignInForms } from './sign-in-forms';

export const metadata: Metadata = { title: 'Sign in' };

const MESSAGES: Record<string, string> = {
  CredentialsSignin: 'That e-mail and password do not match an account.',
  RateLimited: 'Too many failed attempts; wait 15 minutes or reset your password.',
  AccountDisabled: 'This account is disabled; contact an administrator.',
  EmailNotConfirmed: 'Confirm your e-mail address first: open the link we sent you.',
  NeedsRole: 'Your account does not have the role this page needs.',
  Verification: 'That sign-in link has expired or was already used.',
  NoAccount: 'There is no account for that address; create one first.',
  LinkRateLimited: 'Too many sign-in links were asked for; try again in an hour, or sign in with your password.',
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const sp = await searchParams;
  const error = sp.error ? (MESSAGES[sp.error] ?? 'Sign-in failed; try again.') : undefined;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-2xl font-semibold">Sign in</h1>
      {error ? <p role="alert" className="rounded-card border border-bad p-3 text-bad">{error}</p> : null}
      <SignInForms callbackUrl={sp.callbackUrl ?? '/'} />
      {process.env.BANDCONE_ENV !== 'production' ? (
        <p className="rounded-card border border-rule p-3 text-sm text-muted">
          Demo site: sign in as contributor@bandcone.test, moderator@bandcone.test or admin@bandcone.test with the password
          from the README (default <code className="figures">bandcone-demo</code>).
        </p>
      ) : null}
    </div>
  );
}
