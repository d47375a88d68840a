import type { MigrationContext } from '../migrator';

// The coating type declared on upload (hard/sputtered, soft/evaporated, unknown) decides the default
// temperature coefficient (lib/engine/temperature.ts). It travels inside `method` like the rest of the
// test method, so nothing that writes curves changes; the column below reads it out for search and
// refuses anything but the three values. `temp_coeff_nm_per_c` holds a dCWL/dT fitted from curves of one
// unit measured at several temperatures, when there is such a set.
const up = `
ALTER TABLE curves ADD CONSTRAINT curves_method_coating CHECK (
  method->>'coating' IS NULL OR method->>'coating' IN ('hard', 'soft', 'unknown')
);
ALTER TABLE curves ADD COLUMN coating text GENERATED ALWAYS AS (COALESCE(method->>'coating', 'unknown')) STORED;
ALTER TABLE curves ADD COLUMN temp_coeff_nm_per_c double precision CHECK (temp_coeff_nm_per_c IS NULL OR abs(temp_coeff_nm_per_c) <= 1);
`;

const down = `
ALTER TABLE curves DROP COLUMN IF EXISTS temp_coeff_nm_per_c;
ALTER TABLE curves DROP COLUMN IF EXISTS coating;
ALTER TABLE curves DROP CONSTRAINT IF EXISTS curves_method_coating;
`;

const migration = {
  name: '0006_coating',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};

export default migration;
