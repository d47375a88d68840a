import type { MigrationContext } from '../migrator';

// Rate-limit counters as rate-limiter-flexible keeps them (lib/rate-limit.ts): one row per
// bucket holding its count and the epoch millisecond its window ends, pruned by the library
// an hour after expiry. Created here so the serving role never needs CREATE at run time.
// Replaces rate_limit_hits, which kept one row per hit and was never pruned.
const up = `
CREATE TABLE rate_limits (
  key text PRIMARY KEY,
  points integer NOT NULL DEFAULT 0,
  expire bigint
);
CREATE INDEX rate_limits_expire_idx ON rate_limits (expire);
DROP TABLE IF EXISTS rate_limit_hits;
`;

const down = `
DROP TABLE IF EXISTS rate_limits;
CREATE TABLE rate_limit_hits (
  id bigserial PRIMARY KEY,
  bucket text NOT NULL,
  hit_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX rate_limit_hits_bucket_idx ON rate_limit_hits (bucket, hit_at);
`;

export default {
  name: '0007_rate_limits',
  up: ({ sequelize }: MigrationContext) => sequelize.query(up).then(() => undefined),
  down: ({ sequelize }: MigrationContext) => sequelize.query(down).then(() => undefined),
};
