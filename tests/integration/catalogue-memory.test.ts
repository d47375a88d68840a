import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes, type Transaction } from 'sequelize';
import { closeSequelize, getSequelize } from '@/db/connection';
import { searchCurves, type SearchResult } from '@/lib/catalogue/search';
import { parseSearchParams } from '@/lib/catalogue/search-params';
import { answeredInMemory } from '@/lib/catalogue/memory-search';
import { catalogueCopy, copyStats, currentVersion, dropCatalogueCopy } from '@/lib/catalogue/memory-index';
import type { Actor } from '@/lib/auth/actor';
import { binaryArraySql, readFloat8Array } from '@/lib/catalogue/binary-array';
import { forgetCounts } from '@/lib/catalogue/count-cache';

afterAll(() => closeSequelize());

const moderator: Actor = { id: '00000000-0000-0000-0000-000000000000', email: 'm@x', name: null, role: 'moderator', via: 'session' };

/** What a reader sees of an answer: the page in order, the total and every facet count. */
const seen = (r: SearchResult) => ({ ids: r.items.map((i) => i.id), total: r.total, facets: r.facets, taus: r.items.map((i) => i.throughput), sets: r.items.map((i) => i.set), cwl: r.items.map((i) => [i.cwlNm, i.measuredCwlNm]) });

// Fitness searches of every shape the in-process copy answers: line named or not, each curve's own
// n_eff or a named one (off-normal curves then come from their fine level), field angles, every
// filter, every sort in both directions, later pages.
const SEARCHES = [
  'line=Ha&fNumber=2.5&obstruction=0.36&minThroughput=0.85&sort=throughput',
  'line=Ha&fwhmMax=5&fNumber=2.5&obstruction=0.36&minThroughput=0.6',
  'line=OIII&fNumber=1.8&obstruction=0.2&sort=throughput&pageSize=30',
  'line=OIII&fNumber=1.8&obstruction=0.2&sort=throughput&dir=asc&page=2&pageSize=5',
  'fNumber=2.5&obstruction=0.36&minThroughput=0.5&sort=throughput',
  'fNumber=3&minThroughput=0.4&sort=cwl&dir=desc&page=2&pageSize=10',
  'fNumber=3&sort=newest&dir=asc&pageSize=7&page=3',
  'fNumber=4&sort=peak&pageSize=15',
  'fNumber=4&sort=fwhm&dir=desc&fwhmMin=2',
  'line=Ha&fNumber=2.8&obstruction=0.3&nEff=1.7&fieldAngleDeg=8&minThroughput=0.3&sort=throughput',
  'fNumber=2&nEff=2.1&minThroughput=0.5&method=spectrograph',
  'fNumber=1.4&obstruction=0.35&nEff=1.6&minThroughput=0.2&aoiMin=1',
  'line=SII-671&fNumber=2.8&minThroughput=0.5&cwlMin=660&peakMin=0.8&aoiMax=10',
  'fNumber=5&fieldAngleDeg=12&minThroughput=0.7&method=monochromator&sort=throughput&dir=asc',
  'line=Ha&fNumber=2.5&obstruction=0.36&sort=contrast&sky=suburban',
  'fNumber=3&obstruction=0.2&sort=contrast&sky=led-town&pageSize=7&page=2',
  // FWHM buckets, several at once and beside a FWHM range (filters.ts: one table for both ways of answering)
  'fNumber=3&fwhmBucket=2-3&fwhmBucket=3-4&minThroughput=0.3&sort=throughput',
  'line=Ha&fNumber=2.5&fwhmBucket=5-7&fwhmBucket=3-4&fwhmMax=6&sort=fwhm&dir=asc',
  'fNumber=2&fwhmBucket=30%2B&fwhmBucket=0-1&sort=cwl',
  'line=OIII&fNumber=2.2&cwlMin=495&cwlMax=505&aoiMax=0&sort=peak&dir=asc',
  // the CWL filter and order at normal incidence, over units
  'fNumber=2.5&obstruction=0.36&sort=cwl&cwlMin=650&cwlMax=670&pageSize=50',
  'fNumber=2&sort=cwl&dir=asc&page=2&pageSize=8',
];

