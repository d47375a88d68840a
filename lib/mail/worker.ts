import { QueryTypes } from 'sequelize';
import { getSequelize } from '@/db/connection';
import { isPermanentSmtpFailure, sendMail } from './send';
import { MAIL_QUEUE, PGBOSS_SCHEMA, REGISTER_QUEUE, RESET_QUEUE, boss, rememberWorker, wakeWorker } from './queue';
import { pruneSessions } from '@/lib/auth/sessions';
import { prepareRegistration, prepareResetMail, type RegistrationRequest } from '@/lib/account/flows';

type Claimed = { recipients: string[]; subject: string; text_body: string | null; attempts: number; max_attempts: number };

/**
 * Sends one queued message. The row is claimed by a conditional UPDATE, so a message already
 * sent (a job handed out again after a lost answer) is never sent twice. A failure is written
 * to the row and thrown, and pg-boss retries the job later; a 5xx refusal or the last try
 * leaves the message failed.
 */
export async function deliver(mailId: number): Promise<'sent' | 'skipped' | 'failed'> {
  const sequelize = getSequelize();
  const [row] = await sequelize.query<Claimed>(
    `UPDATE outgoing_mail SET attempts = attempts + 1, last_attempt_at = now()
     WHERE id = :mailId AND state = 'queued'
     RETURNING recipients, subject, text_body, attempts, max_attempts`,
    { replacements: { mailId }, type: QueryTypes.SELECT },
  );
  if (!row) return 'skipped';
  try {
    await sendMail({ to: row.recipients, subject: row.subject, text: row.text_body ?? '' });
  } catch (err) {
    const permanent = isPermanentSmtpFailure(err);
    const final = permanent || row.attempts >= row.max_attempts;
    // A one-time link that will never be delivered is dropped too.
    await sequelize.query(
      `UPDATE outgoing_mail SET state = :state, last_error = :error,
         text_body = CASE WHEN :final AND sensitive THEN NULL ELSE text_body END
       WHERE id = :mailId`,
      { replacements: { mailId, final, state: final ? 'failed' : 'queued', error: String((err as Error).message ?? err).slice(0, 500) } },
    );
    if (permanent) return 'failed';
    throw err;
  }
  await sequelize.query(
    `UPDATE outgoing_mail SET state = 'sent', sent_at = now(), last_error = NULL,
       text_body = CASE WHEN sensitive THEN NULL ELSE text_body END
     WHERE id = :mailId`,
    { replacements: { mailId } },
  );
  return 'sent';
}

/**
 * A message whose job the queue no longer holds (every try expired while a process died mid-send,
 * or the job was archived) would otherwise read "queued" for ever. Such rows are marked failed,
 * so the admin's mail page says what happened. Jobs are written in the transaction of their row,
 * so a queued row without a live job is never one about to be sent.
 */
export async function sweepAbandonedMail(): Promise<number> {
  const [rows] = await getSequelize().query(
    `UPDATE outgoing_mail m
        SET state = 'failed', last_error = 'the queue gave up on this message (its tries ran out while a server was stopped or stuck)',
            text_body = CASE WHEN m.sensitive THEN NULL ELSE m.text_body END
      WHERE m.state = 'queued' AND m.created_at < now() - interval '1 minute'
        AND NOT EXISTS (
          SELECT 1 FROM ${PGBOSS_SCHEMA}.job j
           WHERE j.name = :queue AND j.state IN ('created', 'retry', 'active') AND j.data->>'mailId' = m.id::text)
      RETURNING m.id`,
    { replacements: { queue: MAIL_QUEUE } },
  );
  return (rows as unknown[]).length;
}

let starting: Promise<void> | undefined;

/** Messages sent at once by one server process (MAIL_SENDERS, default 4). */
const MAIL_SENDERS = Math.max(1, Math.min(16, Number(process.env.MAIL_SENDERS ?? 4)));

/**
 * Starts this process's workers (the app server calls it from instrumentation.ts). When the
 * database is not there yet, it tries again later instead of giving up.
 */
export function startMailWorker(): Promise<void> {
  starting ??= (async () => {
    const queue = boss();
    queue.on('error', (err) => console.error('mail queue:', (err as Error).message ?? err));
    for (let wait = 1000; ; wait = Math.min(wait * 2, 60_000)) {
      try {
        await queue.start();
        break;
      } catch (err) {
        console.error(`mail queue could not start (${(err as Error).message}); trying again in ${wait / 1000} s`);
        await new Promise((r) => setTimeout(r, wait));
      }
    }
    const polling = { batchSize: 1, pollingIntervalSeconds: Number(process.env.MAIL_POLL_SECONDS ?? 1) };
    // One job per fetch, so a failure retries that message alone; after each, look again at once.
    const handle = <T extends object>(name: string, fn: (data: T) => Promise<unknown>) =>
      queue.work<T>(name, polling, async ([job]) => {
        try {
          return await fn(job.data);
        } finally {
          wakeWorker(name);
        }
      });
    // Several senders, so a backlog (a hundred decisions at once) drains in seconds; each claims its row first.
    for (let k = 0; k < MAIL_SENDERS; k++) rememberWorker(MAIL_QUEUE, await handle<{ mailId: number }>(MAIL_QUEUE, (d) => deliver(Number(d.mailId))));
    rememberWorker(RESET_QUEUE, await handle<{ email: string }>(RESET_QUEUE, (d) => prepareResetMail(d.email)));
    rememberWorker(REGISTER_QUEUE, await handle<RegistrationRequest>(REGISTER_QUEUE, prepareRegistration));
    // Ended sessions are kept a while for the record, then dropped.
    setInterval(() => void pruneSessions().catch(() => undefined), 3600_000).unref();
    setInterval(() => void sweepAbandonedMail().catch(() => undefined), 300_000).unref();
  })();
  return starting;
}

export async function stopMailWorker(): Promise<void> {
  if (!starting) return;
  await starting;
  rememberWorker(MAIL_QUEUE, undefined);
  rememberWorker(RESET_QUEUE, undefined);
  rememberWorker(REGISTER_QUEUE, undefined);
  await boss().stop({ graceful: true, timeout: 5000 });
  starting = undefined;
}
