import type { MigrationContext } from '../migrator';

// What a curve page reads besides the curve, made cheap at 100 000 curves (measured with
// EXPLAIN ANALYZE on the scale database: the revision chain took 96 ms, the unit spread 18 ms):
// - the revision chain follows replaces_curve_id forwards, which without an index reads every curve;
// - the unit spread reads the normal-incidence verified units of one label: a covering index
//   answers it without touching the wide curve rows.
// JIT compilation is also switched off for the database: the app runs short statements, whose
// plans on large tables crossed JIT's cost threshold and spent ~10 ms compiling each time.
const up = `
CREATE INDEX curves_replaces_idx ON curves (replaces_curve_id) WHERE replaces_curve_id IS NOT NULL;
CREATE INDEX curves_label_units_idx ON curves (label, id) INCLUDE (cwl_nm, fwhm_nm) WHERE status = 'verified' AND aoi_deg = 0;
DO $$ BEGIN EXECUTE format('ALTER DATABASE %I SET jit = off', current_database()); END $$;
`;

const down = `
DO $$ BEGIN EXECUTE format('ALTER DATABASE %I RESET jit', current_database()); END $$;
DROP INDEX IF EXISTS curves_label_units_idx;
DROP INDEX IF EXISTS curves_replaces_idx;
`;

export default {
  name: '0010_curve_page_reads',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
