import type { MigrationContext } from '../migrator';

// Raw SQL keeps the constraints and triggers exactly as PostgreSQL will enforce them.
const up = `
CREATE EXTENSION IF NOT EXISTS pgcrypto;

CREATE TABLE users (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  name text,
  email text NOT NULL,
  email_verified timestamptz,
  image text,
  password_hash text,
  role text NOT NULL DEFAULT 'contributor' CHECK (role IN ('contributor', 'moderator', 'admin')),
  disabled_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (email = lower(email) AND position('@' in email) > 1)
);
CREATE UNIQUE INDEX users_email_key ON users (email);

CREATE TABLE accounts (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  type text NOT NULL,
  provider text NOT NULL,
  provider_account_id text NOT NULL,
  refresh_token text, access_token text, expires_at integer, token_type text,
  scope text, id_token text, session_state text,
  UNIQUE (provider, provider_account_id)
);

CREATE TABLE sessions (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  session_token text NOT NULL UNIQUE,
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  expires timestamptz NOT NULL
);

CREATE TABLE verification_tokens (
  token text PRIMARY KEY,
  identifier text NOT NULL,
  expires timestamptz NOT NULL
);

-- Tokens for confirming an address and resetting a password; only the hash is stored.
CREATE TABLE user_tokens (
  id serial PRIMARY KEY,
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  purpose text NOT NULL CHECK (purpose IN ('confirm_email', 'reset_password')),
  token_hash text NOT NULL UNIQUE,
  expires_at timestamptz NOT NULL,
  used_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE api_tokens (
  id serial PRIMARY KEY,
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  name text NOT NULL CHECK (length(name) BETWEEN 1 AND 100),
  token_hash text NOT NULL UNIQUE,
  token_prefix text NOT NULL,
  last_used_at timestamptz,
  revoked_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX api_tokens_user_idx ON api_tokens (user_id);

CREATE TABLE optics (
  id serial PRIMARY KEY,
  owner_id uuid REFERENCES users(id) ON DELETE CASCADE,
  is_example boolean NOT NULL DEFAULT false,
  name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
  description text,
  aperture_mm double precision CHECK (aperture_mm > 0),
  focal_length_mm double precision CHECK (focal_length_mm > 0),
  obstruction_mm double precision CHECK (obstruction_mm >= 0),
  reducer_factor double precision CHECK (reducer_factor > 0),
  f_number double precision NOT NULL CHECK (f_number BETWEEN 0.5 AND 40),
  obstruction double precision NOT NULL DEFAULT 0 CHECK (obstruction >= 0 AND obstruction <= 0.9),
  field_angle_deg double precision NOT NULL DEFAULT 0 CHECK (field_angle_deg BETWEEN 0 AND 30),
  sensor_diagonal_mm double precision CHECK (sensor_diagonal_mm > 0),
  exit_pupil_distance_mm double precision CHECK (exit_pupil_distance_mm > 0),
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (is_example OR owner_id IS NOT NULL)
);

CREATE TABLE submissions (
  id serial PRIMARY KEY,
  contributor_id uuid NOT NULL REFERENCES users(id),
  status text NOT NULL DEFAULT 'submitted'
    CHECK (status IN ('submitted', 'changes_requested', 'verified', 'rejected')),
  revision integer NOT NULL DEFAULT 1 CHECK (revision >= 1),
  label text NOT NULL,
  lines text[] NOT NULL DEFAULT '{}',
  metadata jsonb NOT NULL,
  checks jsonb NOT NULL DEFAULT '[]',
  check_level text NOT NULL DEFAULT 'info' CHECK (check_level IN ('info', 'warn', 'error')),
  replaces_curve_id integer,
  decided_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX submissions_status_idx ON submissions (status, created_at);
CREATE INDEX submissions_contributor_idx ON submissions (contributor_id);

CREATE TABLE submission_files (
  id serial PRIMARY KEY,
  submission_id integer NOT NULL REFERENCES submissions(id) ON DELETE CASCADE,
  revision integer NOT NULL DEFAULT 1,
  original_name text NOT NULL,
  size_bytes integer NOT NULL CHECK (size_bytes >= 0 AND size_bytes <= 5242880),
  sha256 text NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
  content bytea NOT NULL,
  aoi_deg double precision NOT NULL DEFAULT 0 CHECK (aoi_deg >= 0 AND aoi_deg < 90),
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (octet_length(content) = size_bytes)
);
CREATE INDEX submission_files_submission_idx ON submission_files (submission_id);

CREATE TABLE curves (
  id serial PRIMARY KEY,
  submission_id integer REFERENCES submissions(id),
  file_id integer REFERENCES submission_files(id),
  contributor_id uuid NOT NULL REFERENCES users(id),
  status text NOT NULL CHECK (status IN ('submitted', 'changes_requested', 'verified', 'rejected', 'superseded')),
  set_key text,
  revision integer NOT NULL DEFAULT 1 CHECK (revision >= 1),
  replaces_curve_id integer REFERENCES curves(id),
  label text NOT NULL CHECK (length(label) BETWEEN 1 AND 200),
  maker text,
  lines text[] NOT NULL DEFAULT '{}',
  nominal_cwl_nm double precision CHECK (nominal_cwl_nm > 0),
  nominal_fwhm_nm double precision CHECK (nominal_fwhm_nm > 0),
  declared_pre_shift_nm double precision,
  serial text,
  size_mm text,
  notes text,
  licence text NOT NULL DEFAULT 'CC-BY-4.0' CHECK (licence IN ('CC-BY-4.0', 'CC0-1.0')),
  method jsonb NOT NULL,
  instrument text NOT NULL CHECK (instrument IN ('spectrophotometer', 'spectrograph', 'monochromator', 'other')),
  aoi_deg double precision NOT NULL DEFAULT 0 CHECK (aoi_deg >= 0 AND aoi_deg < 90),
  lab text,
  measured_on date,
  wavelength_nm double precision[] NOT NULL,
  transmission double precision[] NOT NULL,
  point_count integer NOT NULL CHECK (point_count >= 5),
  points_hash text NOT NULL,
  peak_t double precision NOT NULL CHECK (peak_t >= 0),
  cwl_nm double precision,
  fwhm_nm double precision CHECK (fwhm_nm > 0),
  mean_in_band_t double precision,
  effective_bandwidth_nm double precision,
  blocking_od double precision,
  line_transmission jsonb NOT NULL DEFAULT '{}',
  n_eff double precision CHECK (n_eff BETWEEN 1 AND 4),
  search tsvector,
  verified_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (cardinality(wavelength_nm) = point_count AND cardinality(transmission) = point_count),
  CHECK (0 < ALL (wavelength_nm)),
  CHECK (0 <= ALL (transmission))
);
CREATE INDEX curves_status_idx ON curves (status);
CREATE INDEX curves_submission_idx ON curves (submission_id);
CREATE INDEX curves_points_hash_idx ON curves (points_hash);
CREATE INDEX curves_search_idx ON curves USING gin (search);
CREATE INDEX curves_lines_idx ON curves USING gin (lines);
CREATE INDEX curves_label_idx ON curves (label);

ALTER TABLE submissions ADD CONSTRAINT submissions_replaces_fk FOREIGN KEY (replaces_curve_id) REFERENCES curves(id);

-- Label and maker weigh most, then lines and method, then notes.
CREATE FUNCTION curves_search_refresh() RETURNS trigger AS $$
BEGIN
  NEW.search :=
    setweight(to_tsvector('english', coalesce(NEW.label, '') || ' ' || coalesce(NEW.maker, '')), 'A') ||
    setweight(to_tsvector('english',
      array_to_string(NEW.lines, ' ') || ' ' || coalesce(NEW.instrument, '') || ' ' ||
      coalesce(NEW.lab, '') || ' ' || coalesce(NEW.method->>'beam', '')), 'B') ||
    setweight(to_tsvector('english', coalesce(NEW.serial, '')), 'C') ||
    setweight(to_tsvector('english', coalesce(NEW.notes, '')), 'D');
  RETURN NEW;
END
$$ LANGUAGE plpgsql;
CREATE TRIGGER curves_search_trigger BEFORE INSERT OR UPDATE OF label, maker, lines, instrument, lab, method, serial, notes
  ON curves FOR EACH ROW EXECUTE FUNCTION curves_search_refresh();

CREATE TABLE reviews (
  id serial PRIMARY KEY,
  submission_id integer NOT NULL REFERENCES submissions(id) ON DELETE CASCADE,
  author_id uuid NOT NULL REFERENCES users(id),
  kind text NOT NULL CHECK (kind IN ('verify', 'request_changes', 'reject', 'note', 'reply')),
  body text NOT NULL DEFAULT '',
  is_public boolean NOT NULL DEFAULT false,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX reviews_submission_idx ON reviews (submission_id, created_at);

CREATE TABLE audit_events (
  id bigserial PRIMARY KEY,
  actor_id uuid REFERENCES users(id),
  action text NOT NULL,
  target_type text,
  target_id text,
  detail jsonb NOT NULL DEFAULT '{}',
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX audit_events_created_idx ON audit_events (created_at DESC);

CREATE TABLE mail_messages (
  id serial PRIMARY KEY,
  envelope_from text,
  envelope_to text[] NOT NULL,
  subject text,
  text_body text,
  raw text NOT NULL,
  received_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX mail_messages_to_idx ON mail_messages USING gin (envelope_to);

CREATE TABLE rate_limit_hits (
  id bigserial PRIMARY KEY,
  bucket text NOT NULL,
  hit_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX rate_limit_hits_bucket_idx ON rate_limit_hits (bucket, hit_at);
`;

const down = `
DROP TABLE IF EXISTS rate_limit_hits, mail_messages, audit_events, reviews CASCADE;
ALTER TABLE IF EXISTS submissions DROP CONSTRAINT IF EXISTS submissions_replaces_fk;
DROP TABLE IF EXISTS curves CASCADE;
DROP FUNCTION IF EXISTS curves_search_refresh();
DROP TABLE IF EXISTS submission_files, submissions, optics, api_tokens, user_tokens,
  verification_tokens, sessions, accounts, users CASCADE;
`;

export default {
  name: '0001_foundation',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
