import type { MigrationContext } from '../migrator';

// A number that changes whenever a committed transaction has touched the curves or their
// fitness rows, so a server process holding a copy of the catalogue in memory
// (lib/catalogue/memory-index.ts) can tell, in one cheap read, whether its copy still holds.
// The bump runs as a deferred trigger, i.e. at commit, once per transaction: the row lock it
// takes is held only while that transaction commits, so writers never wait on each other
// for the whole of their work and cannot deadlock over it.
const up = `
CREATE TABLE catalogue_version (
  only_row boolean PRIMARY KEY DEFAULT true CHECK (only_row),
  version bigint NOT NULL
);
INSERT INTO catalogue_version (only_row, version) VALUES (true, 1);

CREATE FUNCTION catalogue_version_bump() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF current_setting('bandcone.catalogue_bumped', true) = txid_current()::text THEN
    RETURN NULL;
  END IF;
  PERFORM set_config('bandcone.catalogue_bumped', txid_current()::text, true);
  UPDATE catalogue_version SET version = version + 1;
  RETURN NULL;
END $$;

CREATE CONSTRAINT TRIGGER curves_catalogue_version AFTER INSERT OR UPDATE OR DELETE ON curves
  DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION catalogue_version_bump();
CREATE CONSTRAINT TRIGGER curve_fitness_catalogue_version AFTER INSERT OR UPDATE OR DELETE ON curve_fitness
  DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION catalogue_version_bump();
CREATE CONSTRAINT TRIGGER curve_fitness_fine_catalogue_version AFTER INSERT OR UPDATE OR DELETE ON curve_fitness_fine
  DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION catalogue_version_bump();
`;

const down = `
DROP TRIGGER IF EXISTS curve_fitness_fine_catalogue_version ON curve_fitness_fine;
DROP TRIGGER IF EXISTS curve_fitness_catalogue_version ON curve_fitness;
DROP TRIGGER IF EXISTS curves_catalogue_version ON curves;
DROP FUNCTION IF EXISTS catalogue_version_bump();
DROP TABLE IF EXISTS catalogue_version;
`;

export default {
  name: '0003_catalogue_version',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