describe('the in-process copy answers fitness searches exactly as the SQL does', () => {
  it('same page, order, total, facets and throughputs for every kind of fitness search', async () => {
    let nonEmpty = 0;
    for (const qs of SEARCHES) {
      const p = parseSearchParams(new URLSearchParams(qs));
      expect(await answeredInMemory(null, p), qs).toBe(true);
      const fromSql = await searchCurves(null, p, { memory: false });
      const fromCopy = await searchCurves(null, p);
      expect(seen(fromCopy), qs).toEqual(seen(fromSql));
      if (fromSql.items.length > 0) nonEmpty++;
    }
    // the comparison means something only if most searches find curves
    expect(nonEmpty).toBeGreaterThanOrEqual(SEARCHES.length - 2);
  });

  it('the contrast sort gives the same gains both ways, each equal to the cone study\'s own sky gain over a 10 nm box', async () => {
    const { runConeModel } = await import('@/lib/engine/cone-study');
    const { curvePointsByIds } = await import('@/lib/catalogue/points');
    const { defaultNEff } = await import('@/lib/catalogue/fitness-grid');
    const p = parseSearchParams(new URLSearchParams('line=Ha&fNumber=2.5&obstruction=0.36&sort=contrast&sky=dark&pageSize=10'));
    const fromSql = await searchCurves(null, p, { memory: false });
    const fromCopy = await searchCurves(null, p);
    expect(fromCopy.items.map((i) => [i.id, i.skyGain])).toEqual(fromSql.items.map((i) => [i.id, i.skyGain]));
    expect(fromSql.items.length).toBeGreaterThan(1);
    expect(fromSql.contrast?.note).toMatch(/computed exactly/);
    const gains = fromSql.items.map((i) => i.skyGain ?? -1);
    expect([...gains].sort((a, b) => b - a)).toEqual(gains);
    const top = fromSql.items[0];
    const stored = (await curvePointsByIds([top.id])).get(top.id)!;
    const study = runConeModel({ points: stored.points, optic: { fNumber: 2.5, obstruction: 0.36 }, nEff: defaultNEff(stored.nEff), measuredAoiDeg: stored.aoiDeg, lines: ['Ha'], sky: { model: 'dark', reference: { boxFwhmNm: 10 } } });
    expect(top.skyGain).toBeCloseTo(study.sky!.gain!, 10);
  });

  it('the same when the grid is read a few rows at a time', async () => {
    process.env.BANDCONE_COPY_CHUNK = '7';
    dropCatalogueCopy();
    try {
      for (const qs of [SEARCHES[0], SEARCHES[4], SEARCHES[9], SEARCHES[11]]) {
        const p = parseSearchParams(new URLSearchParams(qs));
        expect(seen(await searchCurves(null, p)), qs).toEqual(seen(await searchCurves(null, p, { memory: false })));
      }
    } finally {
      delete process.env.BANDCONE_COPY_CHUNK;
      dropCatalogueCopy();
    }
  });

  it('a moderator asking for verified curves, and a contributor with nothing pending, are answered from the copy; other readers and words go to SQL', async () => {
    const p = parseSearchParams(new URLSearchParams('line=Ha&fNumber=2&minThroughput=0.5&status=verified'));
    expect(await answeredInMemory(moderator, p)).toBe(true);
    expect(seen(await searchCurves(moderator, p))).toEqual(seen(await searchCurves(moderator, p, { memory: false })));

    // someone whose own curves are all decided sees exactly the verified catalogue
    const plain = parseSearchParams(new URLSearchParams('line=Ha&fNumber=2&minThroughput=0.5'));
    const [settled] = await getSequelize().query<{ contributor_id: string }>(
      `SELECT contributor_id FROM curves GROUP BY 1 HAVING bool_and(status IN ('verified', 'superseded')) LIMIT 1`,
      { type: QueryTypes.SELECT },
    );
    const done: Actor = { ...moderator, id: settled?.contributor_id ?? '00000000-0000-0000-0000-00000000beef', role: 'contributor' };
    expect(await answeredInMemory(done, plain)).toBe(true);
    expect(seen(await searchCurves(done, plain))).toEqual(seen(await searchCurves(done, plain, { memory: false })));

    // someone with a curve awaiting review sees it too, which the copy does not hold
    const [waiting] = await getSequelize().query<{ contributor_id: string }>(
      `SELECT contributor_id FROM curves WHERE status = 'submitted' LIMIT 1`,
      { type: QueryTypes.SELECT },
    );
    expect(waiting).toBeDefined();
    expect(await answeredInMemory({ ...done, id: waiting.contributor_id }, plain)).toBe(false);

    expect(await answeredInMemory(moderator, parseSearchParams(new URLSearchParams('fNumber=2')))).toBe(false);
    expect(await answeredInMemory(null, parseSearchParams(new URLSearchParams('fNumber=2&q=meadow')))).toBe(false);
    expect(await answeredInMemory(null, parseSearchParams(new URLSearchParams('line=Ha')))).toBe(false);
  });
});

