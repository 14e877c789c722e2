import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser, otherCompanyUser } from '../setup/demo.js';
import { empiricalBayesShrinkage, wilsonInterval } from '../../shared/domain/statistics.js';
import type { BuilderComparisonDto, ComparisonRow } from '../../shared/schemas/insight.js';

let app: TestApp;
let manager: ApiClient;
let companyId: string;
let tamarack: { id: string; name: string };

beforeAll(async () => {
  app = await startTestApp();
  manager = new ApiClient(app.url);
  companyId = (await manager.signIn(demoUser('manager'))).companyId;
  const communities = (await manager.get('/api/communities')).body.communities as { id: string; name: string }[];
  tamarack = communities.find((c) => c.name === 'Tamarack Bend Phase 1')!;
});
afterAll(() => app.close());

/**
 * The same counts straight from the visits and radon tests (not from the flags kept on homes):
 * sampled = a completed visit; failed = a completed visit that needed or did rework, or a
 * post-mitigation result (side-by-side devices averaged) at or above the company's action level.
 */
async function directCounts(communityId: string) {
  const { rows } = await app.database.pool.query(
    `with post as (
       select t.home_id, avg(t.result_bq_m3) as result
       from radon_tests t where t.company_id = $1 and t.kind = 'post'
       group by t.home_id, coalesce(t.side_by_side_group, t.id::text)
     ),
     per_home as (
       select h.id, h.builder_id, h.year_built,
              exists (select 1 from visits v where v.home_id = h.id and v.status = 'completed') as sampled,
              exists (select 1 from visits v where v.home_id = h.id and v.status = 'completed' and (v.rework_needed or v.rework_done))
                or exists (select 1 from post p where p.home_id = h.id and p.result >= c.action_level_bq_m3) as failed_any
       from homes h join companies c on c.id = h.company_id
       where h.company_id = $1 and h.community_id = $2 and h.builder_id is not null
     )
     select builder_id::text as "builderId", year_built as "yearBuilt", count(*)::int as homes,
            count(*) filter (where sampled)::int as sampled,
            count(*) filter (where sampled and failed_any)::int as failures
     from per_home group by 1, 2 order by 1, 2`,
    [companyId, communityId],
  );
  return rows as { builderId: string; yearBuilt: number; homes: number; sampled: number; failures: number }[];
}

