import { NextResponse } from 'next/server';
import { db } from '@/db/models';
import { audit } from '@/lib/audit';
import { enqueueMail } from '@/lib/mail/queue';
import { siteUrl } from '@/lib/http/site';
import { clientAddress, overLimit } from '@/lib/rate-limit';
import { revokeAllSessions } from './sessions';

// Sign-in by e-mail link (next-auth's email provider), made safe:
// - asking for a link is rate-limited like sign-up, per client address and per recipient;
// - a link is only ever for an existing account: nobody is created by following one;
// - the answer is the same whether the address has an account or not (the mail differs);
// - following a link proves the address, but a password set before the address was proven
//   is not the owner's, so it is removed (see acceptLinkSignIn).

export const LINK_LIMITS = { perAddress: 20, perRecipient: 5, windowSeconds: 3600 };

export function isLinkRequest(req: Request): boolean {
  return req.method === 'POST' && new URL(req.url).pathname.endsWith('/api/auth/signin/email');
}

/** Null when the request may go on; otherwise the 429 to answer. */
export async function guardLinkRequest(req: Request): Promise<Response | null> {
  let email = '';
  try {
    const form = await req.clone().formData();
    email = String(form.get('email') ?? '').trim().toLowerCase().slice(0, 320);
  } catch {
    // next-auth refuses a body it cannot read; the address limit still counts the attempt.
  }
  const overAddress = await overLimit(`signin-link:address:${clientAddress(req.headers)}`, LINK_LIMITS.perAddress, LINK_LIMITS.windowSeconds);
  const overRecipient = email ? await overLimit(`signin-link:email:${email}`, LINK_LIMITS.perRecipient, LINK_LIMITS.windowSeconds) : false;
  if (!overAddress && !overRecipient) return null;
  return NextResponse.json(
    {
      error: 'Too many sign-in links were asked for; try again in an hour, or sign in with your password.',
      details: [],
      // next-auth's client reads `url` and shows the sign-in page with this error.
      url: `${siteUrl()}/signin?error=LinkRateLimited`,
    },
    { status: 429, headers: { 'retry-after': String(LINK_LIMITS.windowSeconds) } },
  );
}

/** next-auth's sendVerificationRequest: one queued mail whatever the address, so the answer and its timing say nothing. */
export async function sendSignInLink(identifier: string, url: string): Promise<void> {
  const { User, sequelize } = db();
  const email = identifier.trim().toLowerCase();
  await sequelize.transaction(async (transaction) => {
    const user = await User.findOne({ where: { email }, transaction });
    const usable = !!user && !user.disabledAt;
    await audit(null, 'user.signin_link_requested', user ? { type: 'user', id: user.id } : {}, { email, sent: usable }, transaction);
    if (usable) {
      await enqueueMail({
        kind: 'signin_link',
        to: email,
        sensitive: true,
        subject: 'Your Bandcone sign-in link',
        text:
          `Open this link to sign in to Bandcone (valid for 30 minutes):\n\n${url}\n\n` +
          (user.emailVerified ? '' : 'Opening it confirms this address. Any password set on this account before the address was confirmed will be removed; you can choose a new one afterwards.\n\n') +
          'If you did not ask for it, ignore this message.',
      }, transaction);
    } else {
      await enqueueMail({
        kind: 'signin_link_no_account',
        to: email,
        subject: 'Signing in to Bandcone',
        text: user
          ? 'Someone asked for a Bandcone sign-in link for this address, but the account is disabled. Contact an administrator if you need it back.\n'
          : `Someone asked for a Bandcone sign-in link for this address, but there is no account for it. To contribute curves, create an account at ${siteUrl()}/register.\n\nIf it was not you, ignore this message.\n`,
      }, transaction);
    }
  });
}

/**
 * A valid link was followed (next-auth's signIn callback, before it marks the address
 * verified). Returns true, or the page to send the visitor to instead.
 *
 * Someone may have registered this address with a password of their own before its owner
 * ever saw it. If the address was never confirmed, the password on the account was not
 * chosen by a proven owner, so it is removed here, in one transaction with the confirmation,
 * and the owner is told by mail. (Refusing link sign-in until the address is confirmed would
 * leave the owner locked out of the one method that proves it, and leave the stranger's
 * password waiting for a later confirmation.)
 */
export async function acceptLinkSignIn(email: string): Promise<true | string> {
  const { User, sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const user = await User.findOne({ where: { email: email.trim().toLowerCase() }, transaction, lock: transaction.LOCK.UPDATE });
    if (!user) return '/signin?error=NoAccount';
    if (user.disabledAt) return '/signin?error=AccountDisabled';
    if (!user.emailVerified) {
      const hadPassword = !!user.passwordHash;
      await user.update({ emailVerified: new Date(), passwordHash: null }, { transaction });
      await audit(user.id, 'user.email_confirmed', { type: 'user', id: user.id }, { via: 'signin_link', passwordCleared: hadPassword }, transaction);
      if (hadPassword) {
        await revokeAllSessions(user.id, 'password cleared at first link sign-in', transaction);
        await enqueueMail({
          kind: 'password_cleared',
          to: user.email,
          subject: 'Your Bandcone address is confirmed; the earlier password was removed',
          text:
            `You signed in to Bandcone by e-mail link, which confirmed ${user.email}.\n\n` +
            'This account had a password that was set before the address was confirmed. Since we cannot know it was you who chose it, ' +
            `we removed it: nobody can sign in with it any more. To sign in with a password, choose a new one at ${siteUrl()}/reset-password; ` +
            'until then, sign in by e-mail link.\n',
        }, transaction);
      }
    }
    await audit(user.id, 'user.signed_in_by_link', { type: 'user', id: user.id }, {}, transaction);
    return true;
  });
}
