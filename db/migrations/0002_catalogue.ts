import type { MigrationContext } from '../migrator';
import { backfillDerived } from '../../lib/catalogue/derived-store';

// What the catalogue search needs beside the curves themselves.
const up = `
-- Per verified curve, target line and resolution level: running sums of the mean T over
-- short intervals redward of the line (lib/catalogue/fitness-grid.ts). A search reads one
-- level, so the fitness filter is a weighted sum of a few numbers in a narrow row.
CREATE TABLE curve_fitness (
  curve_id integer NOT NULL REFERENCES curves(id) ON DELETE CASCADE,
  line_id text NOT NULL,
  level smallint NOT NULL CHECK (level BETWEEN 0 AND 3),
  -- the curve's first line: the target of a fitness search that names no line
  primary_line boolean NOT NULL DEFAULT false,
  n_eff_default double precision NOT NULL CHECK (n_eff_default BETWEEN 1 AND 4),
  direct integer[] NOT NULL,
  canonical integer[],
  PRIMARY KEY (line_id, level, curve_id)
);

-- Off-normal measurements only: one fine level, for searches that name their own n_eff.
CREATE TABLE curve_fitness_fine (
  curve_id integer NOT NULL REFERENCES curves(id) ON DELETE CASCADE,
  line_id text NOT NULL,
  fine integer[] NOT NULL,
  PRIMARY KEY (curve_id, line_id)
);

-- A passband thumbnail of at most 60 points, so a page of results never reads whole curves.
CREATE TABLE curve_sparklines (
  curve_id integer PRIMARY KEY REFERENCES curves(id) ON DELETE CASCADE,
  wavelength_nm real[] NOT NULL,
  transmission real[] NOT NULL,
  CHECK (cardinality(wavelength_nm) = cardinality(transmission) AND cardinality(wavelength_nm) <= 60)
);

-- Parametric filters and sorts over the public catalogue.
-- Sorted scans for the CWL, FWHM and peak sorts (either direction), carrying the filter columns
-- so a sorted page stops after its rows instead of sorting the whole catalogue.
CREATE INDEX curves_verified_cwl_idx ON curves (cwl_nm, id) INCLUDE (lines, instrument, fwhm_nm, peak_t, aoi_deg, contributor_id)
  WHERE status = 'verified';
CREATE INDEX curves_verified_fwhm_idx ON curves (fwhm_nm, id) INCLUDE (lines, instrument, cwl_nm, peak_t, aoi_deg, contributor_id)
  WHERE status = 'verified';
CREATE INDEX curves_verified_peak_idx ON curves (peak_t, id) INCLUDE (lines, instrument, cwl_nm, fwhm_nm, aoi_deg, contributor_id)
  WHERE status = 'verified';
-- Covers every filter, facet and sort column, so a search without words reads this
-- index alone (an index-only scan) instead of the wide curve rows.
CREATE INDEX curves_catalogue_idx ON curves (status, verified_at DESC NULLS LAST, id DESC)
  INCLUDE (lines, instrument, cwl_nm, fwhm_nm, peak_t, aoi_deg, contributor_id, created_at);
CREATE INDEX curves_contributor_idx ON curves (contributor_id);
-- The few off-normal measurements, which a search naming its own n_eff sums outside SQL.
CREATE INDEX curves_off_normal_idx ON curves (id) WHERE status = 'verified' AND aoi_deg > 0;

-- Line ids become the words people type: "H-alpha", "hydrogen alpha", "O3", "sulfur".
CREATE FUNCTION curve_line_words(ids text[]) RETURNS text LANGUAGE sql IMMUTABLE AS $$
  SELECT coalesce(string_agg(CASE id
    WHEN 'Ha' THEN 'Ha Hα H-alpha Halpha hydrogen alpha'
    WHEN 'Hb' THEN 'Hb Hβ H-beta Hbeta hydrogen beta'
    WHEN 'Hg' THEN 'Hg Hγ H-gamma Hgamma hydrogen gamma'
    WHEN 'OIII' THEN 'OIII O3 O-III doubly ionised oxygen'
    WHEN 'OIII-496' THEN 'OIII O3 O-III doubly ionised oxygen'
    WHEN 'NII-658' THEN 'NII N2 N-II ionised nitrogen'
    WHEN 'NII-655' THEN 'NII N2 N-II ionised nitrogen'
    WHEN 'SII-671' THEN 'SII S2 S-II ionised sulphur sulfur'
    WHEN 'SII-673' THEN 'SII S2 S-II ionised sulphur sulfur'
    WHEN 'HeII' THEN 'HeII He-II ionised helium'
    WHEN 'OI' THEN 'OI O-I neutral oxygen'
    WHEN 'ArIII' THEN 'ArIII Ar-III argon'
    WHEN 'OII' THEN 'OII O2 O-II ionised oxygen'
    ELSE id END, ' '), '')
  FROM unnest(ids) AS id
$$;

CREATE OR REPLACE FUNCTION curves_search_refresh() RETURNS trigger AS $$
BEGIN
  NEW.search :=
    setweight(to_tsvector('english', coalesce(NEW.label, '') || ' ' || coalesce(NEW.maker, '')), 'A') ||
    setweight(to_tsvector('english',
      curve_line_words(NEW.lines) || ' ' || coalesce(NEW.instrument, '') || ' ' ||
      coalesce(NEW.lab, '') || ' ' || coalesce(NEW.method->>'beam', '')), 'B') ||
    setweight(to_tsvector('english', coalesce(NEW.serial, '')), 'C') ||
    setweight(to_tsvector('english', coalesce(NEW.notes, '')), 'D');
  RETURN NEW;
END
$$ LANGUAGE plpgsql;
UPDATE curves SET lines = lines;
`;

const down = `
CREATE OR REPLACE FUNCTION curves_search_refresh() RETURNS trigger AS $$
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
DROP FUNCTION IF EXISTS curve_line_words(text[]);
UPDATE curves SET lines = lines;
DROP INDEX IF EXISTS curves_off_normal_idx, curves_contributor_idx, curves_catalogue_idx, curves_verified_peak_idx, curves_verified_fwhm_idx, curves_verified_cwl_idx;
DROP TABLE IF EXISTS curve_sparklines, curve_fitness_fine, curve_fitness;
`;

export default {
  name: '0002_catalogue',
  up: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(up);
    // a library verified before this migration gets its grid and sparklines now
    await backfillDerived(sequelize);
  },
  down: async ({ sequelize }: MigrationContext) => {
    await sequelize.query(down);
  },
};
