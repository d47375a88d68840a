import { QueryTypes } from 'sequelize';
import { getSequelize } from '@/db/connection';

export type OutboxState = 'queued' | 'sent' | 'failed';

export type OutboxItem = {
  id: number;
  kind: string;
  recipients: string[];
  subject: string;
  /** Null for a message holding a one-time link: admins never see those. */
  body: string | null;
  sensitive: boolean;
  state: OutboxState;
  attempts: number;
  maxAttempts: number;
  lastError: string | null;
  createdAt: Date;
  lastAttemptAt: Date | null;
  sentAt: Date | null;
};

/** Admin → Outgoing mail: newest first, optionally for one recipient. */
export async function listOutgoingMail(options: { to?: string; state?: OutboxState; limit?: number } = {}): Promise<{ items: OutboxItem[]; counts: Record<OutboxState, number> }> {
  const sequelize = getSequelize();
  const to = options.to?.trim().toLowerCase() || null;
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT id, kind, recipients, subject, CASE WHEN sensitive THEN NULL ELSE text_body END AS body, sensitive, state,
            attempts, max_attempts, last_error, created_at, last_attempt_at, sent_at
     FROM outgoing_mail
     WHERE (CAST(:to AS text) IS NULL OR recipients @> ARRAY[CAST(:to AS text)])
       AND (CAST(:state AS text) IS NULL OR state = :state)
     ORDER BY id DESC LIMIT :limit`,
    { replacements: { to, state: options.state ?? null, limit: Math.min(options.limit ?? 200, 500) }, type: QueryTypes.SELECT },
  );
  const countRows = await sequelize.query<{ state: OutboxState; n: string }>(`SELECT state, count(*) AS n FROM outgoing_mail GROUP BY state`, { type: QueryTypes.SELECT });
  const counts: Record<OutboxState, number> = { queued: 0, sent: 0, failed: 0 };
  for (const r of countRows) counts[r.state] = Number(r.n);
  return {
    counts,
    items: rows.map((r) => ({
      id: Number(r.id), kind: r.kind as string, recipients: r.recipients as string[], subject: r.subject as string,
      body: (r.body as string | null) ?? null, sensitive: !!r.sensitive, state: r.state as OutboxState,
      attempts: Number(r.attempts), maxAttempts: Number(r.max_attempts), lastError: (r.last_error as string | null) ?? null,
      createdAt: new Date(r.created_at as string), lastAttemptAt: r.last_attempt_at ? new Date(r.last_attempt_at as string) : null,
      sentAt: r.sent_at ? new Date(r.sent_at as string) : null,
    })),
  };
}
