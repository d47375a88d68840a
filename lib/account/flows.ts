import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { db } from '@/db/models';
import { hashPassword } from '@/lib/auth/password';
import { newSecret, sha256Hex } from '@/lib/auth/tokens';
import { revokeAllSessions } from '@/lib/auth/sessions';
import { enqueueJob, enqueueMail, REGISTER_QUEUE, RESET_QUEUE } from '@/lib/mail/queue';
import { audit } from '@/lib/audit';
import { unprocessable } from '@/lib/http/errors';
import { siteUrl } from '@/lib/http/site';

const HOUR = 3600_000;
type Purpose = 'confirm_email' | 'reset_password';

async function issueToken(userId: string, purpose: Purpose, hours: number, transaction: Transaction) {
  const { UserToken } = db();
  const secret = newSecret(purpose === 'confirm_email' ? 'confirm' : 'reset');
  await UserToken.create({ userId, purpose, tokenHash: sha256Hex(secret), expiresAt: new Date(Date.now() + hours * HOUR) }, { transaction });
  return secret;
}

/**
 * Uses up a one-time token inside the caller's transaction. A single conditional UPDATE:
 * of several requests carrying the same token at once, exactly one gets the row back; the
 * others wait on its row lock, then find it used.
 */
async function consumeToken(secret: string, purpose: Purpose, transaction: Transaction): Promise<string> {
  const rows = await db().sequelize.query<{ user_id: string }>(
    `UPDATE user_tokens SET used_at = now()
     WHERE token_hash = :hash AND purpose = :purpose AND used_at IS NULL AND expires_at > now()
     RETURNING user_id`,
    { replacements: { hash: sha256Hex(secret), purpose }, type: QueryTypes.SELECT, transaction },
  );
  if (!rows[0]) throw unprocessable('This link is not valid any more; ask for a new one.');
  return rows[0].user_id;
}

/** The answers of the account routes. */
export type RegisterAnswer = { email: string; confirmationSent: true };
export type ResetRequestAnswer = { sent: true };
export type PasswordResetAnswer = { reset: true; sessionsEnded: number; tokensRevoked: number };
export type SignOutEverywhereAnswer = { sessionsEnded: number };

export type RegistrationRequest = { name: string; email: string; passwordHash: string };

/**
 * Sign-up. Whether the address already has an account must not show, in the answer or in its
 * time: the request hashes the password (the slow part) and queues the registration, one
 * INSERT whatever the address; the worker then makes the account, or tells the address's
 * owner that someone tried (prepareRegistration).
 */
export async function register(input: { name: string; email: string; password: string }): Promise<{ email: string }> {
  const passwordHash = await hashPassword(input.password);
  const request: RegistrationRequest = { name: input.name, email: input.email, passwordHash };
  await db().sequelize.transaction((transaction) => enqueueJob(REGISTER_QUEUE, request, transaction));
  return { email: input.email };
}

/** Worker side of register: the account, its audit row, its token and its mail, together. */
export async function prepareRegistration({ name, email, passwordHash }: RegistrationRequest): Promise<void> {
  const { User, sequelize } = db();
  try {
    await sequelize.transaction(async (transaction) => {
      const existing = await User.findOne({ where: { email }, transaction });
      if (existing) {
        await audit(null, 'user.register_existing', { type: 'user', id: existing.id }, {}, transaction);
        await enqueueMail({
          kind: 'register_existing',
          to: existing.email,
          subject: 'Someone tried to create a Bandcone account with your address',
          text:
            `Someone (perhaps you) tried to create a Bandcone account for ${existing.email}, but this address already has one.\n\n` +
            `To use it, sign in at ${siteUrl()}/signin, or choose a new password at ${siteUrl()}/reset-password.\n\n` +
            `If it was not you, you need do nothing: no second account was made and nothing about yours changed.`,
        }, transaction);
        return;
      }
      const user = await User.create({ name, email, passwordHash, emailVerified: null, role: 'contributor' }, { transaction });
      await audit(user.id, 'user.registered', { type: 'user', id: user.id }, { email: user.email }, transaction);
      const token = await issueToken(user.id, 'confirm_email', 48, transaction);
      await enqueueMail({
        kind: 'confirm_email',
        to: user.email,
        sensitive: true,
        subject: 'Confirm your Bandcone account',
        text:
          `Welcome to Bandcone, ${user.name}.\n\nConfirm your e-mail address to start contributing curves:\n${siteUrl()}/confirm-email?token=${token}\n\n` +
          `The link is valid for 48 hours. If you did not create this account, do not open it: an unconfirmed account cannot be used.`,
      }, transaction);
    });
  } catch (err) {
    // Two sign-ups for one address at once: the other one made the account and sent its mail.
    if (!(err instanceof UniqueConstraintError)) throw err;
  }
}