describe('the copy follows the library', () => {
  const sequelize = getSequelize();

  it('catalogue_version moves once per committed change and not for a rolled-back one', async () => {
    const before = Number(await currentVersion());
    // a few rows only: rewriting many would clear the visibility map that index-only scans (catalogue-indexes.test.ts) rely on
    const [{ id }] = await sequelize.query<{ id: number }>(`SELECT min(id) AS id FROM curves WHERE status = 'verified'`, { type: QueryTypes.SELECT });
    await sequelize.transaction(async (transaction) => {
      // three statements over several rows of two tables: still one step
      await sequelize.query(`UPDATE curves SET updated_at = updated_at WHERE id = $1`, { bind: [id], transaction });
      await sequelize.query(`UPDATE curves SET updated_at = updated_at WHERE id = $1`, { bind: [id], transaction });
      await sequelize.query(`UPDATE curve_fitness SET level = level WHERE curve_id = $1`, { bind: [id], transaction });
    });
    expect(Number(await currentVersion())).toBe(before + 1);
    await expect(
      sequelize.transaction(async (transaction) => {
        await sequelize.query(`UPDATE curves SET updated_at = updated_at WHERE id = $1`, { bind: [id], transaction });
        throw new Error('roll back');
      }),
    ).rejects.toThrow('roll back');
    expect(Number(await currentVersion())).toBe(before + 1);
  });

  it('a newly verified curve is found by the next fitness search, and a withdrawn one is gone', async () => {
    const qs = 'line=Ha&fNumber=2.5&obstruction=0.36&sort=throughput&pageSize=1';
    const p = parseSearchParams(new URLSearchParams(qs));
    const best = (await searchCurves(null, p)).items[0];
    expect(best).toBeDefined();
    const stale = await catalogueCopy();
    const totalBefore = (await searchCurves(null, p)).total;

    // a copy of the best curve, verified later, with a higher id: it sorts just after the original
    const [{ id }] = await sequelize.query<{ id: number }>(
      `INSERT INTO curves (submission_id, file_id, contributor_id, status, label, maker, lines, serial, notes, licence, method, instrument, aoi_deg,
                           wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm, fwhm_nm, mean_in_band_t, effective_bandwidth_nm,
                           blocking_od, line_transmission, n_eff, verified_at)
       SELECT NULL, NULL, contributor_id, 'verified', label || ' (copy for a test)', maker, lines, serial, notes, licence, method, instrument, aoi_deg,
              wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm, fwhm_nm, mean_in_band_t, effective_bandwidth_nm,
              blocking_od, line_transmission, n_eff, now()
       FROM curves WHERE id = $1 RETURNING id`,
      { bind: [best.id], type: QueryTypes.SELECT },
    );
    try {
      await sequelize.query(
        `INSERT INTO curve_fitness (curve_id, line_id, level, primary_line, n_eff_default, direct, canonical)
         SELECT $2, line_id, level, primary_line, n_eff_default, direct, canonical FROM curve_fitness WHERE curve_id = $1`,
        { bind: [best.id, id] },
      );
      const after = await searchCurves(null, p);
      expect(await catalogueCopy()).not.toBe(stale);
      expect(after.total).toBe(totalBefore + 1);
      const two = await searchCurves(null, parseSearchParams(new URLSearchParams(qs.replace('pageSize=1', 'pageSize=2'))));
      // equal throughput; the tie goes to the higher id first, as in SQL (throughput DESC, id DESC)
      expect(two.items.map((i) => i.id)).toEqual([id, best.id]);
    } finally {
      // A verified curve is never deleted (db/migrations/0005); the owner lifts the guard for this clean-up only.
      await sequelize.transaction(async (transaction) => {
        await sequelize.query(`SET LOCAL bandcone.maintenance = 'on'`, { transaction });
        await sequelize.query(`DELETE FROM curves WHERE id = $1`, { bind: [id], transaction });
      });
    }
    const gone = await searchCurves(null, p);
    expect(gone.total).toBe(totalBefore);
    expect(gone.items[0].id).toBe(best.id);
  });
});

