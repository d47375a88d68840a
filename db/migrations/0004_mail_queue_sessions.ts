import PgBoss from 'pg-boss';
import type { MigrationContext } from '../migrator';

// Two things the app used to keep nowhere:
//
// 1. Outgoing mail. Every message is a row of `outgoing_mail`, written in the same transaction
//    as the change that causes it, plus a job in pg-boss's queue (schema `pgboss`) that sends
//    it after the HTTP answer, retrying with backoff. The row is what admins read (queued, sent,
//    failed after N tries); the job is only the "do it" signal. pg-boss's own tables are created
//    here, from its construction plans, and the app starts pg-boss with `migrate: false`, so
//    no process ever changes the schema at run time. When pg-boss is upgraded, a new migration
//    must apply `PgBoss.getMigrationPlans(...)` from the installed version (read `pgboss.version`
//    first: a database created after the upgrade is already on the new version).
//
// 2. Sign-in sessions. The signed cookie carries a session id; the row says whether it is
//    still live, so sign-out, a password reset, "sign out everywhere" and a role change can end
//    sessions that a cookie alone would keep alive.
const PGBOSS_SCHEMA = 'pgboss';

// The queues the app uses (names repeated in lib/mail/queue.ts). Retry settings here are
// defaults; each job also carries its own from the environment.
const QUEUES: [string, Record<string, unknown>][] = [
  ['mail-send', { policy: 'standard', retryLimit: 8, retryDelay: 30, retryBackoff: true, expireInSeconds: 120 }],
  ['reset-request', { policy: 'standard', retryLimit: 5, retryDelay: 30, retryBackoff: true, expireInSeconds: 120 }],
  ['register-request', { policy: 'standard', retryLimit: 5, retryDelay: 30, retryBackoff: true, expireInSeconds: 120 }],
];

const tables = `
CREATE TABLE outgoing_mail (
  id bigserial PRIMARY KEY,
  kind text NOT NULL,
  recipients text[] NOT NULL CHECK (cardinality(recipients) BETWEEN 1 AND 500),
  subject text NOT NULL,
  -- A message holding a one-time link is never shown to admins and loses its body once sent.
  text_body text,
  sensitive boolean NOT NULL DEFAULT false,
  state text NOT NULL DEFAULT 'queued' CHECK (state IN ('queued', 'sent', 'failed')),
  attempts integer NOT NULL DEFAULT 0 CHECK (attempts >= 0),
  max_attempts integer NOT NULL CHECK (max_attempts >= 1),
  last_error text,
  last_attempt_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  sent_at timestamptz
);
CREATE INDEX outgoing_mail_created_idx ON outgoing_mail (created_at DESC);
CREATE INDEX outgoing_mail_recipients_idx ON outgoing_mail USING gin (recipients);
CREATE INDEX outgoing_mail_unsent_idx ON outgoing_mail (state) WHERE state <> 'sent';

CREATE TABLE user_sessions (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  method text NOT NULL CHECK (method IN ('password', 'email_link')),
  user_agent text,
  created_at timestamptz NOT NULL DEFAULT now(),
  expires_at timestamptz NOT NULL,
  revoked_at timestamptz,
  revoked_reason text
);
CREATE INDEX user_sessions_live_idx ON user_sessions (user_id) WHERE revoked_at IS NULL;
`;

// The least-privilege role the app serves as (created by the start and test scripts, or by a
// later migration, which must then grant the same): data rights only, no DDL, no function calls.
const grants = `
DO $$
BEGIN
  IF EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'bandcone_app') THEN
    GRANT USAGE ON SCHEMA ${PGBOSS_SCHEMA} TO bandcone_app;
    GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA ${PGBOSS_SCHEMA} TO bandcone_app;
    GRANT SELECT, INSERT, UPDATE ON outgoing_mail TO bandcone_app;
    GRANT SELECT, INSERT, UPDATE, DELETE ON user_sessions TO bandcone_app;
    GRANT USAGE, SELECT ON SEQUENCE outgoing_mail_id_seq TO bandcone_app;
  END IF;
END
$$;
`;

const migration = {
  name: '0004_mail_queue_sessions',
  up: async ({ sequelize }: MigrationContext) => {
    // The plans carry their own BEGIN/COMMIT and an advisory lock.
    await sequelize.query(PgBoss.getConstructionPlans(PGBOSS_SCHEMA));
    for (const [name, options] of QUEUES) {
      await sequelize.query(`SELECT ${PGBOSS_SCHEMA}.create_queue(:name, :options::json)`, {
        replacements: { name, options: JSON.stringify(options) },
      });
    }
    await sequelize.query(tables);
    await sequelize.query(grants);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(`DROP TABLE IF EXISTS user_sessions, outgoing_mail; DROP SCHEMA IF EXISTS ${PGBOSS_SCHEMA} CASCADE;`);
  },
};

export default migration;
