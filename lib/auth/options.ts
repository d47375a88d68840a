import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import EmailProvider from 'next-auth/providers/email';
import SequelizeAdapter from '@next-auth/sequelize-adapter';
import { db } from '@/db/models';
import type { Role } from '@/db/models/user';
import { passwordMatches } from './password';
import { safeRedirect } from './redirect';
import { signInSchema } from '@/lib/schemas/account';
import { clientAddress, hitCount, recordHit } from '@/lib/rate-limit';
import { smtpUrl } from '@/lib/mail/send';
import { acceptLinkSignIn, sendSignInLink } from './link-sign-in';
import { liveSessionUser, openSession, revokeSession, SESSION_MAX_AGE_SECONDS } from './sessions';

export const SIGN_IN_LIMITS = { perAccount: 8, perAddress: 40, windowSeconds: 15 * 60 };

// Failed attempts only count against the limit; a good password resets nothing but is not slowed.
export async function checkCredentials(raw: unknown, address: string) {
  const parsed = signInSchema.safeParse(raw);
  if (!parsed.success) return null;
  const { email, password } = parsed.data;
  const accountBucket = `signin:account:${email}`;
  const addressBucket = `signin:address:${address}`;
  const w = SIGN_IN_LIMITS.windowSeconds;
  if ((await hitCount(accountBucket, w)) >= SIGN_IN_LIMITS.perAccount || (await hitCount(addressBucket, w)) >= SIGN_IN_LIMITS.perAddress) {
    throw new Error('RateLimited');
  }
  const { User } = db();
  const user = await User.findOne({ where: { email } });
  // Compared against a dummy hash when there is no account, so both refusals take as long.
  const ok = await passwordMatches(password, user?.passwordHash);
  if (!user || !ok) {
    await recordHit(accountBucket);
    await recordHit(addressBucket);
    return null;
  }
  if (user.disabledAt) throw new Error('AccountDisabled');
  if (!user.emailVerified) throw new Error('EmailNotConfirmed');
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

// Built once for each set of models (a test may open a second): the adapter and providers are
// plain configuration, and building them on every request cost about 0.7 ms of each.
let built: { models: ReturnType<typeof db>; options: NextAuthOptions } | null = null;

export function authOptions(): NextAuthOptions {
  const models = db();
  if (built?.models !== models) built = { models, options: buildOptions(models) };
  return built.options;
}

function buildOptions(models: ReturnType<typeof db>): NextAuthOptions {
  return {
    adapter: SequelizeAdapter(models.sequelize, {
      synchronize: false,
      models: { User: models.User, Account: models.Account, Session: models.Session, VerificationToken: models.VerificationToken } as never,
    }),
    // Credentials sign-in needs signed JWT sessions; roles are re-read on every request below.
    // Each JWT names a server-side session (lib/auth/sessions.ts) that every request checks.
    session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_SECONDS },
    secret: process.env.NEXTAUTH_SECRET,
    pages: { signIn: '/signin', verifyRequest: '/signin/check-mail', error: '/signin' },
    providers: [
      CredentialsProvider({
        name: 'Email and password',
        credentials: { email: { label: 'Email', type: 'email' }, password: { label: 'Password', type: 'password' } },
        authorize: async (credentials, req) => checkCredentials(credentials, clientAddress((req?.headers ?? {}) as Record<string, string>)),
      }),
      EmailProvider({
        server: smtpUrl(),
        from: process.env.MAIL_FROM ?? 'Bandcone <no-reply@bandcone.test>',
        maxAge: 30 * 60,
        // Queued, never sent inline; the same answer whether or not the address has an account.
        sendVerificationRequest: ({ identifier, url }) => sendSignInLink(identifier, url),
      }),
    ],
    events: {
      // Ends this cookie's session alone: a copy of the cookie dies with it.
      async signOut({ token }) {
        await revokeSession(token?.sid);
      },
    },
    callbacks: {
      redirect: async (params) => safeRedirect(params),
      async signIn({ user, account, email }) {
        // Asking for a link: always the same answer; sendSignInLink decides what the mail says.
        if (email?.verificationRequest) return true;
        // Following a valid link: only for an existing, enabled account (never creates one).
        if (account?.provider === 'email') return user?.email ? acceptLinkSignIn(user.email) : '/signin?error=NoAccount';
        return true;
      },
      async jwt({ token, user, account }) {
        if (user?.id) {
          // A fresh sign-in: a new server-side session that this cookie names.
          const sid = await openSession(String(user.id), account?.provider === 'email' ? 'email_link' : 'password');
          token = { ...token, sub: String(user.id), sid };
        }
        const fresh = await liveSessionUser(token.sid, token.sub);
        if (!fresh) return { ...token, role: undefined, disabled: true };
        return { ...token, sub: fresh.id, name: fresh.name, email: fresh.email, role: fresh.role, disabled: false };
      },
      async session({ session, token }) {
        if (token.disabled || !token.role) return { ...session, user: undefined } as never;
        return { ...session, user: { id: token.sub as string, name: token.name ?? null, email: token.email ?? null, role: token.role as Role } };
      },
    },
  };
}
