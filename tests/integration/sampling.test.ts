import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser, otherCompanyUser } from '../setup/demo.js';
import { decodeTile, tileFor } from '../setup/tiles.js';
import type { SampleSizeDto, SamplingPlanDto } from '../../shared/schemas/sampling.js';

let app: TestApp;
let estimator: ApiClient;
let companyId: string;
let community: { id: string; name: string };

beforeAll(async () => {
  app = await startTestApp();
  estimator = new ApiClient(app.url);
  companyId = (await estimator.signIn(demoUser('estimator'))).companyId;
  const communities = (await estimator.get('/api/communities')).body.communities as { id: string; name: string }[];
  community = communities.find((c) => c.name === 'Harrier Ridge')!;
});
afterAll(() => app.close());

/** Cochran, Sampling Techniques (3rd ed., 1977) §4.4: n₀ = z²p(1−p)/d², n = n₀ / (1 + (n₀ − 1)/N), rounded up (formula from memory). */
function cochran(N: number, d: number, p: number) {
  const z = 1.959963984540054; // Φ⁻¹(0.975)
  const n0 = (z * z * p * (1 - p)) / (d * d);
  return Math.ceil(n0 / (1 + (n0 - 1) / N));
}

async function sqlCounts() {
  const { rows } = await app.database.pool.query(
    `select count(*)::int as total, count(*) filter (where sampled)::int as sampled,
            count(*) filter (where not sampled and not do_not_contact and outcome <> 'declined')::int as eligible
     from homes where company_id = $1 and community_id = $2`,
    [companyId, community.id],
  );
  return rows[0] as { total: number; sampled: number; eligible: number };
}

