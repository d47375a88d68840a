import { db } from '@/db/models';
import { audit } from '@/lib/audit';
import { newSecret, sha256Hex } from '@/lib/auth/tokens';
import { notFound } from '@/lib/http/errors';

/** What the API answers about tokens (JSON turns the dates into ISO strings). */
export type CreatedApiToken = Awaited<ReturnType<typeof createApiToken>>;
export type ApiTokenRow = Awaited<ReturnType<typeof listApiTokens>>[number];
export type RevokedApiToken = { revoked: true };

export async function createApiToken(userId: string, name: string) {
  const { ApiToken, sequelize } = db();
  const secret = newSecret('bct');
  const token = await sequelize.transaction(async (transaction) => {
    const token = await ApiToken.create({ userId, name, tokenHash: sha256Hex(secret), tokenPrefix: secret.slice(0, 8) }, { transaction });
    await audit(userId, 'token.created', { type: 'api_token', id: token.id }, { name }, transaction);
    return token;
  });
  return { id: token.id, name: token.name, token: secret };
}

export async function listApiTokens(userId: string) {
  const { ApiToken } = db();
  const tokens = await ApiToken.findAll({ where: { userId }, order: [['createdAt', 'DESC']] });
  return tokens.map((t) => ({ id: t.id, name: t.name, prefix: t.tokenPrefix, createdAt: t.createdAt, lastUsedAt: t.lastUsedAt, revokedAt: t.revokedAt }));
}

export async function revokeApiToken(userId: string, id: number) {
  const { ApiToken, sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    const token = await ApiToken.findOne({ where: { id, userId }, transaction, lock: transaction.LOCK.UPDATE });
    // Someone else's token looks exactly like a missing one.
    if (!token) throw notFound('No such token.');
    if (!token.revokedAt) await token.update({ revokedAt: new Date() }, { transaction });
    await audit(userId, 'token.revoked', { type: 'api_token', id }, { name: token.name }, transaction);
  });
}
