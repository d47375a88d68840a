import { QueryTypes, type Transaction } from 'sequelize';
import { getSequelize } from '@/db/connection';
import type { Role } from '@/db/models/user';

// Sign-in sessions kept server-side. The signed cookie (a next-auth JWT) carries the session
// id `sid`; every request that reads the session checks the row (lib/auth/options.ts), so
// revoking the row ends the session even for a copy of the cookie.

export const SESSION_MAX_AGE_SECONDS = 30 * 24 * 3600;

export type SessionMethod = 'password' | 'email_link';

export async function openSession(userId: string, method: SessionMethod, userAgent?: string | null): Promise<string> {
  const [row] = await getSequelize().query<{ id: string }>(
    `INSERT INTO user_sessions (user_id, method, user_agent, expires_at)
     VALUES (:userId, :method, :userAgent, now() + make_interval(secs => :maxAge)) RETURNING id`,
    { replacements: { userId, method, userAgent: userAgent?.slice(0, 300) ?? null, maxAge: SESSION_MAX_AGE_SECONDS }, type: QueryTypes.SELECT },
  );
  return row.id;
}

export type LiveSessionUser = { id: string; name: string | null; email: string; role: Role };

/**
 * The session's user when the session is live (not revoked, not expired) and the user is not
 * disabled; null otherwise. One query per request, like the disabled-user check it replaces.
 */
export async function liveSessionUser(sessionId: unknown, userId: unknown): Promise<LiveSessionUser | null> {
  if (typeof sessionId !== 'string' || typeof userId !== 'string' || !UUID.test(sessionId) || !UUID.test(userId)) return null;
  const [row] = await getSequelize().query<LiveSessionUser>(
    `SELECT u.id, u.name, u.email, u.role
     FROM user_sessions s JOIN users u ON u.id = s.user_id
     WHERE s.id = :sessionId AND s.user_id = :userId AND s.revoked_at IS NULL AND s.expires_at > now() AND u.disabled_at IS NULL`,
    { replacements: { sessionId, userId }, type: QueryTypes.SELECT },
  );
  return row ?? null;
}

// Fixed length, no repetition on user text: cannot backtrack.
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Sign-out: this session alone. */
export async function revokeSession(sessionId: unknown, reason = 'signed out'): Promise<void> {
  if (typeof sessionId !== 'string' || !UUID.test(sessionId)) return;
  await getSequelize().query(`UPDATE user_sessions SET revoked_at = now(), revoked_reason = :reason WHERE id = :sessionId AND revoked_at IS NULL`, {
    replacements: { sessionId, reason },
  });
}

/** Every live session of a user; returns how many ended. */
export async function revokeAllSessions(userId: string, reason: string, transaction?: Transaction): Promise<number> {
  const rows = await getSequelize().query<{ id: string }>(
    `UPDATE user_sessions SET revoked_at = now(), revoked_reason = :reason WHERE user_id = :userId AND revoked_at IS NULL RETURNING id`,
    { replacements: { userId, reason }, type: QueryTypes.SELECT, transaction },
  );
  return rows.length;
}

export async function countLiveSessions(userId: string): Promise<number> {
  const [row] = await getSequelize().query<{ n: string }>(
    `SELECT count(*) AS n FROM user_sessions WHERE user_id = :userId AND revoked_at IS NULL AND expires_at > now()`,
    { replacements: { userId }, type: QueryTypes.SELECT },
  );
  return Number(row?.n ?? 0);
}

/** Drops sessions ended or expired more than 30 days ago. */
export async function pruneSessions(): Promise<void> {
  await getSequelize().query(
    `DELETE FROM user_sessions WHERE expires_at < now() - interval '30 days' OR revoked_at < now() - interval '30 days'`,
  );
}
