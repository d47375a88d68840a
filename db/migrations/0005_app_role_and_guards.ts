import type { MigrationContext } from '../migrator';

// Least privilege, and data that stays as it was verified.
//
// 1. The serving app connects as its own role, bandcone_app: it may read and write rows,
//    never change the schema (no CREATE on any schema, owns nothing, not a superuser).
//    Migrations, seeds and tests connect as the owner (DATABASE_URL); the app as
//    bandcone_app (APP_DATABASE_URL). scripts/start.sh and scripts/test.sh create the role
//    with LOGIN and a password, then call bandcone_grant_app() below on every run, so the
//    grants also reach a role made after this migration. Tables created later by the owner
//    are granted through ALTER DEFAULT PRIVILEGES. Every other schema that exists when the
//    grants run (e.g. the job queue's `pgboss`, whichever migration made it) is granted too.
//
// 2. Triggers refuse, for every role, any change to what a verified curve says: its
//    points, raw-file hash, method, derived numbers, licence and attribution; and any
//    UPDATE or DELETE of the audit trail. What the workflow does stays allowed: a verified
//    curve becoming `superseded` by its revision (or `withdrawn`, a tombstone that keeps
//    the row), the catalogue version bump, the fitness grid rows, updated_at.
//    The owner alone may lift the curve guard inside one transaction for deliberate
//    maintenance (SET LOCAL bandcone.maintenance = 'on'); the app role is not the owner,
//    so the setting does nothing for it. The audit guard has no such door.
const up = `
DO $$
BEGIN
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'bandcone_app') THEN
    -- NOLOGIN until the start or test script gives it a password.
    CREATE ROLE bandcone_app NOLOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOINHERIT NOREPLICATION NOBYPASSRLS;
  END IF;
EXCEPTION WHEN insufficient_privilege THEN
  RAISE NOTICE 'cannot create role bandcone_app here; create it, then run SELECT bandcone_grant_app()';
END $$;

CREATE OR REPLACE FUNCTION bandcone_grant_app() RETURNS void LANGUAGE plpgsql AS $fn$
DECLARE
  s text;
BEGIN
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'bandcone_app') THEN
    RAISE NOTICE 'role bandcone_app does not exist; nothing granted';
    RETURN;
  END IF;
  EXECUTE format('GRANT CONNECT, TEMPORARY ON DATABASE %I TO bandcone_app', current_database());
  FOR s IN
    SELECT nspname FROM pg_namespace
    WHERE nspname NOT LIKE 'pg\\_%' AND nspname <> 'information_schema'
  LOOP
    -- USAGE only: bandcone_app never gets CREATE on a schema, so it cannot make or alter tables.
    EXECUTE format('GRANT USAGE ON SCHEMA %I TO bandcone_app', s);
    EXECUTE format('GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA %I TO bandcone_app', s);
    EXECUTE format('GRANT USAGE, SELECT, UPDATE ON ALL SEQUENCES IN SCHEMA %I TO bandcone_app', s);
    EXECUTE format('GRANT EXECUTE ON ALL FUNCTIONS IN SCHEMA %I TO bandcone_app', s);
    EXECUTE format('ALTER DEFAULT PRIVILEGES IN SCHEMA %I GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO bandcone_app', s);
    EXECUTE format('ALTER DEFAULT PRIVILEGES IN SCHEMA %I GRANT USAGE, SELECT, UPDATE ON SEQUENCES TO bandcone_app', s);
    EXECUTE format('ALTER DEFAULT PRIVILEGES IN SCHEMA %I GRANT EXECUTE ON FUNCTIONS TO bandcone_app', s);
  END LOOP;
  -- The audit trail and the migration ledger: the app adds audit rows and reads both, nothing more.
  IF to_regclass('public.audit_events') IS NOT NULL THEN
    REVOKE UPDATE, DELETE, TRUNCATE ON public.audit_events FROM bandcone_app;
  END IF;
  IF to_regclass('public.schema_migrations') IS NOT NULL THEN
    REVOKE INSERT, UPDATE, DELETE, TRUNCATE ON public.schema_migrations FROM bandcone_app;
  END IF;
END $fn$;

SELECT bandcone_grant_app();

CREATE FUNCTION curves_guard_verified() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  owner_role oid := (SELECT relowner FROM pg_class WHERE oid = TG_RELID);
BEGIN
  -- Only rows that were once verified are guarded; drafts change freely.
  IF OLD.verified_at IS NULL AND OLD.status <> 'verified' THEN
    RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
  END IF;
  IF current_setting('bandcone.maintenance', true) = 'on' AND pg_has_role(current_user, owner_role, 'MEMBER') THEN
    RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
  END IF;
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'curve % was verified: it is never deleted (withdraw it, which keeps a tombstone)', OLD.id
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF (NEW.wavelength_nm, NEW.transmission, NEW.point_count, NEW.points_hash,
      NEW.file_id, NEW.submission_id,
      NEW.method, NEW.instrument, NEW.aoi_deg, NEW.lab, NEW.measured_on,
      NEW.peak_t, NEW.cwl_nm, NEW.fwhm_nm, NEW.mean_in_band_t, NEW.effective_bandwidth_nm, NEW.blocking_od,
      NEW.line_transmission, NEW.n_eff,
      NEW.licence, NEW.contributor_id, NEW.label, NEW.maker, NEW.serial, NEW.revision, NEW.replaces_curve_id, NEW.verified_at)
     IS DISTINCT FROM
     (OLD.wavelength_nm, OLD.transmission, OLD.point_count, OLD.points_hash,
      OLD.file_id, OLD.submission_id,
      OLD.method, OLD.instrument, OLD.aoi_deg, OLD.lab, OLD.measured_on,
      OLD.peak_t, OLD.cwl_nm, OLD.fwhm_nm, OLD.mean_in_band_t, OLD.effective_bandwidth_nm, OLD.blocking_od,
      OLD.line_transmission, OLD.n_eff,
      OLD.licence, OLD.contributor_id, OLD.label, OLD.maker, OLD.serial, OLD.revision, OLD.replaces_curve_id, OLD.verified_at)
  THEN
    RAISE EXCEPTION 'curve % was verified: its points, file, method, derived numbers, licence and attribution never change (submit a revision)', OLD.id
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NEW.status IS DISTINCT FROM OLD.status
     AND NOT (OLD.status = 'verified' AND NEW.status IN ('superseded', 'withdrawn')) THEN
    RAISE EXCEPTION 'curve % cannot go from % to %: a verified curve is only superseded or withdrawn', OLD.id, OLD.status, NEW.status
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;

CREATE TRIGGER curves_guard_verified BEFORE UPDATE OR DELETE ON curves
  FOR EACH ROW EXECUTE FUNCTION curves_guard_verified();

-- The raw file behind a curve: its bytes and hash are written once.
CREATE FUNCTION submission_files_guard() RETURNS trigger LANGUAGE plpgsql AS $$
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

CREATE TRIGGER submission_files_guard BEFORE UPDATE OR DELETE ON submission_files
  FOR EACH ROW EXECUTE FUNCTION submission_files_guard();

CREATE FUNCTION audit_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'the audit trail is append-only: % refused', TG_OP USING ERRCODE = 'insufficient_privilege';
END $$;

CREATE TRIGGER audit_events_append_only BEFORE UPDATE OR DELETE ON audit_events
  FOR EACH ROW EXECUTE FUNCTION audit_events_append_only();
CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events
  FOR EACH STATEMENT EXECUTE FUNCTION audit_events_append_only();
`;

const down = `
DROP TRIGGER IF EXISTS audit_events_no_truncate ON audit_events;
DROP TRIGGER IF EXISTS audit_events_append_only ON audit_events;
DROP FUNCTION IF EXISTS audit_events_append_only();
DROP TRIGGER IF EXISTS submission_files_guard ON submission_files;
DROP FUNCTION IF EXISTS submission_files_guard();
DROP TRIGGER IF EXISTS curves_guard_verified ON curves;
DROP FUNCTION IF EXISTS curves_guard_verified();
DROP FUNCTION IF EXISTS bandcone_grant_app();
`;

export default {
  name: '0005_app_role_and_guards',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
