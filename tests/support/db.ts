import { QueryTypes } from 'sequelize';
import { getSequelize } from '@/db/connection';

// Direct reads of the test database, to prove what a request did or did not write.
export async function count(table: string, where = 'true'): Promise<number> {
  const rows = await getSequelize().query<{ n: string }>(`SELECT count(*) AS n FROM ${table} WHERE ${where}`, { type: QueryTypes.SELECT });
  return Number(rows[0].n);
}

export async function query<T extends object>(sql: string, replacements: Record<string, unknown> = {}): Promise<T[]> {
  return getSequelize().query<T>(sql, { replacements, type: QueryTypes.SELECT });
}

export async function latestMailTo(email: string, subjectLike = '%'): Promise<{ subject: string; text_body: string } | undefined> {
  const rows = await query<{ subject: string; text_body: string }>(
    `SELECT subject, text_body FROM mail_messages WHERE :email = ANY(envelope_to) AND subject ILIKE :subjectLike ORDER BY id DESC LIMIT 1`,
    { email, subjectLike },
  );
  return rows[0];
}

/** The catcher stores mail asynchronously; wait until it has arrived. */
export async function waitForMail(email: string, subjectLike = '%', timeoutMs = 10_000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const mail = await latestMailTo(email, subjectLike);
    if (mail) return mail;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail to ${email} matching ${subjectLike}`);
}
