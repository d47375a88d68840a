// Fills a SEPARATE database with generated verified curves for search benchmarks:
//   npm run seed:scale -- --curves 100000 [--database bandcone_scale] [--fresh]
// The database is named by --database, else SCALE_DATABASE, else "bandcone_scale" on the
// server of DATABASE_URL; it refuses to write into DATABASE_URL's own database.
// Re-running tops the library up to --curves (curve i is the same on every run).
// Demo data: invented makers and labs (the demo catalogue), curves generated from a
// multi-cavity passband shape with instrument noise.
import { createHash } from 'node:crypto';
import pg from 'pg';
import { Sequelize, QueryTypes } from 'sequelize';
import { createMigrator } from '@/db/migrator';
import { computeMetrics } from '@/lib/engine/metrics';
import { angleScale } from '@/lib/engine/angles';
import { FILTER_MODELS, LABS, DEMO_NOTICE } from './world/catalogue';
import { multiCavityPassband } from './world/shapes';
import { createRng, type Rng } from './world/prng';
import { deriveRows, writeDerivedRows, arrayLiteral } from '@/lib/catalogue/derived-store';
import type { CurvePoints } from '@/lib/engine/types';

function arg(name: string): string | undefined {
  const i = process.argv.indexOf(`--${name}`);
  if (i >= 0) return process.argv[i + 1];
  const eq = process.argv.find((a) => a.startsWith(`--${name}=`));
  return eq?.slice(name.length + 3);
}

const target = Number(arg('curves') ?? process.env.SCALE_CURVES ?? 10_000);
const BATCH = 500;
const POINTS = 1000;
const CONTRIBUTORS = 40;
const SEED = 20261202;

const WORDS = ['meadow', 'ridge', 'harbour', 'lantern', 'orchard', 'quarry', 'heath', 'beacon', 'copse', 'tarn', 'fell', 'moor', 'causeway', 'spinney', 'weir'];
const INSTRUMENTS = ['spectrophotometer', 'spectrograph', 'monochromator', 'other'] as const;

function urls() {
  const base = process.env.DATABASE_URL;
  if (!base) throw new Error('DATABASE_URL is not set: it names the server the scale database lives on.');
  const u = new URL(base);
  const name = arg('database') ?? process.env.SCALE_DATABASE ?? 'bandcone_scale';
  if (!/^[a-z_][a-z0-9_]{0,62}$/.test(name)) throw new Error(`"${name}" is not a plain database name (lower case, digits, underscores).`);
  if (u.pathname.slice(1) === name) throw new Error(`Refusing to fill ${name}: it is DATABASE_URL's own database. Name a separate one with --database.`);
  const admin = new URL(base);
  admin.pathname = '/postgres';
  const scale = new URL(base);
  scale.pathname = `/${name}`;
  return { name, admin: admin.toString(), scale: scale.toString() };
}

async function ensureDatabase(adminUrl: string, name: string, fresh: boolean) {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    if (fresh) await client.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
    const { rowCount } = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
    if (!rowCount) await client.query(`CREATE DATABASE "${name}"`);
  } finally {
    await client.end();
  }
}

interface Generated {
  id: number;
  contributorId: string;
  label: string;
  maker: string;
  lines: string[];
  nominalCwlNm: number;
  nominalFwhmNm: number;
  declaredPreShiftNm: number | null;
  serial: string;
  notes: string;
  licence: string;
  method: Record<string, unknown>;
  instrument: string;
  aoiDeg: number;
  lab: string;
  measuredOn: string;
  points: CurvePoints;
}

const gauss = (rng: Rng) => {
  const u = Math.max(1e-12, rng.next());
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
};

