// Invariants of the committed demo scenario. The files are read from disk (what the app seeds from),
// and the generator is re-run in memory to prove the committed files are its exact, repeatable output.
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import * as turf from '@turf/turf';
import type { Feature, FeatureCollection, LineString, Polygon } from 'geojson';
import {
  DEMO_FILES,
  DEMO_PASSWORD,
  generateDemo,
  serialiseDemo,
  type CommunityProps,
  type DemoScenario,
  type LotProps,
  type StreetProps,
} from './generate';

const dataDir = dirname(fileURLToPath(import.meta.url));
const read = <T>(rel: string): T => JSON.parse(readFileSync(join(dataDir, rel), 'utf8')) as T;

const scenario = read<DemoScenario>(DEMO_FILES.scenario);
const streets = read<FeatureCollection<LineString, StreetProps>>(DEMO_FILES.streets);
const lots = read<FeatureCollection<Polygon, LotProps>>(DEMO_FILES.lots);
const communities = read<FeatureCollection<Polygon, CommunityProps>>(DEMO_FILES.communities);

const MAIN = scenario.companies[0].key;
const mainHomes = scenario.homes.filter((h) => h.companyKey === MAIN);
const homeByKey = new Map(scenario.homes.map((h) => [h.key, h]));
const ACTION_LEVEL_PCI_L = scenario.companies[0].settings.actionLevelBqM3 / 37; // 1 pCi/L = 37 Bq/m³

/** The block a street-range geocoder would pick: same name, number inside the side's range. */
function findSegment(street: string, n: number): Feature<LineString, StreetProps>[] {
  const odd = n % 2 === 1;
  return streets.features.filter((f) => {
    const p = f.properties;
    if (p.name !== street) return false;
    const [from, to] = odd ? [p.leftFrom, p.leftTo] : [p.rightFrom, p.rightTo];
    return n >= Math.min(from, to) && n <= Math.max(from, to) && from % 2 === n % 2;
  });
}

