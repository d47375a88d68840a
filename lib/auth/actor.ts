import { getServerSession } from 'next-auth';
import { headers } from 'next/headers';
import { redirect } from 'next/navigation';
import { db } from '@/db/models';
import type { Role } from '@/db/models/user';
import { authOptions } from './options';
import { sha256Hex } from './tokens';
import { forbidden, unauthorised } from '@/lib/http/errors';
import { carriesSessionCookie } from '@/lib/http/request-guard';

export type Actor = { id: string; email: string; name: string | null; role: Role; via: 'session' | 'token' };

const RANK: Record<Role, number> = { contributor: 1, moderator: 2, admin: 3 };

export function hasRole(actor: Pick<Actor, 'role'> | null | undefined, role: Role): boolean {
  return !!actor && RANK[actor.role] >= RANK[role];
}

async function actorFromBearer(header: string): Promise<Actor | null> {
  const secret = header.slice('Bearer '.length).trim();
  if (!secret) return null;
  const { ApiToken, User } = db();
  const token = await ApiToken.findOne({ where: { tokenHash: sha256Hex(secret), revokedAt: null } });
  if (!token) return null;
  const user = await User.findByPk(token.userId);
  if (!user || user.disabledAt) return null;
  await token.update({ lastUsedAt: new Date() });
  return { id: user.id, email: user.email, name: user.name, role: user.role, via: 'token' };
}

// Without next-auth's session cookie there is no session to read: a signed-out visitor (most of
// them) skips the session machinery altogether.
async function maySignIn(req?: Request): Promise<boolean> {
  const header = req ? req.headers.get('cookie') : (await headers()).get('cookie');
  return carriesSessionCookie(header ?? undefined);
}

/** Who is calling: a bearer token when one is sent, else the sign-in session. */
export async function currentActor(req?: Request): Promise<Actor | null> {
  const header = req?.headers.get('authorization');
  if (header?.startsWith('Bearer ')) {
    const actor = await actorFromBearer(header);
    if (!actor) throw unauthorised('That API token is not valid or has been revoked.');
    return actor;
  }
  if (!(await maySignIn(req))) return null;
  const session = await getServerSession(authOptions());
  const u = session?.user;
  if (!u?.id || !u.role) return null;
  return { id: u.id, email: u.email ?? '', name: u.name, role: u.role, via: 'session' };
}

/** For route handlers and server actions: 401 when signed out, 403 when the role is too low. */
export async function requireRole(role: Role, req?: Request): Promise<Actor> {
  const actor = await currentActor(req);
  if (!actor) throw unauthorised();
  if (!hasRole(actor, role)) throw forbidden(`This needs the ${role} role.`);
  return actor;
}

/** For pages: send signed-out visitors to sign-in and come back afterwards. */
export async function requirePageRole(role: Role, returnTo: string): Promise<Actor> {
  const actor = await currentActor();
  if (!actor) redirect(`/signin?callbackUrl=${encodeURIComponent(returnTo)}`);
  if (!hasRole(actor, role)) redirect(`/signin?error=NeedsRole&role=${role}&callbackUrl=${encodeURIComponent(returnTo)}`);
  return actor;
}