/** Curve number i, the same on every run. */
function generate(i: number, id: number, contributors: string[]): Generated {
  const rng = createRng((SEED ^ Math.imul(i + 1, 0x9e3779b1)) >>> 0);
  const model = FILTER_MODELS[i % FILTER_MODELS.length];
  const cwlJitter = gauss(rng) * 0.25 + (rng.next() < 0.05 ? gauss(rng) * 1.5 : 0);
  const fwhmScale = 1 + gauss(rng) * 0.04;
  const bands = model.bands.map((b) => ({
    cwlNm: b.cwlNm + cwlJitter,
    fwhmNm: b.fwhmNm * fwhmScale,
    peakT: Math.min(0.99, b.peakT * (1 + gauss(rng) * 0.015)),
    cavities: model.cavities,
  }));
  // about one curve in twenty is measured off-normal, as curve sets are
  const aoiDeg = rng.next() < 0.05 ? [4, 8, 12, 16][rng.int(0, 3)] : 0;
  const nEff = 1.7 + rng.next() * 0.5;
  const s = angleScale(aoiDeg, nEff);
  const shape = multiCavityPassband({
    bands: bands.map((b) => ({ ...b, cwlNm: b.cwlNm * s, fwhmNm: b.fwhmNm * s })),
    rippleAmplitude: 0.005 + rng.next() * 0.015,
    ripplePeriodNm: 0.4 + rng.next() * 1.5,
    ripplePhase: rng.next() * 6.28,
    blockingFloor: 10 ** -(3 + rng.next() * 2),
  });
  const centres = bands.map((b) => b.cwlNm * s);
  const widest = Math.max(...bands.map((b) => b.fwhmNm));
  const lo = Math.min(...centres) - Math.max(15, 5 * widest);
  const hi = Math.max(...centres) + Math.max(15, 5 * widest);
  const step = (hi - lo) / (POINTS - 1);
  const sigma = 0.001 + rng.next() * 0.003;
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  for (let k = 0; k < POINTS; k++) {
    const x = lo + k * step;
    wavelengthNm.push(Number(x.toFixed(4)));
    transmission.push(Number(Math.max(0, shape(x) + gauss(rng) * sigma).toFixed(5)));
  }
  const instrument = INSTRUMENTS[rng.int(0, 3)];
  const lab = LABS[rng.int(0, LABS.length - 1)].name;
  const serial = `${model.serialPrefix}-${String(20 + (i % 7)).padStart(2, '0')}-${String(i).padStart(6, '0')}`;
  const words = [WORDS[rng.int(0, WORDS.length - 1)], WORDS[rng.int(0, WORDS.length - 1)]];
  const year = 2019 + rng.int(0, 6);
  const measuredOn = `${year}-${String(rng.int(1, 12)).padStart(2, '0')}-${String(rng.int(1, 28)).padStart(2, '0')}`;
  return {
    id,
    contributorId: contributors[i % contributors.length],
    label: model.label,
    maker: model.makerName,
    lines: model.lines,
    nominalCwlNm: model.bands[0].cwlNm,
    nominalFwhmNm: model.bands[0].fwhmNm,
    declaredPreShiftNm: model.declaredPreShiftNm ?? null,
    serial,
    notes: `${model.coating}; measured near the ${words[0]} and the ${words[1]} (scale test data). ${DEMO_NOTICE}`,
    licence: rng.next() < 0.8 ? 'CC-BY-4.0' : 'CC0-1.0',
    method: { instrument, resolutionNm: Number((step * 2).toFixed(3)), beam: 'collimated', aoiDeg, polarization: 'unpolarized', measuredOn, lab },
    instrument,
    aoiDeg,
    lab,
    measuredOn,
    points: { wavelengthNm, transmission },
  };
}

async function insertBatch(sequelize: Sequelize, batch: Generated[]) {
  const rows = batch.map((g) => ({ g, m: computeMetrics(g.points) }));
  const col = <T>(f: (r: (typeof rows)[number]) => T) => rows.map(f);
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `INSERT INTO curves (id, contributor_id, status, label, maker, lines, nominal_cwl_nm, nominal_fwhm_nm, declared_pre_shift_nm, serial,
         notes, licence, method, instrument, aoi_deg, lab, measured_on, wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm,
         fwhm_nm, mean_in_band_t, effective_bandwidth_nm, blocking_od, line_transmission, verified_at)
       SELECT id, contributor, 'verified', label, maker, lines::text[], ncwl, nfwhm, pre, serial, notes, licence, method::jsonb, instrument, aoi,
              lab, measured::date, wl::float8[], tr::float8[], n, hash, peak, cwl, fwhm, mean, eff, od, lt::jsonb,
              now() - (random() * interval '900 days')
       FROM unnest($1::int[], $2::uuid[], $3::text[], $4::text[], $5::text[], $6::float8[], $7::float8[], $8::float8[], $9::text[], $10::text[],
                   $11::text[], $12::text[], $13::text[], $14::float8[], $15::text[], $16::text[], $17::text[], $18::text[], $19::int[], $20::text[],
                   $21::float8[], $22::float8[], $23::float8[], $24::float8[], $25::float8[], $26::float8[], $27::text[])
         AS t(id, contributor, label, maker, lines, ncwl, nfwhm, pre, serial, notes, licence, method, instrument, aoi, lab, measured, wl, tr, n, hash,
              peak, cwl, fwhm, mean, eff, od, lt)`,
      {
        bind: [
          col((r) => r.g.id), col((r) => r.g.contributorId), col((r) => r.g.label), col((r) => r.g.maker), col((r) => `{${r.g.lines.join(',')}}`),
          col((r) => r.g.nominalCwlNm), col((r) => r.g.nominalFwhmNm), col((r) => r.g.declaredPreShiftNm), col((r) => r.g.serial), col((r) => r.g.notes),
          col((r) => r.g.licence), col((r) => JSON.stringify(r.g.method)), col((r) => r.g.instrument), col((r) => r.g.aoiDeg), col((r) => r.g.lab),
          col((r) => r.g.measuredOn), col((r) => arrayLiteral(r.g.points.wavelengthNm)), col((r) => arrayLiteral(r.g.points.transmission)),
          col((r) => r.g.points.wavelengthNm.length),
          col((r) => createHash('sha256').update(arrayLiteral(r.g.points.wavelengthNm) + arrayLiteral(r.g.points.transmission)).digest('hex')),
          col((r) => r.m.peakT), col((r) => r.m.cwlNm), col((r) => r.m.fwhmNm), col((r) => r.m.meanInBandT), col((r) => r.m.effectiveBandwidthNm),
          col((r) => r.m.blockingOd), col((r) => JSON.stringify(Object.fromEntries(r.m.lines.map((l) => [l.id, l.transmission])))),
        ],
        transaction,
      },
    );
    const derived = deriveRows(batch.map((g, k) => ({ id: g.id, lines: g.lines, aoiDeg: g.aoiDeg, nEff: null, fwhmNm: rows[k].m.fwhmNm, points: g.points })));
    await writeDerivedRows(derived, transaction, sequelize);
  });
}

