import { afterAll, describe, expect, it } from 'vitest';
import { query } from '../support/db';
import { closeSequelize, getSequelize } from '@/db/connection';
import { enqueueMail } from '@/lib/mail/queue';
import { sweepAbandonedMail } from '@/lib/mail/worker';

// A queued message whose job the queue no longer holds is marked failed, with a reason an admin
// can read; a message whose job is still waiting is left alone.
afterAll(() => closeSequelize());

async function stateOf(id: number) {
  const [row] = await query<{ state: string; last_error: string | null; text_body: string | null }>(
    'SELECT state, last_error, text_body FROM outgoing_mail WHERE id = :id', { id },
  );
  return row;
}

describe('abandoned mail', () => {
  it('marks a queued message failed once its job is gone, and leaves a waiting one queued', async () => {
    const sequelize = getSequelize();
    // Two messages queued as the app queues them (row and job in one transaction), dated two minutes
    // back. In the same transaction the first one's job is taken away, as when every try of it
    // expired, and the second one's is held back an hour, so the test server's worker leaves it be.
    const ids: number[] = [];
    for (const [subject, job] of [['sweep: abandoned', 'DELETE FROM pgboss.job'], ['sweep: waiting', "UPDATE pgboss.job SET state = 'retry', start_after = now() + interval '1 hour'"]]) {
      await sequelize.transaction(async (transaction) => {
        const id = await enqueueMail({ kind: 'test', to: 'nobody@bandcone.test', subject, text: 'a one-time link', sensitive: true }, transaction);
        await sequelize.query(`${job} WHERE data->>'mailId' = :id`, { replacements: { id: String(id) }, transaction });
        await sequelize.query(`UPDATE outgoing_mail SET created_at = now() - interval '2 minutes' WHERE id = :id`, { replacements: { id }, transaction });
        ids.push(id!);
      });
    }

    expect(await sweepAbandonedMail()).toBeGreaterThanOrEqual(1);
    const abandoned = await stateOf(ids[0]);
    expect(abandoned.state).toBe('failed');
    expect(abandoned.last_error).toMatch(/gave up/);
    // a one-time link that will never be delivered is not kept
    expect(abandoned.text_body).toBeNull();
    expect((await stateOf(ids[1])).state).toBe('queued');

    await query(`DELETE FROM pgboss.job WHERE data->>'mailId' = :id RETURNING id`, { id: String(ids[1]) });
    await query(`UPDATE outgoing_mail SET state = 'failed' WHERE id = :id RETURNING id`, { id: ids[1] });
  });
});