describe('the copy is brought up to date by the curves that changed', () => {
  const sequelize = getSequelize();

  /** A verified curve is never deleted (db/migrations/0005); the owner lifts the guard for a test's own rows only. */
  const maintenance = (work: (transaction: Transaction) => Promise<unknown>) =>
    sequelize.transaction(async (transaction) => {
      await sequelize.query(`SET LOCAL bandcone.maintenance = 'on'`, { transaction });
      await work(transaction);
    });

  /** A verified copy of curve `of` with its grid rows, committed in one transaction (as a verification is). */
  async function verifiedCopyOf(of: number): Promise<number> {
    return sequelize.transaction(async (transaction) => {
      const [{ id }] = await sequelize.query<{ id: number }>(
        `INSERT INTO curves (submission_id, file_id, contributor_id, status, label, maker, lines, serial, notes, licence, method, instrument, aoi_deg,
                             wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm, fwhm_nm, mean_in_band_t, effective_bandwidth_nm,
                             blocking_od, line_transmission, n_eff, verified_at)
         SELECT NULL, NULL, contributor_id, 'verified', label || ' (patch test)', maker, lines, serial, notes, licence, method, instrument, aoi_deg,
                wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm, fwhm_nm, mean_in_band_t, effective_bandwidth_nm,
                blocking_od, line_transmission, n_eff, now()
         FROM curves WHERE id = $1 RETURNING id`,
        { bind: [of], type: QueryTypes.SELECT, transaction },
      );
      await sequelize.query(
        `INSERT INTO curve_fitness (curve_id, line_id, level, primary_line, n_eff_default, direct, canonical)
         SELECT $2, line_id, level, primary_line, n_eff_default, direct, canonical FROM curve_fitness WHERE curve_id = $1`,
        { bind: [of, id], transaction },
      );
      await sequelize.query(
        `INSERT INTO curve_fitness_fine (curve_id, line_id, fine) SELECT $2, line_id, fine FROM curve_fitness_fine WHERE curve_id = $1`,
        { bind: [of, id], transaction },
      );
      return id;
    });
  }

  it('adds, removes and re-reads curves without reading the library again, and answers exactly as SQL', async () => {
    // sources: an on-axis and an off-normal verified curve (the latter has fine rows)
    const [onAxis] = await sequelize.query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' AND aoi_deg = 0 AND 'Ha' = ANY(lines) ORDER BY id LIMIT 1`, { type: QueryTypes.SELECT });
    const [offNormal] = await sequelize.query<{ id: number }>(`SELECT c.id FROM curves c WHERE c.status = 'verified' AND c.aoi_deg > 0 AND EXISTS (SELECT 1 FROM curve_fitness_fine f WHERE f.curve_id = c.id) ORDER BY id LIMIT 1`, { type: QueryTypes.SELECT });
    expect(onAxis && offNormal).toBeTruthy();
    const removed = await verifiedCopyOf(onAxis.id);
    const touched = await verifiedCopyOf(offNormal.id);
    const made: number[] = [removed, touched];
    try {
      dropCatalogueCopy();
      // warm every block these searches read, so the patch has blocks to carry over
      for (const qs of SEARCHES) await searchCurves(null, parseSearchParams(new URLSearchParams(qs)));
      const before = { ...copyStats };
      const copyBefore = await catalogueCopy();

      await maintenance((transaction) => sequelize.query(`DELETE FROM curves WHERE id = $1`, { bind: [removed], transaction }));
      made.push(await verifiedCopyOf(offNormal.id), await verifiedCopyOf(onAxis.id));
      await sequelize.query(`UPDATE curve_fitness SET level = level WHERE curve_id = $1`, { bind: [touched] });
      // the SQL path keeps counts for 30 s; the app forgets them when it changes the library, so does this test
      forgetCounts();

      for (const qs of SEARCHES) {
        const p = parseSearchParams(new URLSearchParams(qs));
        expect(seen(await searchCurves(null, p)), qs).toEqual(seen(await searchCurves(null, p, { memory: false })));
      }
      const copyAfter = await catalogueCopy();
      expect(copyAfter.n).toBe(copyBefore.n + 1);
      expect(Array.from(copyAfter.ids)).not.toContain(removed);
      expect(copyStats.fullLoads).toBe(before.fullLoads);
      expect(copyStats.patches).toBeGreaterThan(before.patches);
      // the blocks came along instead of being read again
      expect(copyAfter.used.size).toBeGreaterThan(0);
    } finally {
      await maintenance((transaction) => sequelize.query(`DELETE FROM curves WHERE id = ANY($1::int[])`, { bind: [made], transaction }));
      forgetCounts();
    }
    const p = parseSearchParams(new URLSearchParams(SEARCHES[0]));
    expect(seen(await searchCurves(null, p))).toEqual(seen(await searchCurves(null, p, { memory: false })));
  });

  it('a copy older than the change log reaches is read again whole', async () => {
    const copy = await catalogueCopy();
    const before = copyStats.fullLoads;
    // pretend the log lost this copy's next version, as pruning would
    await sequelize.query(`UPDATE catalogue_version SET version = version + 1`);
    forgetCounts();
    const p = parseSearchParams(new URLSearchParams(SEARCHES[4]));
    expect(seen(await searchCurves(null, p))).toEqual(seen(await searchCurves(null, p, { memory: false })));
    expect((await catalogueCopy()).version).not.toBe(copy.version);
    expect(copyStats.fullLoads).toBe(before + 1);
  });
});

