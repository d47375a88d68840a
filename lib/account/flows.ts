import { Op } from 'sequelize';
import { db } from '@/db/models';
import { hashPassword } from '@/lib/auth/password';
import { newSecret, sha256Hex } from '@/lib/auth/tokens';
import { sendMail } from '@/lib/mail/send';
import { audit } from '@/lib/audit';
import { conflict, unprocessable } from '@/lib/http/errors';

const HOUR = 3600_000;

function siteUrl(): string {
  return process.env.NEXTAUTH_URL ?? 'http://127.0.0.1:3000';
}

async function issueToken(userId: string, purpose: 'confirm_email' | 'reset_password', hours: number) {
  const { UserToken } = db();
  const secret = newSecret(purpose === 'confirm_email' ? 'confirm' : 'reset');
  await UserToken.create({ userId, purpose, tokenHash: sha256Hex(secret), expiresAt: new Date(Date.now() + hours * HOUR) });
  return secret;
}

async function takeToken(secret: string, purpose: 'confirm_email' | 'reset_password') {
  const { UserToken } = db();
  const token = await UserToken.findOne({
    where: { tokenHash: sha256Hex(secret), purpose, usedAt: null, expiresAt: { [Op.gt]: new Date() } },
  });
  if (!token) throw unprocessable('This link is not valid any more; ask for a new one.');
  return token;
}

export async function register(input: { name: string; email: string; password: string }) {
  const { User, sequelize } = db();
  const existing = await User.findOne({ where: { email: input.email } });
  if (existing) throw conflict('An account with this e-mail address already exists; sign in or reset the password.');
  const passwordHash = await hashPassword(input.password);
  const user = await sequelize.transaction(async (transaction) => {
    const user = await User.create({ name: input.name, email: input.email, passwordHash, emailVerified: null, role: 'contributor' }, { transaction });
    await audit(user.id, 'user.registered', { type: 'user', id: user.id }, { email: user.email }, transaction);
    return user;
  });
  const token = await issueToken(user.id, 'confirm_email', 48);
  await sendMail({
    to: user.email,
    subject: 'Confirm your Bandcone account',
    text: `Welcome to Bandcone, ${user.name}.\n\nConfirm your e-mail address to start contributing curves:\n${siteUrl()}/confirm-email?token=${token}\n\nThe link is valid for 48 hours.`,
  });
  return user;
}

export async function confirmEmail(secret: string) {
  const { User, sequelize } = db();
  const token = await takeToken(secret, 'confirm_email');
  return sequelize.transaction(async (transaction) => {
    await token.update({ usedAt: new Date() }, { transaction });
    const user = await User.findByPk(token.userId, { transaction });
    if (!user) throw unprocessable('This account no longer exists.');
    await user.update({ emailVerified: user.emailVerified ?? new Date() }, { transaction });
    await audit(user.id, 'user.email_confirmed', { type: 'user', id: user.id }, {}, transaction);
    return user;
  });
}

/** Always answers the same way, so the form does not reveal which addresses have accounts. */
export async function requestPasswordReset(email: string) {
  const { User } = db();
  const user = await User.findOne({ where: { email } });
  if (!user || user.disabledAt) return;
  const token = await issueToken(user.id, 'reset_password', 2);
  await sendMail({
    to: user.email,
    subject: 'Reset your Bandcone password',
    text: `Someone (we hope you) asked to reset the Bandcone password for ${user.email}.\n\nChoose a new password here (valid for 2 hours):\n${siteUrl()}/reset-password/${token}\n\nIf it was not you, ignore this message; your password stays as it is.`,
  });
}

export async function resetPassword(secret: string, password: string) {
  const { User, sequelize } = db();
  const token = await takeToken(secret, 'reset_password');
  const passwordHash = await hashPassword(password);
  await sequelize.transaction(async (transaction) => {
    await token.update({ usedAt: new Date() }, { transaction });
    // Following the link proves the address too.
    await User.update({ passwordHash, emailVerified: new Date() }, { where: { id: token.userId }, transaction });
    await audit(token.userId, 'user.password_reset', { type: 'user', id: token.userId }, {}, transaction);
  });
}
