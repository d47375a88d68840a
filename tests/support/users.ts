import { randomUUID } from 'node:crypto';
import { db } from '@/db/models';
import { hashPassword } from '@/lib/auth/password';

/** A confirmed user made directly in the database, for tests that must not disturb the demo accounts. */
export async function makeUser(role: 'contributor' | 'moderator' | 'admin' = 'contributor', password = 'correct horse battery') {
  const email = `t-${randomUUID().slice(0, 8)}@bandcone.test`;
  const user = await db().User.create({ email, name: `Test ${role}`, role, passwordHash: await hashPassword(password), emailVerified: new Date() });
  return { id: user.id, email, password };
}
