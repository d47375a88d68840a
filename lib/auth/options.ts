import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import EmailProvider from 'next-auth/providers/email';
import SequelizeAdapter from '@next-auth/sequelize-adapter';
import { db } from '@/db/models';
import type { Role } from '@/db/models/user';
import { verifyPassword } from './password';
import { safeRedirect } from './redirect';
import { signInSchema } from '@/lib/schemas/account';
import { clientAddress, hitCount, recordHit } from '@/lib/rate-limit';
import { sendMail, smtpUrl } from '@/lib/mail/send';

export const SIGN_IN_LIMITS = { perAccount: 8, perAddress: 40, windowSeconds: 15 * 60 };

// Failed attempts only count against the limit; a good password resets nothing but is not slowed.
async function checkCredentials(raw: unknown, address: string) {
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
  const ok = !!user?.passwordHash && (await verifyPassword(password, user.passwordHash));
  if (!user || !ok) {
    await recordHit(accountBucket);
    await recordHit(addressBucket);
    return null;
  }
  if (user.disabledAt) throw new Error('AccountDisabled');
  if (!user.emailVerified) throw new Error('EmailNotConfirmed');
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

export function authOptions(): NextAuthOptions {
  const models = db();
  return {
    adapter: SequelizeAdapter(models.sequelize, {
      synchronize: false,
      models: { User: models.User, Account: models.Account, Session: models.Session, VerificationToken: models.VerificationToken } as never,
    }),
    // Credentials sign-in needs signed JWT sessions; roles are re-read on every request below.
    session: { strategy: 'jwt', maxAge: 30 * 24 * 3600 },
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
        sendVerificationRequest: async ({ identifier, url }) => {
          await sendMail({
            to: identifier,
            subject: 'Your Bandcone sign-in link',
            text: `Open this link to sign in to Bandcone (valid for 30 minutes):\n\n${url}\n\nIf you did not ask for it, ignore this message.`,
          });
        },
      }),
    ],
    callbacks: {
      redirect: async (params) => safeRedirect(params),
      async signIn({ user }) {
        const found = user?.email ? await models.User.findOne({ where: { email: user.email.toLowerCase() } }) : null;
        if (found?.disabledAt) return '/signin?error=AccountDisabled';
        return true;
      },
      async jwt({ token, user }) {
        const id = (user?.id as string | undefined) ?? (token.sub as string | undefined);
        if (!id) return token;
        const fresh = await models.User.findByPk(id);
        if (!fresh || fresh.disabledAt) return { ...token, role: undefined, disabled: true };
        return { ...token, sub: fresh.id, name: fresh.name, email: fresh.email, role: fresh.role, disabled: false };
      },
      async session({ session, token }) {
        if (token.disabled || !token.role) return { ...session, user: undefined } as never;
        return { ...session, user: { id: token.sub as string, name: token.name ?? null, email: token.email ?? null, role: token.role as Role } };
      },
    },
  };
}
