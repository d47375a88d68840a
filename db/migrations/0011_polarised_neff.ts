import type { MigrationContext } from '../migrator';

// A set measured in polarised light (s and p files) gives s and p light effective indices of their own
// (lib/engine/neff.ts fitPolarisedIndices); the cone then averages the two (docs/model.md §Polarised sets).
// Both or neither, each where thin films can be (1–4). Like n_eff, they are derived numbers of a verified
// revision and never change; so does the dCWL/dT fitted in 0006, which the guard of 0005 did not list.
const up = `
ALTER TABLE curves ADD COLUMN n_eff_s double precision CHECK (n_eff_s BETWEEN 1 AND 4);
ALTER TABLE curves ADD COLUMN n_eff_p double precision CHECK (n_eff_p BETWEEN 1 AND 4);
ALTER TABLE curves ADD CONSTRAINT curves_n_eff_sp_pair CHECK ((n_eff_s IS NULL) = (n_eff_p IS NULL));

CREATE FUNCTION curves_guard_fitted() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  owner_role oid := (SELECT relowner FROM pg_class WHERE oid = TG_RELID);
BEGIN
  IF OLD.verified_at IS NULL AND OLD.status <> 'verified' THEN
    RETURN NEW;
  END IF;
  IF current_setting('bandcone.maintenance', true) = 'on' AND pg_has_role(current_user, owner_role, 'MEMBER') THEN
    RETURN NEW;
  END IF;
  IF (NEW.n_eff_s, NEW.n_eff_p, NEW.temp_coeff_nm_per_c) IS DISTINCT FROM (OLD.n_eff_s, OLD.n_eff_p, OLD.temp_coeff_nm_per_c) THEN
    RAISE EXCEPTION 'curve % was verified: its fitted indices and temperature coefficient never change (submit a revision)', OLD.id
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END $$;

CREATE TRIGGER curves_guard_fitted BEFORE UPDATE ON curves
  FOR EACH ROW EXECUTE FUNCTION curves_guard_fitted();
`;

const down = `
DROP TRIGGER IF EXISTS curves_guard_fitted ON curves;
DROP FUNCTION IF EXISTS curves_guard_fitted();
ALTER TABLE curves DROP CONSTRAINT IF EXISTS curves_n_eff_sp_pair;
ALTER TABLE curves DROP COLUMN IF EXISTS n_eff_p;
ALTER TABLE curves DROP COLUMN IF EXISTS n_eff_s;
`;

const migration = {
  name: '0011_polarised_neff',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};

export default migration;
