import PgBoss from 'pg-boss';
import { QueryTypes, type Transaction } from 'sequelize';
import { getSequelize } from '@/db/connection';
import { databaseUrl } from '@/db/config';

// The durable mail queue. A message is a row of `outgoing_mail` (what admins see) and a
// pg-boss job that sends it (db/migrations/0004_mail_queue_sessions.ts creates both the
// table and pg-boss's schema). Both are written inside the caller's transaction, so a
// decision and its mail commit together or not at all, and no request waits on SMTP:
// the worker (lib/mail/worker.ts) sends after the answer, retrying with backoff.

export const MAIL_QUEUE = 'mail-send';
export const RESET_QUEUE = 'reset-request';
export const REGISTER_QUEUE = 'register-request';
export const PGBOSS_SCHEMA = 'pgboss';

/** Retry policy, from the environment: tries = retries + 1; delays double from the first, with jitter. */
export function retryPolicy() {
  const retryLimit = Math.max(0, Number(process.env.MAIL_RETRY_LIMIT ?? 8));
  const retryDelay = Math.max(1, Number(process.env.MAIL_RETRY_DELAY_SECONDS ?? 30));
  return { retryLimit, retryDelay, retryBackoff: true, expireInSeconds: 120 };
}

const globalForBoss = globalThis as unknown as { bandconeBoss?: PgBoss; bandconeWorkers?: Map<string, string[]> };

/** The process's one pg-boss instance. Sending through a transaction needs no start(). */
export function boss(): PgBoss {
  globalForBoss.bandconeBoss ??= new PgBoss({
    connectionString: databaseUrl(),
    schema: PGBOSS_SCHEMA,
    // The schema belongs to our migrations; pg-boss only checks its version.
    migrate: false,
    // No cron: the timekeeper would create queues (tables) at run time.
    schedule: false,
    supervise: true,
    max: 3,
    application_name: 'bandcone-queue',
    maintenanceIntervalSeconds: 60,
    archiveCompletedAfterSeconds: 3600,
    deleteAfterDays: 14,
  });
  return globalForBoss.bandconeBoss;
}

const workers = () => (globalForBoss.bandconeWorkers ??= new Map());

/** Notes a worker of this process on the queue (several may share one); undefined forgets them all. */
export function rememberWorker(queue: string, id: string | undefined) {
  if (id) workers().set(queue, [...(workers().get(queue) ?? []), id]);
  else workers().delete(queue);
}

/**
 * Wakes this process's worker for the queue, if it runs one, instead of letting it wait for
 * its next poll. pg-boss waits a whole polling interval after every fetch, so a worker also
 * wakes itself after each job: a backlog drains at SMTP speed, not one message a second.
 */
export function wakeWorker(queue: string) {
  for (const id of workers().get(queue) ?? []) boss().notifyWorker(id);
}

// pg-boss runs its SQL on the transaction's own connection, so the job is part of the transaction.
function viaTransaction(transaction: Transaction): PgBoss.Db {
  const connection = (transaction as unknown as { connection: { query: (text: string, values?: unknown[]) => Promise<{ rows: unknown[] }> } }).connection;
  return { executeSql: (text, values) => connection.query(text, values) as Promise<{ rows: never[] }> };
}

/** Queues a job inside the transaction; it runs once the transaction commits. */
export async function enqueueJob(queue: string, data: object, transaction: Transaction): Promise<void> {
  const id = await boss().send(queue, data, { ...retryPolicy(), db: viaTransaction(transaction) });
  if (!id) throw new Error(`the ${queue} queue refused a job`);
  transaction.afterCommit(() => wakeWorker(queue));
}

export type QueuedMail = {
  /** What caused it, for the admin list: 'confirm_email', 'decision', … */
  kind: string;
  to: string | string[];
  subject: string;
  text: string;
  /** Holds a one-time link: hidden from admins, body dropped once sent. */
  sensitive?: boolean;
};

/**
 * Queues one message. Pass the transaction of the change that causes it; without one, the
 * message gets a transaction of its own. Returns the outgoing_mail id (null: nobody to send to).
 */
export async function enqueueMail(mail: QueuedMail, transaction?: Transaction): Promise<number | null> {
  const recipients = [...new Set((Array.isArray(mail.to) ? mail.to : [mail.to]).map((a) => a.trim().toLowerCase()).filter(Boolean))];
  if (recipients.length === 0) return null;
  if (!transaction) return getSequelize().transaction((t) => enqueueMail(mail, t));
  const { retryLimit } = retryPolicy();
  const [row] = await getSequelize().query<{ id: string }>(
    `INSERT INTO outgoing_mail (kind, recipients, subject, text_body, sensitive, max_attempts)
     VALUES (:kind, ARRAY[:recipients]::text[], :subject, :text, :sensitive, :maxAttempts) RETURNING id`,
    {
      replacements: { kind: mail.kind, recipients, subject: mail.subject, text: mail.text, sensitive: !!mail.sensitive, maxAttempts: retryLimit + 1 },
      type: QueryTypes.SELECT,
      transaction,
    },
  );
  const id = Number(row.id);
  await enqueueJob(MAIL_QUEUE, { mailId: id }, transaction);
  return id;
}