export async function confirmEmail(secret: string) {
  const { User, sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const userId = await consumeToken(secret, 'confirm_email', transaction);
    const user = await User.findByPk(userId, { transaction });
    if (!user) throw unprocessable('This account no longer exists.');
    await user.update({ emailVerified: user.emailVerified ?? new Date() }, { transaction });
    await audit(user.id, 'user.email_confirmed', { type: 'user', id: user.id }, {}, transaction);
    return user;
  });
}

/**
 * The reset form's answer must not depend on whether the address has an account, in content
 * or in time. So the request only queues the address (one INSERT whatever it is) and the
 * worker looks it up after the answer has gone (prepareResetMail).
 */
export async function requestPasswordReset(email: string): Promise<void> {
  await db().sequelize.transaction((transaction) => enqueueJob(RESET_QUEUE, { email }, transaction));
}

/** Worker side of requestPasswordReset: a token and its mail, together, for an existing account. */
export async function prepareResetMail(email: string): Promise<void> {
  const { User, sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    const user = await User.findOne({ where: { email }, transaction });
    if (!user || user.disabledAt) return;
    const token = await issueToken(user.id, 'reset_password', 2, transaction);
    await enqueueMail({
      kind: 'reset_password',
      to: user.email,
      sensitive: true,
      subject: 'Reset your Bandcone password',
      text:
        `Someone (we hope you) asked to reset the Bandcone password for ${user.email}.\n\n` +
        `Choose a new password here (valid for 2 hours):\n${siteUrl()}/reset-password/${token}\n\n` +
        `Saving it signs this account out everywhere. If it was not you, ignore this message; your password stays as it is.`,
    }, transaction);
  });
}

export async function resetPassword(secret: string, password: string, options: { revokeTokens?: boolean } = {}) {
  const { User, ApiToken, sequelize } = db();
  const passwordHash = await hashPassword(password);
  return sequelize.transaction(async (transaction) => {
    const userId = await consumeToken(secret, 'reset_password', transaction);
    // Following the link proves the address too.
    await User.update({ passwordHash, emailVerified: new Date() }, { where: { id: userId }, transaction });
    const sessionsEnded = await revokeAllSessions(userId, 'password reset', transaction);
    let tokensRevoked = 0;
    if (options.revokeTokens) {
      [tokensRevoked] = await ApiToken.update({ revokedAt: new Date() }, { where: { userId, revokedAt: null }, transaction });
    }
    await audit(userId, 'user.password_reset', { type: 'user', id: userId }, { sessionsEnded, tokensRevoked }, transaction);
    const user = await User.findByPk(userId, { transaction, attributes: ['email'] });
    if (user) {
      await enqueueMail({
        kind: 'password_changed',
        to: user.email,
        subject: 'Your Bandcone password was changed',
        text:
          `The password for ${user.email} was changed through a reset link, and every session of this account was signed out` +
          (tokensRevoked ? `; ${tokensRevoked} API token(s) were revoked as well.` : '.') +
          `\n\nIf it was not you, reset the password again at ${siteUrl()}/reset-password and tell an administrator.`,
      }, transaction);
    }
    return { sessionsEnded, tokensRevoked };
  });
}

/** "Sign out everywhere" on the account page: every session of this user, this one included. */
export async function signOutEverywhere(userId: string): Promise<number> {
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const ended = await revokeAllSessions(userId, 'signed out everywhere', transaction);
    await audit(userId, 'user.signed_out_everywhere', { type: 'user', id: userId }, { sessionsEnded: ended }, transaction);
    return ended;
  });
}
