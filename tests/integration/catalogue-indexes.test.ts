import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { closeSequelize, getSequelize } from '@/db/connection';
import { buildSearchSql } from '@/lib/catalogue/search';
import { parseSearchParams } from '@/lib/catalogue/search-params';

afterAll(() => closeSequelize());

// Fresh statistics, so the plans do not depend on whether autovacuum has analysed the new tables yet.
beforeAll(async () => {
  await getSequelize().query('ANALYZE curves, curve_fitness, curve_fitness_fine');
});

/**
 * EXPLAIN (ANALYZE) of the statements a search really runs. The test library is
 * small enough that PostgreSQL would rightly read it whole, so sequential scans
 * are priced out (enable_seqscan = off, for this transaction only): the plan
 * then shows that the indexes apply to these statements at all, which is what
 * the 100 000-curve library relies on (see the benchmark for its timings).
 */
async function plan(qs: string, which: 'page' | 'facet', as: 'visitor' | 'moderator' = 'visitor', opts: { bitmaps?: boolean } = {}): Promise<string> {
  // a moderator's search is not limited to verified rows, so no partial index can stand in for the one under test
  const actor = as === 'moderator' ? { id: '00000000-0000-0000-0000-000000000000', email: 'm@x', name: null, role: 'moderator' as const, via: 'session' as const } : null;
  const sql = await buildSearchSql(actor, parseSearchParams(new URLSearchParams(qs)));
  const [text, bind] = which === 'page' ? [sql.pageSql, sql.pageBind] : [sql.facetSql, sql.facetBind];
  const sequelize = getSequelize();
  return sequelize.transaction(async (transaction) => {
    await sequelize.query('SET LOCAL enable_seqscan = off', { transaction });
    // On a hundred rows reading the status index and sorting is rightly cheapest; bitmaps and sorts are
    // priced out too where the question is whether an ordered covering index serves the statement at all.
    if (opts.bitmaps === false) {
      await sequelize.query('SET LOCAL enable_bitmapscan = off', { transaction });
      await sequelize.query('SET LOCAL enable_sort = off', { transaction });
    }
    const rows = await sequelize.query<{ 'QUERY PLAN': string }>(`EXPLAIN (ANALYZE, COSTS OFF) ${text}`, { bind, type: QueryTypes.SELECT, transaction });
    return rows.map((r) => r['QUERY PLAN']).join('\n');
  });
}

describe('searches use their indexes', () => {
  it('full text goes through the GIN index on the weighted tsvector', async () => {
    const p = await plan('q=hydrogen+alpha', 'page', 'moderator');
    expect(p).toMatch(/Bitmap Index Scan on curves_search_idx/);
    expect(p).toMatch(/search @@ '''hydrogen''/);
  });

  it('parametric filters and sorts read covering indexes, never the wide curve rows', async () => {
    // lines, instrument, CWL, FWHM, peak, AOI and contributor are all carried in these indexes
    const covering = /Index (Only )?Scan (Backward )?using curves_(catalogue|verified_cwl|verified_cwl0|verified_fwhm|verified_peak)_idx/;
    for (const qs of ['line=OIII&method=spectrograph&sort=newest', 'fwhmMax=5&sort=fwhm', 'line=Ha&sort=peak', 'cwlMin=495&cwlMax=505&sort=cwl']) {
      const p = await plan(qs, 'page', 'visitor', { bitmaps: false });
      expect(p, qs).toMatch(covering);
      expect(p, qs).not.toMatch(/Seq Scan on curves/);
    }
  });

  it('one row per unit: a set member gives way to its lead through the unit index, not by reading the curves', async () => {
    const p = await plan('line=Ha&sort=newest', 'page', 'visitor', { bitmaps: false });
    expect(p).toMatch(/curves_unit_set_idx/);
    expect(p).not.toMatch(/Seq Scan on curves/);
    // and the CWL at normal incidence is read sorted from its own index
    const cwl = await plan('cwlMin=650&cwlMax=670&sort=cwl', 'page', 'visitor', { bitmaps: false });
    expect(cwl).toMatch(/Index (Only )?Scan (Backward )?using curves_verified_cwl0_idx/);
  });

  it('the fitness filter reads the fitness grid through its key', async () => {
    const p = await plan('line=Ha&fNumber=2.5&obstruction=0.36&minThroughput=0.8&sort=throughput', 'page');
    expect(p).toMatch(/Index Scan using curve_fitness_pkey on curve_fitness|Bitmap Index Scan on curve_fitness_pkey/);
  });
});
