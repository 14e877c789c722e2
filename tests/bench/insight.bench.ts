// Builder × construction-year aggregates over 1,000,000 visits on 200,000 homes (issue #6).
// Target: p95 < 250 ms on this machine. Run: BENCH_DATABASE_URL=… node --import tsx tests/bench/insight.bench.ts
import { builderYearCells } from '../../server/modules/insight/insight.repository.js';
import { builderComparison } from '../../server/modules/insight/insight.service.js';
import { fmt, freshBenchDatabase, printTable, summarise } from './support.js';

const HOMES = 200_000;
const VISITS_PER_HOME = 5; // 1,000,000 visits
const BUILDERS = 40;
const COMMUNITIES = 400; // 500 homes each, one builder each, ten construction years each → 4,000 cells
const RUNS = 30;

const database = await freshBenchDatabase();
const { pool, db } = database;
const {
  rows: [company],
} = await pool.query(`select c.id, ST_X(ST_Centroid(ST_Collect(h.location))) as lon, ST_Y(ST_Centroid(ST_Collect(h.location))) as lat
  from companies c join homes h on h.company_id = c.id group by c.id order by count(*) desc limit 1`);

const t0 = performance.now();
await pool.query(
  `insert into builders (company_id, name) select $1, 'Bench Builder ' || g from generate_series(1, $2) g`,
  [company.id, BUILDERS],
);
await pool.query(
  `insert into communities (company_id, name, year_from, year_to) select $1, 'Bench Community ' || g, 2000 + (g % 12), 2009 + (g % 12) from generate_series(1, $2) g`,
  [company.id, COMMUNITIES],
);
// Homes: community g % 400, its builder, ten construction years; derived flags set below from the visits.
await pool.query(
  `with b as (select id, row_number() over (order by name) - 1 as i from builders where company_id = $1 and name like 'Bench Builder %'),
        c as (select id, row_number() over (order by name) - 1 as i, year_from from communities where company_id = $1 and name like 'Bench Community %')
   insert into homes (company_id, community_id, builder_id, number, street, city, state, zip, address_key, location, year_built, outcome)
   select $1, c.id, b.id, g::text, 'Bench Row ' || (g % 997), 'Benchton', 'ZZ', '00000', 'BENCH|' || g,
          ST_SetSRID(ST_MakePoint($2 + (random() - 0.5) * 0.2, $3 + (random() - 0.5) * 0.15), 4326),
          c.year_from + (g / ${COMMUNITIES}) % 10, 'below_action_level'
   from generate_series(1, $4) g
   join c on c.i = g % ${COMMUNITIES}
   join b on b.i = (g % ${COMMUNITIES}) % ${BUILDERS}`,
  [company.id, company.lon, company.lat, HOMES],
);
const tHomes = performance.now();
// Visits: five per home; one in ten declined; about one completed visit in six needed rework, with one or two reasons.
await pool.query(
  `insert into visits (id, company_id, home_id, visited_on, status, vacuum_pa, rework_needed, rework_done, rework_reasons)
   select gen_random_uuid(), h.company_id, h.id, date '2020-01-01' + v * 90 + (hashtext(h.id::text) & 255),
          case when (hashtext(h.id::text) + v) % 10 = 0 then 'declined' else 'completed' end,
          60 + abs(hashtext(h.id::text || v)) % 500,
          false, r.rework,
          case when r.rework then string_to_array((array['added_suction_point', 'sealed_opening', 'larger_fan,sealed_joint', 'rerouted_pipe', 'other'])[1 + abs(hashtext(h.id::text || 'r' || v)) % 5], ',')
               else '{}'::text[] end
   from homes h
   cross join generate_series(1, ${VISITS_PER_HOME}) v
   cross join lateral (select (abs(hashtext(h.id::text || 'f' || v)) % 6 = 0 and (hashtext(h.id::text) + v) % 10 <> 0) as rework) r
   where h.company_id = $1 and h.street like 'Bench Row %'`,
  [company.id],
);
const tVisits = performance.now();
// The derived summary the app keeps on each home (server/modules/homes/home-summary.ts), set here in bulk.
await pool.query(
  `update homes h set sampled = s.sampled, failed = s.failed, last_vacuum_pa = s.vacuum, last_post_bq_m3 = 20 + abs(hashtext(h.id::text)) % 200,
          outcome = case when s.failed then 'needs_rework' else 'below_action_level' end,
          rework_reasons = coalesce(r.reasons, '{}')
   from (select home_id, bool_or(status = 'completed') as sampled, bool_or(rework_done or rework_needed) as failed,
                (array_agg(vacuum_pa order by visited_on desc) filter (where status = 'completed'))[1] as vacuum
         from visits where company_id = $1 group by home_id) s
   left join (select v.home_id, array_agg(distinct x.reason order by x.reason) as reasons
              from visits v, unnest(v.rework_reasons) x(reason) where v.company_id = $1 and v.status = 'completed' group by v.home_id) r
     on r.home_id = s.home_id
   where s.home_id = h.id`,
  [company.id],
);
await pool.query('analyze');
const {
  rows: [counts],
} = await pool.query(
  `select (select count(*) from homes where company_id = $1)::int as homes, (select count(*) from visits where company_id = $1)::int as visits,
          (select count(*) from visits where company_id = $1 and cardinality(rework_reasons) > 0)::int as with_reasons`,
  [company.id],
);
process.stdout.write(
  `synthetic data: ${counts.homes.toLocaleString('en')} homes (${fmt(tHomes - t0)} ms), ${counts.visits.toLocaleString('en')} visits (${fmt(tVisits - tHomes)} ms), ` +
    `${counts.with_reasons.toLocaleString('en')} with rework reasons; summary + analyze ${fmt(performance.now() - tVisits)} ms\n`,
);