async function main() {
  if (!Number.isInteger(target) || target < 1 || target > 2_000_000) throw new Error('--curves must be a whole number between 1 and 2 000 000.');
  const { name, admin, scale } = urls();
  await ensureDatabase(admin, name, process.argv.includes('--fresh'));
  const sequelize = new Sequelize(scale, { dialect: 'postgres', dialectModule: pg, logging: false, pool: { max: 4 } });
  await createMigrator(sequelize).up();

  // contributors of the scale library (no password: they never sign in)
  await sequelize.query(
    `INSERT INTO users (email, name, role, email_verified)
     SELECT 'scale-' || g || '@bandcone.test', 'Scale contributor ' || g, 'contributor', now() FROM generate_series(1, ${CONTRIBUTORS}) g
     ON CONFLICT (email) DO NOTHING`,
  );
  const contributors = (await sequelize.query<{ id: string }>(`SELECT id FROM users WHERE email LIKE 'scale-%' ORDER BY email`, { type: QueryTypes.SELECT })).map((r) => r.id);
  const [{ n }] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM curves`, { type: QueryTypes.SELECT });
  const have = Number(n);
  console.log(`seed:scale: ${name} holds ${have} curves; target ${target}`);
  const started = Date.now();
  let pending: Promise<void> = Promise.resolve();
  for (let i = have; i < target; i += BATCH) {
    const count = Math.min(BATCH, target - i);
    const ids = (await sequelize.query<{ id: number }>(`SELECT nextval('curves_id_seq')::int AS id FROM generate_series(1, ${count})`, { type: QueryTypes.SELECT })).map((r) => r.id);
    const batch = ids.map((id, k) => generate(i + k, id, contributors));
    await pending; // generate the next batch while the previous one is written
    pending = insertBatch(sequelize, batch);
    const done = i + count - have;
    if ((i / BATCH) % 10 === 0 || i + count >= target) {
      const rate = done / ((Date.now() - started) / 1000);
      console.log(`  ${i + count} / ${target} curves (${rate.toFixed(0)} a second)`);
    }
  }
  await pending;
  // rows of one line and level together on disk: a fitness search reads them as one run
  console.log('seed:scale: cluster the fitness grid, vacuum, analyze');
  await sequelize.query('CLUSTER curve_fitness USING curve_fitness_pkey');
  await sequelize.query('VACUUM ANALYZE curves');
  await sequelize.query('VACUUM ANALYZE curve_fitness');
  await sequelize.query('VACUUM ANALYZE curve_sparklines');
  const [size] = await sequelize.query<{ db: string; curves: string; fitness: string }>(
    `SELECT pg_size_pretty(pg_database_size(current_database())) AS db, pg_size_pretty(pg_total_relation_size('curves')) AS curves,
            pg_size_pretty(pg_total_relation_size('curve_fitness')) AS fitness`,
    { type: QueryTypes.SELECT },
  );
  console.log(`seed:scale: ${target} curves in ${name} (${size.db}; curves ${size.curves}, fitness grid ${size.fitness}) in ${((Date.now() - started) / 1000).toFixed(0)} s`);
  console.log(`  serve it with DATABASE_URL=${scale.replace(/:[^:@/]*@/, ':***@')}`);
  await sequelize.close();
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
