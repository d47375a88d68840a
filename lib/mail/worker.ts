import { QueryTypes } from 'sequelize';
import { getSequelize } from '@/db/connection';
import { isPermanentSmtpFailure, sendMail } from './send';
import { MAIL_QUEUE, RESET_QUEUE, boss, rememberWorker } from './queue';
import { prepareResetMail } from '@/lib/account/flows';

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
    await sequelize.query(`UPDATE outgoing_mail SET state = :state, last_error = :error WHERE id = :mailId`, {
      replacements: { mailId, state: final ? 'failed' : 'queued', error: String((err as Error).message ?? err).slice(0, 500) },
    });
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

let starting: Promise<void> | undefined;

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
    rememberWorker(await queue.work<{ mailId: number }>(MAIL_QUEUE, polling, async ([job]) => deliver(Number(job.data.mailId))));
    await queue.work<{ email: string }>(RESET_QUEUE, polling, async ([job]) => prepareResetMail(job.data.email));
  })();
  return starting;
}

export async function stopMailWorker(): Promise<void> {
  if (!starting) return;
  await starting;
  rememberWorker(undefined);
  await boss().stop({ graceful: true, timeout: 5000 });
  starting = undefined;
}