async function time(label: string, fn: () => Promise<unknown>) {
  for (let i = 0; i < 3; i++) await fn(); // warm caches and plans
  const samples: number[] = [];
  let size = 0;
  for (let i = 0; i < RUNS; i++) {
    const start = performance.now();
    const result = await fn();
    samples.push(performance.now() - start);
    size = Array.isArray(result) ? result.length : (result as { rows: unknown[] }).rows.length;
  }
  const s = summarise(samples);
  process.stdout.write(`${label}: p50 ${fmt(s.p50)} ms, p95 ${fmt(s.p95)} ms\n`);
  return { step: label, rows: size, runs: s.n, 'p50 ms': fmt(s.p50), 'p95 ms': fmt(s.p95), 'max ms': fmt(s.max), 'target p95 < 250 ms': s.p95 < 250 ? 'met' : 'MISSED' };
}

const results: Record<string, string | number>[] = [];
// drizzle/0007 creates homes_insight_idx (covering, in group-key order); measure once without it too.
await pool.query('drop index homes_insight_idx');
await pool.query('analyze homes');
results.push(await time('SQL aggregates (without homes_insight_idx)', () => builderYearCells(db, company.id)));
results.push(await time('whole comparison (without homes_insight_idx)', () => builderComparison(db, company.id, {})));
const tIndex = performance.now();
await pool.query(
  `create index homes_insight_idx on homes (company_id, builder_id, community_id, year_built)
   include (sampled, failed, last_vacuum_pa, last_post_bq_m3, rework_reasons)`,
);
await pool.query('vacuum analyze homes');
process.stdout.write(`re-created homes_insight_idx in ${fmt(performance.now() - tIndex)} ms\n`);
results.push(await time('SQL aggregates (as shipped, with homes_insight_idx)', () => builderYearCells(db, company.id)));
results.push(await time('whole comparison (as shipped, with homes_insight_idx)', () => builderComparison(db, company.id, {})));

printTable(
  `Builder × community × year comparison, ${counts.homes.toLocaleString('en')} homes, ${counts.visits.toLocaleString('en')} visits, ${RUNS} sequential runs each ` +
    `(whole comparison = SQL + Wilson intervals + pooled estimates + leave-one-out back-test)`,
  results,
);
await database.close();