describe('builder comparison', () => {
  it("counts homes, sampled homes and failures of a demo community exactly as a direct SQL count of its visits and tests", async () => {
    const res = await manager.get(`/api/insight/builders?communityId=${tamarack.id}`);
    expect(res.status).toBe(200);
    const body = res.body as BuilderComparisonDto;
    const direct = await directCounts(tamarack.id);
    expect(direct.length).toBeGreaterThan(0);
    expect(direct.reduce((s, r) => s + r.sampled, 0)).toBeGreaterThan(0);
    const got = body.rows
      .map((r) => ({ builderId: r.builderId, yearBuilt: r.yearBuilt, homes: r.homes, sampled: r.sampled, failures: r.failures }))
      .sort((a, b) => (a.builderId! + a.yearBuilt).localeCompare(b.builderId! + b.yearBuilt));
    expect(got).toEqual(direct);
    for (const r of body.rows) expect(r.communityName).toBe(tamarack.name);
  });

  it('gives every rate its Wilson 95 % interval (Newcombe 1998 method 3) and the median readings of the sampled homes', async () => {
    const body = (await manager.get(`/api/insight/builders?communityId=${tamarack.id}`)).body as BuilderComparisonDto;
    for (const r of body.rows) {
      const w = wilsonInterval(r.failures, r.sampled);
      expect(r.wilson.lower).toBeCloseTo(w.lower, 10);
      expect(r.wilson.upper).toBeCloseTo(w.upper, 10);
      if (r.sampled > 0) expect(r.wilson.lower).toBeLessThanOrEqual(r.wilson.rate!);
    }
    // Median of the latest completed visit's vacuum per sampled home, computed from the visits.
    const row = body.rows.find((r) => r.sampled >= 3)!;
    const { rows } = await app.database.pool.query(
      `select percentile_cont(0.5) within group (order by latest.vacuum_pa) as median
       from homes h
       cross join lateral (select v.vacuum_pa from visits v where v.home_id = h.id and v.status = 'completed' and v.vacuum_pa is not null
                           order by v.visited_on desc limit 1) latest
       where h.company_id = $1 and h.community_id = $2 and h.builder_id = $3 and h.year_built = $4`,
      [companyId, tamarack.id, row.builderId, row.yearBuilt],
    );
    expect(row.medianVacuumPa).toBeCloseTo(Number(rows[0].median), 6);
  });

  it('lists the most common rework reasons of each cell: homes whose completed visits cited each, recounted from the visits', async () => {
    const body = (await manager.get(`/api/insight/builders?communityId=${tamarack.id}`)).body as BuilderComparisonDto;
    const withReasons = body.rows.filter((r) => r.topReworkReasons.length > 0);
    expect(withReasons.length).toBeGreaterThan(0);
    const r: ComparisonRow = withReasons[0];
    const { rows } = await app.database.pool.query(
      `select reason, count(distinct h.id)::int as count from visits v join homes h on h.id = v.home_id, unnest(v.rework_reasons) reason
       where h.company_id = $1 and h.community_id = $2 and h.builder_id = $3 and h.year_built = $4 and v.status = 'completed'
       group by reason order by count desc, reason limit 3`,
      [companyId, tamarack.id, r.builderId, r.yearBuilt],
    );
    expect(r.topReworkReasons).toEqual(rows);
  });

  it('shows raw and pooled estimates side by side, states the method, and reports the leave-one-community-out back-test', async () => {
    const body = (await manager.get('/api/insight/builders')).body as BuilderComparisonDto;
    expect(body.communities.length).toBeGreaterThan(3);
    for (const c of body.communities) {
      expect(c.pooled.rate).toBeGreaterThanOrEqual(c.pooled.lower);
      expect(c.pooled.rate).toBeLessThanOrEqual(c.pooled.upper);
    }
    expect(body.method.pooling).toMatch(/empirical-Bayes/);
    expect(body.method.interval).toMatch(/Wilson/);
    expect(body.backtest.seen).toBe(2);
    expect(body.backtest.groupsScored).toBeGreaterThan(3);
    expect(body.backtest.meanErrorRaw).toBeGreaterThan(0);
    expect(body.backtest.meanErrorPooled).toBeGreaterThan(0);
    expect(body.backtest.verdict).toMatch(/Pooling (helps|does not help) on your data/);
    expect(body.backtest.rows[0]).toHaveProperty('communityName');
  });

  it("back-tests a held-out community against an independent recount: the prior comes from the builder's other communities only", async () => {
    const body = (await manager.get('/api/insight/builders')).body as BuilderComparisonDto;
    const row = body.backtest.rows.find((r) => r.communityName === tamarack.name)!;
    // Sampled homes and failures of every community of Tamarack's builder, counted in SQL.
    const { rows } = await app.database.pool.query(
      `select m.name, count(*) filter (where h.sampled)::int as n, count(*) filter (where h.sampled and h.failed)::int as k
       from homes h join communities m on m.id = h.community_id
       where h.company_id = $1 and h.builder_id = (select builder_id from homes where community_id = $2 limit 1)
       group by m.name`,
      [companyId, tamarack.id],
    );
    const own = rows.find((r) => r.name === tamarack.name)!;
    const others = rows.filter((r) => r.name !== tamarack.name && r.n > 0);
    expect([row.n, row.k]).toEqual([own.n, own.k]);
    // The prior is fitted with the project's tested shrinkage on the other communities alone (Efron & Morris 1975).
    const prior = empiricalBayesShrinkage(others.map((r) => ({ key: r.name, k: r.k, n: r.n }))).prior;
    expect(row.restRate).toBeCloseTo(prior.alpha / (prior.alpha + prior.beta), 8);
    // Expected errors with two homes seen, by enumerating which two were seen first (hypergeometric, by brute force).
    const actual = own.k / own.n;
    let raw = 0;
    let pooled = 0;
    let pairs = 0;
    for (let a = 0; a < own.n; a++) {
      for (let b = a + 1; b < own.n; b++) {
        const j = (a < own.k ? 1 : 0) + (b < own.k ? 1 : 0);
        raw += Math.abs(j / 2 - actual);
        pooled += Math.abs((prior.alpha + j) / (prior.alpha + prior.beta + 2) - actual);
        pairs++;
      }
    }
    expect(row.errorRaw).toBeCloseTo(raw / pairs, 8);
    expect(row.errorPooled).toBeCloseTo(pooled / pairs, 8);
  });

  it('filters by builder and construction years', async () => {
    const all = (await manager.get('/api/insight/builders')).body as BuilderComparisonDto;
    const builderId = all.rows[0].builderId!;
    const year = all.rows[0].yearBuilt!;
    const res = await manager.get(`/api/insight/builders?builderId=${builderId}&yearFrom=${year}&yearTo=${year}`);
    expect(res.status).toBe(200);
    expect(res.body.rows.length).toBeGreaterThan(0);
    for (const r of res.body.rows as ComparisonRow[]) expect([r.builderId, r.yearBuilt]).toEqual([builderId, year]);
    const bad = await manager.get('/api/insight/builders?yearFrom=2010&yearTo=2005');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].field).toBe('yearTo');
  });

  it('is for managers, estimators and admins only, and shows each company only its own builders', async () => {
    for (const role of ['technician', 'sales'] as const) {
      const client = new ApiClient(app.url);
      await client.signIn(demoUser(role));
      expect((await client.get('/api/insight/builders')).status).toBe(403);
    }
    const estimator = new ApiClient(app.url);
    await estimator.signIn(demoUser('estimator'));
    expect((await estimator.get('/api/insight/builders')).status).toBe(200);
    expect((await new ApiClient(app.url).get('/api/insight/builders')).status).toBe(401);

    const other = new ApiClient(app.url);
    await other.signIn(otherCompanyUser('admin'));
    const theirs = (await other.get('/api/insight/builders')).body as BuilderComparisonDto;
    const ours = (await manager.get('/api/insight/builders')).body as BuilderComparisonDto;
    const ourBuilders = new Set(ours.rows.map((r) => r.builderId));
    expect(theirs.rows.length).toBeGreaterThan(0);
    for (const r of theirs.rows) expect(ourBuilders.has(r.builderId)).toBe(false);
    // Another company's community id filters to nothing rather than leaking.
    expect(((await other.get(`/api/insight/builders?communityId=${tamarack.id}`)).body as BuilderComparisonDto).rows).toEqual([]);
  });
});