describe('sampling plans', () => {
  it("sizes the sample by Cochran's formula with the finite-population correction for the community's homes", async () => {
    const res = await estimator.get(`/api/sampling/size?communityId=${community.id}&marginOfError=0.1&rateSource=assumed&expectedRate=0.5`);
    expect(res.status).toBe(200);
    const size = res.body.size as SampleSizeDto;
    const counts = await sqlCounts();
    expect(size.homesTotal).toBe(counts.total);
    expect(size.alreadySampled).toBe(counts.sampled);
    expect(size.eligible).toBe(counts.eligible);
    expect(size.sampleSize).toBe(cochran(counts.total, 0.1, 0.5));
    expect(size.toVisit).toBe(Math.min(counts.eligible, size.sampleSize - counts.sampled));
    // A wider margin needs fewer homes.
    const wider = (await estimator.get(`/api/sampling/size?communityId=${community.id}&marginOfError=0.2&rateSource=assumed&expectedRate=0.5`)).body.size;
    expect(wider.sampleSize).toBe(cochran(counts.total, 0.2, 0.5));
    expect(wider.sampleSize).toBeLessThan(size.sampleSize);
  });

  it('can size from the observed rate, pooled so that a handful of homes cannot make it zero', async () => {
    const res = await estimator.get(`/api/sampling/size?communityId=${community.id}&marginOfError=0.1&rateSource=observed`);
    expect(res.status).toBe(200);
    expect(res.body.size.expectedRate).toBeGreaterThan(0);
    expect(res.body.size.expectedRate).toBeLessThan(0.5);
    expect(res.body.size.rateNote).toMatch(/observed/);
  });

  it('picks unsampled, contactable homes spread over the community, saved as one plan', async () => {
    const res = await estimator.post('/api/sampling/plans', { communityId: community.id, marginOfError: 0.15, rateSource: 'assumed', expectedRate: 0.5 });
    expect(res.status).toBe(201);
    const plan = res.body.plan as SamplingPlanDto;
    const counts = await sqlCounts();
    expect(plan.sampleSize).toBe(cochran(counts.total, 0.15, 0.5));
    expect(plan.homes).toHaveLength(Math.min(counts.eligible, plan.sampleSize - counts.sampled));
    const { rows } = await app.database.pool.query(
      `select count(*)::int as bad from homes where id = any($1::uuid[]) and (sampled or do_not_contact or community_id <> $2)`,
      [plan.homes.map((h) => h.id), community.id],
    );
    expect(rows[0].bad).toBe(0);
    // Spread, not clustered: the plan covers most of the community's streets (common practice: stratify by street).
    const { rows: streets } = await app.database.pool.query(`select count(distinct street)::int as n from homes where community_id = $1`, [community.id]);
    const planStreets = new Set(plan.homes.map((h) => h.street)).size;
    expect(planStreets).toBeGreaterThanOrEqual(Math.min(plan.homes.length, streets[0].n) * 0.6);
    const listed = (await estimator.get(`/api/sampling/plans?communityId=${community.id}`)).body.plans;
    expect(listed[0].id).toBe(plan.id);
    expect((await estimator.get(`/api/sampling/plans/${plan.id}`)).body.plan.homes).toHaveLength(plan.homes.length);
  });

  it('shows the latest plan on the map and tells technicians to sample those homes', async () => {
    const plan = (await estimator.get(`/api/sampling/plans?communityId=${community.id}`)).body.plans[0];
    const detail = (await estimator.get(`/api/sampling/plans/${plan.id}`)).body.plan as SamplingPlanDto;
    const target = detail.homes[0];
    const tech = new ApiClient(app.url);
    await tech.signIn(demoUser('technician'));
    expect((await tech.get(`/api/homes/${target.id}`)).body.planned).toBe(true);
    const { rows } = await app.database.pool.query(
      `select id from homes where community_id = $1 and not (id = any($2::uuid[])) limit 1`,
      [community.id, detail.homes.map((h) => h.id)],
    );
    expect((await tech.get(`/api/homes/${rows[0].id}`)).body.planned).toBe(false);

    const { z, x, y } = tileFor(target.lon, target.lat, 16);
    const res = await fetch(`${app.url}/tiles/homes/${z}/${x}/${y}.pbf`, { headers: { Cookie: tech.cookie } });
    const layer = decodeTile(new Uint8Array(await res.arrayBuffer())).layers.homes;
    // Tile features carry the home's short number (ref) as their id.
    const features = Array.from({ length: layer.length }, (_, i) => {
      const f = layer.feature(i);
      // `planned` is in a feature only when true (absent values are left out of the tile).
      return { ref: f.id, planned: f.properties.planned === true, outcome: f.properties.outcome };
    });
    const { rows: planRefs } = await app.database.pool.query(`select ref::int as ref, id::text as id from homes where id = any($1::uuid[])`, [detail.homes.map((h) => h.id)]);
    const targetRef = planRefs.find((r) => r.id === target.id)!.ref;
    expect(features.find((f) => f.ref === targetRef)?.planned).toBe(true);
    const plannedRefs = new Set(planRefs.map((r) => r.ref));
    for (const f of features) expect(f.planned).toBe(plannedRefs.has(f.ref) && f.outcome === 'not_visited');
  });

  it('refuses bad input with the field named, other roles, and other companies', async () => {
    const missing = await estimator.post('/api/sampling/plans', { communityId: community.id, marginOfError: 0.1, rateSource: 'assumed' });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields[0].field).toBe('expectedRate');
    const tooWide = await estimator.post('/api/sampling/plans', { communityId: community.id, marginOfError: 0.9, expectedRate: 0.5 });
    expect(tooWide.status).toBe(400);
    expect(tooWide.body.error.fields[0].field).toBe('marginOfError');

    const tech = new ApiClient(app.url);
    await tech.signIn(demoUser('technician'));
    expect((await tech.post('/api/sampling/plans', { communityId: community.id, marginOfError: 0.1, expectedRate: 0.5 })).status).toBe(403);

    const other = new ApiClient(app.url);
    await other.signIn(otherCompanyUser('admin'));
    expect((await other.post('/api/sampling/plans', { communityId: community.id, marginOfError: 0.1, expectedRate: 0.5 })).status).toBe(404);
    const plan = (await estimator.get(`/api/sampling/plans?communityId=${community.id}`)).body.plans[0];
    expect((await other.get(`/api/sampling/plans/${plan.id}`)).status).toBe(404);
  });
});
