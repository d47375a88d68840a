import type { MigrationContext } from '../migrator';

// One catalogue row per unit (lib/catalogue/units.ts): a search keeps a curve of a set only when
// no member of the same set, revision and status was measured at a lower angle (or the same angle
// with a lower id). This index answers that question from the index alone, for each candidate row,
// instead of reading every curve.
const up = `
CREATE INDEX curves_unit_set_idx ON curves (set_key, revision, status, aoi_deg, id) WHERE set_key IS NOT NULL;
`;

const down = `
DROP INDEX IF EXISTS curves_unit_set_idx;
`;

export default {
  name: '0011_catalogue_units',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
