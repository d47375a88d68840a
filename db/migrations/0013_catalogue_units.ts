import type { MigrationContext } from '../migrator';

// One catalogue row per unit (lib/catalogue/units.ts): a search keeps a curve of a set only when
// no member of the same set, revision and status was measured at a lower angle (or the same angle
// with a lower id). This index answers that question from the index alone, for each candidate row,
// instead of reading every curve.
// The CWL filter and order are at normal incidence: the expression below is the one
// lib/catalogue/units.ts normalCwlSql writes with angleScaleSql (λ0 = λθ / s(θ), n_eff within [1, 4] else 2),
// character for character in meaning, so PostgreSQL matches it; the CWL
// order reads it sorted, carrying the filter columns as curves_verified_cwl_idx does.
const up = `
CREATE INDEX curves_unit_set_idx ON curves (set_key, revision, status, aoi_deg, id) WHERE set_key IS NOT NULL;
CREATE INDEX curves_verified_cwl0_idx ON curves (
  (CASE WHEN aoi_deg > 0 THEN cwl_nm / sqrt(1 - sin(radians(aoi_deg))^2 / ((CASE WHEN n_eff >= 1 AND n_eff <= 4 THEN n_eff ELSE 2 END))^2) ELSE cwl_nm END),
  id
) INCLUDE (lines, instrument, fwhm_nm, peak_t, aoi_deg, contributor_id, set_key, revision) WHERE status = 'verified';
`;

const down = `
DROP INDEX IF EXISTS curves_verified_cwl0_idx;
DROP INDEX IF EXISTS curves_unit_set_idx;
`;

export default {
  name: '0013_catalogue_units',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