describe('demo scenario files', () => {
  it('has at least 1,500 homes for the main company and a small second company', () => {
    expect(mainHomes.length).toBeGreaterThanOrEqual(1500);
    const other = scenario.homes.filter((h) => h.companyKey !== MAIN);
    expect(other.length).toBeGreaterThanOrEqual(60);
    expect(other.length).toBeLessThanOrEqual(120);
  });

  it('gives the main company 6–10 communities built between 2003 and 2021', () => {
    const mine = communities.features.filter((f) => f.properties.companyKey === MAIN);
    expect(mine.length).toBeGreaterThanOrEqual(6);
    expect(mine.length).toBeLessThanOrEqual(10);
    for (const c of mine) {
      expect(c.properties.yearFrom).toBeGreaterThanOrEqual(2003);
      expect(c.properties.yearTo).toBeLessThanOrEqual(2021);
      expect(c.properties.yearFrom).toBeLessThanOrEqual(c.properties.yearTo);
    }
  });

  it('keeps community boundaries apart', () => {
    const fs = communities.features;
    for (let i = 0; i < fs.length; i++) {
      for (let j = i + 1; j < fs.length; j++) {
        expect(turf.intersect(turf.featureCollection([fs[i], fs[j]])), `${fs[i].properties.key} × ${fs[j].properties.key}`).toBeNull();
      }
    }
  });

  it('puts every community home inside its community polygon, built in its years, by one of its builders', () => {
    const byKey = new Map(communities.features.map((f) => [f.properties.key, f]));
    for (const h of scenario.homes.filter((x) => x.communityKey)) {
      const c = byKey.get(h.communityKey!)!;
      expect(turf.booleanPointInPolygon([h.lon, h.lat], c), h.key).toBe(true);
      expect(c.properties.companyKey).toBe(h.companyKey);
      expect(h.yearBuilt).toBeGreaterThanOrEqual(c.properties.yearFrom);
      expect(h.yearBuilt).toBeLessThanOrEqual(c.properties.yearTo);
      expect(c.properties.builderKeys).toContain(h.builderKey);
    }
  });

  it('numbers every home inside its block range on the right side, so range interpolation lands within 30 m', () => {
    for (const h of scenario.homes) {
      const n = Number(h.number);
      expect(Number.isInteger(n), h.key).toBe(true);
      const candidates = findSegment(h.street, n);
      expect(candidates, `${h.number} ${h.street}`).toHaveLength(1);
      const seg = candidates[0];
      const p = seg.properties;
      expect(h.zip).toBe(p.zip);
      const [from, to] = n % 2 === 1 ? [p.leftFrom, p.leftTo] : [p.rightFrom, p.rightTo];
      expect(to).toBeGreaterThan(from); // ranges increase along the line
      const len = turf.length(seg, { units: 'meters' });
      const at = turf.along(seg, (len * (n - from)) / (to - from), { units: 'meters' });
      const miss = turf.distance(at, [h.lon, h.lat], { units: 'meters' });
      expect(miss, `${h.number} ${h.street}`).toBeLessThan(30);

      // Odd numbers on the left of the line's direction, even on the right.
      const near = turf.nearestPointOnLine(seg, [h.lon, h.lat]);
      const i = Math.min(near.properties.index, seg.geometry.coordinates.length - 2);
      const [a, b] = [seg.geometry.coordinates[i], seg.geometry.coordinates[i + 1]];
      const k = Math.cos((h.lat * Math.PI) / 180);
      const cross = (b[0] - a[0]) * k * (h.lat - a[1]) - (b[1] - a[1]) * (h.lon - a[0]) * k;
      expect(cross > 0 ? 'left' : 'right', `${h.number} ${h.street}`).toBe(n % 2 === 1 ? 'left' : 'right');
    }
  });

  it('uses USPS standard suffixes and one full name per street', () => {
    const suffixes = new Set(['St', 'Ave', 'Dr', 'Ct', 'Ln', 'Way', 'Cir', 'Pl', 'Trl', 'Blvd', 'Rd']);
    for (const f of streets.features) expect(suffixes.has(f.properties.name.split(' ').at(-1)!), f.properties.name).toBe(true);
    expect(new Set(streets.features.map((f) => f.properties.id)).size).toBe(streets.features.length);
  });

  it('has one address per home within each company', () => {
    for (const company of scenario.companies) {
      const addresses = scenario.homes
        .filter((h) => h.companyKey === company.key)
        .map((h) => `${h.number}|${h.street}|${h.unit ?? ''}|${h.zip}`);
      expect(new Set(addresses).size).toBe(addresses.length);
    }
  });

  it('has one lot per home, containing the home, and closed house outlines', () => {
    expect(lots.features).toHaveLength(scenario.homes.length);
    const lotByHome = new Map(lots.features.map((f) => [f.properties.homeKey, f]));
    for (const h of scenario.homes) {
      const lot = lotByHome.get(h.key)!;
      expect(turf.booleanPointInPolygon([h.lon, h.lat], lot), h.key).toBe(true);
      expect(h.footprint[0]).toEqual(h.footprint[h.footprint.length - 1]);
      expect(turf.booleanPointInPolygon([h.lon, h.lat], turf.polygon([h.footprint])), h.key).toBe(true);
    }
  });

  it('gives the main company exactly one user per role, all with the documented password', () => {
    const roles = scenario.companies[0].users.map((u) => u.role).sort();
    expect(roles).toEqual(['admin', 'estimator', 'manager', 'sales', 'technician']);
    const emails = scenario.companies.flatMap((c) => c.users.map((u) => u.email));
    expect(new Set(emails).size).toBe(emails.length);
    for (const u of scenario.companies.flatMap((c) => c.users)) expect(u.password).toBe(DEMO_PASSWORD);
    expect(scenario.companies[1].users.map((u) => u.role).sort()).toEqual(['admin', 'technician']);
  });

  it('visits about 10% of the main company’s homes, with that company’s technician and fans', () => {
    const visited = new Set(scenario.visits.map((v) => v.homeKey));
    const share = mainHomes.filter((h) => visited.has(h.key)).length / mainHomes.length;
    expect(share).toBeGreaterThan(0.08);
    expect(share).toBeLessThan(0.12);
    for (const v of scenario.visits) {
      const home = homeByKey.get(v.homeKey)!;
      const company = scenario.companies.find((c) => c.key === home.companyKey)!;
      expect(company.users.find((u) => u.email === v.technicianEmail)?.role).toBe('technician');
      if (v.fanKey) {
        const fan = scenario.fans.find((f) => f.key === v.fanKey)!;
        expect(fan.companyKey).toBe(home.companyKey);
        expect(v.vacuumInWc!).toBeLessThanOrEqual(fan.maxStaticInWc);
      }
      if (v.status !== 'completed') expect(v.fanKey).toBeNull();
    }
  });

  it('keeps radon tests plausible: 48 h minimum, post tests a day after the fan, side-by-side pairs together', () => {
    const visitByHome = new Map(scenario.visits.map((v) => [v.homeKey, v]));
    const groups = new Map<string, number>();
    for (const t of scenario.radonTests) {
      const hours = (Date.parse(t.endedAt) - Date.parse(t.startedAt)) / 3_600_000;
      expect(hours).toBeGreaterThanOrEqual(48);
      if (t.kind === 'post') {
        const v = visitByHome.get(t.homeKey)!;
        expect(v.status).toBe('completed');
        // The visit hour is unknown, so measure from the end of the visit day.
        expect(Date.parse(t.startedAt) - Date.parse(`${v.visitedOn}T00:00:00Z`)).toBeGreaterThanOrEqual(48 * 3_600_000);
      }
      if (t.sideBySideGroup) groups.set(t.sideBySideGroup, (groups.get(t.sideBySideGroup) ?? 0) + 1);
    }
    expect(groups.size).toBeGreaterThanOrEqual(3);
    for (const n of groups.values()) expect(n).toBeGreaterThanOrEqual(2);
  });

  it('flags rework wherever a post-test result (side-by-side averaged) reaches the action level', () => {
    for (const v of scenario.visits.filter((x) => x.status === 'completed')) {
      const posts = scenario.radonTests.filter((t) => t.homeKey === v.homeKey && t.kind === 'post');
      const sets = new Map<string, number[]>();
      for (const t of posts) sets.set(t.sideBySideGroup ?? t.key, [...(sets.get(t.sideBySideGroup ?? t.key) ?? []), t.resultPciL]);
      const above = [...sets.values()].some((r) => r.reduce((a, b) => a + b, 0) / r.length >= ACTION_LEVEL_PCI_L);
      if (above) expect(v.reworkNeeded, v.key).toBe(true);
    }
  });

  it('shows real contrast in failure rate between builders (max − min ≥ 0.2)', () => {
    const tally = new Map<string, { n: number; k: number }>();
    for (const v of scenario.visits.filter((x) => x.status === 'completed')) {
      const home = homeByKey.get(v.homeKey)!;
      if (home.companyKey !== MAIN || !home.builderKey) continue;
      const t = tally.get(home.builderKey) ?? { n: 0, k: 0 };
      t.n += 1;
      if (v.reworkNeeded) t.k += 1;
      tally.set(home.builderKey, t);
    }
    const rates = [...tally.values()].filter((t) => t.n >= 5).map((t) => t.k / t.n);
    expect(rates.length).toBeGreaterThanOrEqual(3);
    expect(Math.max(...rates) - Math.min(...rates)).toBeGreaterThanOrEqual(0.2);
  });

  it('is deterministic, and the committed files are exactly its output', () => {
    const first = serialiseDemo(generateDemo());
    const second = serialiseDemo(generateDemo());
    expect(second).toEqual(first);
    for (const [rel, text] of Object.entries(first)) {
      expect(readFileSync(join(dataDir, rel), 'utf8') === text, `${rel} is stale: run the generator`).toBe(true);
    }
  });
});