describe('whole curves in binary form', () => {
  it('read back exactly the doubles PostgreSQL prints for them', async () => {
    const rows = await getSequelize().query<{ w: Buffer; t: Buffer; wt: string; tt: string }>(
      `SELECT ${binaryArraySql('wavelength_nm')} AS w, ${binaryArraySql('transmission')} AS t,
              array_to_string(wavelength_nm, ',') AS wt, array_to_string(transmission, ',') AS tt
       FROM curves ORDER BY id LIMIT 25`,
      { type: QueryTypes.SELECT },
    );
    expect(rows.length).toBeGreaterThan(10);
    for (const r of rows) {
      // PostgreSQL 12+ prints the shortest text that reads back as the same double
      expect(readFloat8Array(r.w)).toEqual(r.wt.split(',').map(Number));
      expect(readFloat8Array(r.t)).toEqual(r.tt.split(',').map(Number));
    }
    expect(() => readFloat8Array(Buffer.from([0, 0, 0, 1, 0, 0, 0, 0, 0, 0, 0, 23, 0, 0, 0, 0, 0, 0, 0, 1]))).toThrow(/float8/);
  });
});

describe('one row per unit, its CWL at normal incidence', () => {
  const sequelize = getSequelize();

  it('lists each multi-angle set once, by its lowest angle, with every angle and curve, and counts units both ways', async () => {
    const sets = await sequelize.query<{ key: string; ids: number[]; aois: number[] }>(
      `SELECT set_key || '|' || revision AS key, array_agg(id ORDER BY aoi_deg, id) AS ids, array_agg(aoi_deg ORDER BY aoi_deg, id) AS aois
       FROM curves WHERE status = 'verified' AND set_key IS NOT NULL GROUP BY 1 HAVING count(*) > 1`,
      { type: QueryTypes.SELECT },
    );
    // the demo world measures some units at 0, 4, 8, 12 and 16° (seeds/world)
    expect(sets.length).toBeGreaterThan(0);
    const [{ units }] = await sequelize.query<{ units: string }>(
      `SELECT count(DISTINCT coalesce(set_key || '|' || revision, 'c' || id)) AS units FROM curves WHERE status = 'verified'`,
      { type: QueryTypes.SELECT },
    );
    for (const qs of ['pageSize=100', 'fNumber=3&pageSize=100']) {
      const p = parseSearchParams(new URLSearchParams(qs));
      // every page, so each set's lead is met wherever the order puts it
      const allPages = async (memory: boolean) => {
        const first = await searchCurves(null, p, { memory });
        const items = [...first.items];
        for (let page = 2; (page - 1) * 100 < first.total; page++) items.push(...(await searchCurves(null, { ...p, page }, { memory })).items);
        return { ...first, items };
      };
      for (const r of [await allPages(false), ...(qs.includes('fNumber') ? [await allPages(true)] : [])]) {
        expect(r.total, qs).toBe(Number(units));
        expect(r.items.length, qs).toBe(Number(units));
        const ids = r.items.map((i) => i.id);
        for (const set of sets) {
          // the lead only, carrying the whole set
          expect(ids.filter((id) => set.ids.includes(id)), qs).toEqual([set.ids[0]]);
          const item = r.items.find((i) => i.id === set.ids[0])!;
          expect(item.set).toEqual({ aoiDeg: set.aois, curveIds: set.ids });
        }
        // a curve alone is a set of one
        const single = r.items.find((i) => !sets.some((s) => s.ids.includes(i.id)))!;
        expect(single.set).toEqual({ aoiDeg: [single.aoiDeg], curveIds: [single.id] });
        // the facets count units too
        expect(r.facets.method.reduce((t, f) => t + f.count, 0)).toBe(Number(units));
      }
    }
    // an export of the same search still holds every curve of every unit, each set lead first
    const { matchingVerifiedIds } = await import('@/lib/catalogue/search');
    const exported = await matchingVerifiedIds(parseSearchParams(new URLSearchParams('')), 10_000);
    const [{ curves }] = await sequelize.query<{ curves: string }>(`SELECT count(*) AS curves FROM curves WHERE status = 'verified'`, { type: QueryTypes.SELECT });
    expect(exported.total).toBe(Number(curves));
    expect(new Set(exported.ids).size).toBe(Number(curves));
    for (const set of sets) {
      const at = exported.ids.indexOf(set.ids[0]);
      expect(exported.ids.slice(at, at + set.ids.length)).toEqual(set.ids);
    }
  });

  it('gives the CWL at normal incidence by the engine\'s rule, the SQL filter and order agreeing with it, and keeps the measured one', async () => {
    const { normalCwlNm, normalCwlSql } = await import('@/lib/catalogue/units');
    const rows = await sequelize.query<{ id: number; cwl_nm: number | null; aoi_deg: number; n_eff: number | null; v: number | null }>(
      `SELECT c.id, c.cwl_nm, c.aoi_deg, c.n_eff, ${normalCwlSql('c')} AS v FROM curves c WHERE c.status = 'verified'`,
      { type: QueryTypes.SELECT },
    );
    const off = rows.filter((r) => r.aoi_deg > 0 && r.cwl_nm !== null);
    expect(off.length).toBeGreaterThan(0);
    for (const r of rows) {
      if (r.cwl_nm === null) continue;
      expect(r.v!, `curve ${r.id}`).toBeCloseTo(normalCwlNm(r.cwl_nm, r.aoi_deg, r.n_eff)!, 9);
    }
    // an off-normal curve standing alone: its normal-incidence CWL is redder than measured (docs/model.md §Angle shift)
    const [alone] = await sequelize.query<{ id: number }>(
      `SELECT id FROM curves WHERE status = 'verified' AND set_key IS NULL AND aoi_deg >= 5 AND cwl_nm IS NOT NULL ORDER BY aoi_deg DESC, id LIMIT 1`,
      { type: QueryTypes.SELECT },
    );
    expect(alone).toBeDefined();
    const r = rows.find((x) => x.id === alone.id)!;
    const normal = normalCwlNm(r.cwl_nm, r.aoi_deg, r.n_eff)!;
    expect(normal - r.cwl_nm!).toBeGreaterThan(0.2);
    // a window around the normal-incidence CWL that leaves the measured one out finds it, both ways
    const mid = (normal + r.cwl_nm!) / 2;
    for (const qs of [`cwlMin=${mid}&cwlMax=${normal + 0.05}&pageSize=100`, `cwlMin=${mid}&cwlMax=${normal + 0.05}&fNumber=4&pageSize=100`]) {
      const p = parseSearchParams(new URLSearchParams(qs));
      const found = await searchCurves(null, p, { memory: false });
      const item = found.items.find((i) => i.id === alone.id);
      expect(item, qs).toBeDefined();
      expect(item!.cwlNm).toBeCloseTo(normal, 9);
      expect(item!.measuredCwlNm).toBe(r.cwl_nm);
      expect(found.items.every((i) => i.cwlNm! >= mid && i.cwlNm! <= normal + 0.05)).toBe(true);
      if (qs.includes('fNumber')) expect(seen(await searchCurves(null, p))).toEqual(seen(found));
    }
    // and the CWL order is the normal-incidence one
    const byCwl = await searchCurves(null, parseSearchParams(new URLSearchParams('sort=cwl&dir=asc&pageSize=100')), { memory: false });
    const cwls = byCwl.items.map((i) => i.cwlNm).filter((v): v is number => v !== null);
    expect([...cwls].sort((a, b) => a - b)).toEqual(cwls);
  });
});
