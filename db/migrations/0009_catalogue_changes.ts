import type { MigrationContext } from '../migrator';

// Which curves each catalogue version changed, so a server holding the in-process copy
// (lib/catalogue/memory-index.ts) can bring it up to date by reading those curves alone
// instead of the whole library. The bump function of 0003 now also records the curve of
// every row it fires for, under the version its transaction commits as. Versions are
// taken in commit order (the bump's row lock is held until commit), so "every change with
// a version above mine" is exactly what a copy of an older version is missing.
// The log keeps the last 20 000 versions; a copy older than that is read again whole.
const up = `
CREATE TABLE catalogue_changes (
  version bigint NOT NULL,
  curve_id integer NOT NULL,
  PRIMARY KEY (version, curve_id)
);

CREATE OR REPLACE FUNCTION catalogue_version_bump() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  v bigint;
  changed integer;
BEGIN
  IF current_setting('bandcone.catalogue_bumped', true) = txid_current()::text THEN
    v := current_setting('bandcone.catalogue_new_version')::bigint;
  ELSE
    UPDATE catalogue_version SET version = version + 1 RETURNING version INTO v;
    PERFORM set_config('bandcone.catalogue_bumped', txid_current()::text, true);
    PERFORM set_config('bandcone.catalogue_new_version', v::text, true);
    IF v % 1000 = 0 THEN
      DELETE FROM catalogue_changes WHERE version <= v - 20000;
    END IF;
  END IF;
  IF TG_TABLE_NAME = 'curves' THEN
    IF TG_OP = 'DELETE' THEN changed := OLD.id; ELSE changed := NEW.id; END IF;
  ELSE
    IF TG_OP = 'DELETE' THEN changed := OLD.curve_id; ELSE changed := NEW.curve_id; END IF;
  END IF;
  INSERT INTO catalogue_changes (version, curve_id) VALUES (v, changed) ON CONFLICT DO NOTHING;
  RETURN NULL;
END $$;
`;

const down = `
CREATE OR REPLACE FUNCTION catalogue_version_bump() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF current_setting('bandcone.catalogue_bumped', true) = txid_current()::text THEN
    RETURN NULL;
  END IF;
  PERFORM set_config('bandcone.catalogue_bumped', txid_current()::text, true);
  UPDATE catalogue_version SET version = version + 1;
  RETURN NULL;
END $$;
DROP TABLE IF EXISTS catalogue_changes;
`;

export default {
  name: '0009_catalogue_changes',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
