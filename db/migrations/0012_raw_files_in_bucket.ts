import type { MigrationContext } from '../migrator';

// Raw files move from the database to an S3-compatible bucket (lib/storage/), keyed
// `raw/<sha256>`; the row keeps the hash, size, name and media type.
//
// 1. submission_files.content may be NULL: NULL means "in the bucket at raw/<sha256>". A
//    migration cannot count on reaching the bucket, so moving the old bytes is a script of
//    its own, run by start.sh and test.sh right after the migrations (scripts/move-raw-files.ts,
//    `npm run storage:move-raw`): it stores each file in the bucket, checks the stored copy's
//    hash, then empties the column. Until it has run, a file is served from the column.
// 2. The guard of migration 0005 stays as strict where it matters: the hash and size of a raw
//    file never change (they name its object, so a verified curve's file cannot be swapped),
//    and its bytes may only leave the row, never change, and only by the schema owner (the
//    move script); the app role can do neither.
// 3. upload_stages: what a signed-in contributor announced before a browser PUT a file to a
//    staging key of the bucket (POST /api/uploads/presign); a submission takes it, a sweep
//    drops what nobody took.
const up = `
ALTER TABLE submission_files ALTER COLUMN content DROP NOT NULL;
ALTER TABLE submission_files ADD COLUMN media_type text NOT NULL DEFAULT 'text/plain' CHECK (length(media_type) <= 200);

CREATE OR REPLACE FUNCTION submission_files_guard() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  owner_role oid := (SELECT relowner FROM pg_class WHERE oid = TG_RELID);
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF EXISTS (SELECT 1 FROM curves WHERE file_id = OLD.id AND (verified_at IS NOT NULL OR status = 'verified')) THEN
      RAISE EXCEPTION 'file % holds a verified curve: it is never deleted', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    RETURN OLD;
  END IF;
  IF (NEW.sha256, NEW.size_bytes) IS DISTINCT FROM (OLD.sha256, OLD.size_bytes) THEN
    RAISE EXCEPTION 'file % is kept exactly as uploaded: its bytes and hash never change', OLD.id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NEW.content IS DISTINCT FROM OLD.content
     AND NOT (NEW.content IS NULL AND pg_has_role(current_user, owner_role, 'MEMBER')) THEN
    RAISE EXCEPTION 'file % is kept exactly as uploaded: its bytes only ever move to the file store, by the owner', OLD.id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;

CREATE TABLE upload_stages (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  original_name text NOT NULL CHECK (length(original_name) BETWEEN 1 AND 255),
  size_bytes integer NOT NULL CHECK (size_bytes > 0 AND size_bytes <= 5242880),
  sha256 text NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
  media_type text NOT NULL DEFAULT 'text/plain' CHECK (length(media_type) <= 200),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX upload_stages_user_idx ON upload_stages (user_id);
CREATE INDEX upload_stages_created_idx ON upload_stages (created_at);
`;

// Back to 0005's guard; the column becomes NOT NULL again only if every file is back in it.
const down = `
DROP TABLE IF EXISTS upload_stages;
CREATE OR REPLACE FUNCTION submission_files_guard() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF EXISTS (SELECT 1 FROM curves WHERE file_id = OLD.id AND (verified_at IS NOT NULL OR status = 'verified')) THEN
      RAISE EXCEPTION 'file % holds a verified curve: it is never deleted', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    RETURN OLD;
  END IF;
  IF (NEW.content, NEW.sha256, NEW.size_bytes) IS DISTINCT FROM (OLD.content, OLD.sha256, OLD.size_bytes) THEN
    RAISE EXCEPTION 'file % is kept exactly as uploaded: its bytes and hash never change', OLD.id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;
ALTER TABLE submission_files DROP COLUMN IF EXISTS media_type;
DO $$ BEGIN
  IF EXISTS (SELECT 1 FROM submission_files WHERE content IS NULL) THEN
    RAISE EXCEPTION 'some raw files live only in the file store; copy them back into submission_files.content before undoing 0012';
  END IF;
END $$;
ALTER TABLE submission_files ALTER COLUMN content SET NOT NULL;
`;

export default {
  name: '0012_raw_files_in_bucket',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
