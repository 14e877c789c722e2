import fs from 'node:fs';
import { fileURLToPath } from 'node:url';
import { sql } from 'drizzle-orm';
import type { Database } from './client.js';
import {
  builders,
  communities,
  communityBuilders,
  companies,
  fans,
  homes,
  radonTests,
  users,
} from './schema/tables.js';
import { visits } from './schema/tables.js';
import { hashPassword } from '../lib/passwords.js';
import { addressKey } from '../../shared/domain/address.js';
import type { OutcomeTest, OutcomeVisit } from '../../shared/domain/outcome.js';
import { summariseHome } from '../modules/homes/home-summary.js';
import { inWcToPa, pciLToBqM3 } from '../../shared/domain/units.js';

const demoDir = fileURLToPath(new URL('../../data/demo/', import.meta.url));

/* Shapes of the generated demo files (see data/README.md). */
interface Scenario {
  companies: {
    key: string;
    name: string;
    settings: { actionLevelBqM3: number; activationPriceCents: number; reworkPriceCents: number };
    users: { email: string; name: string; role: string; password: string }[];
  }[];
  builders: { key: string; companyKey: string; name: string; notes: string }[];
  fans: { key: string; companyKey: string; name: string; maxStaticInWc: number; curve: { flowCfm: number; staticInWc: number }[] }[];
  homes: {
    key: string;
    companyKey: string;
    communityKey: string | null;
    builderKey: string | null;
    number: string;
    street: string;
    unit: string | null;
    city: string;
    state: string;
    zip: string;
    lon: number;
    lat: number;
    yearBuilt: number | null;
    foundation: string | null;
    passiveSystem: string;
    pipeSizeIn: number | null;
    suctionPointNote: string;
    ownerName: string;
    mailingAddress: string;
    doNotContact: boolean;
    footprint?: [number, number][];
  }[];
  visits: {
    key: string;
    homeKey: string;
    technicianEmail: string;
    visitedOn: string;
    status: string;
    fanKey: string | null;
    fanLocation: string;
    vacuumInWc: number | null;
    pipeSizeIn: number | null;
    pipeLengthFt: number | null;
    elbows: number | null;
    pipeEntry: string;
    subSlabMaterial: string;
    pressureField: { label: string; distanceFt: number; differentialPa: number }[];
    reworkNeeded: boolean;
    reworkDone: boolean;
    reworkReasons: string[];
    notes: string;
  }[];
  radonTests: {
    key: string;
    homeKey: string;
    kind: string;
    device: string;
    startedAt: string;
    endedAt: string;
    resultPciL: number;
    sideBySideGroup: string | null;
  }[];
}

interface CommunityFeature {
  geometry: { type: 'Polygon'; coordinates: number[][][] };
  properties: {
    key: string;
    companyKey: string;
    name: string;
    builderKeys: string[];
    yearFrom: number;
    yearTo: number;
    jurisdiction: string;
    passiveRequired: boolean;
  };
}

export function readScenario(): { scenario: Scenario; communityFeatures: CommunityFeature[] } {
  const scenario = JSON.parse(fs.readFileSync(demoDir + 'scenario.json', 'utf8')) as Scenario;
  const communityFeatures = (JSON.parse(fs.readFileSync(demoDir + 'communities.geojson', 'utf8')) as { features: CommunityFeature[] }).features;
  return { scenario, communityFeatures };
}

// Map.groupBy arrives in Node 21; this runs on Node 20.
function groupBy<T>(rows: T[], key: (row: T) => string): Map<string, T[]> {
  const groups = new Map<string, T[]>();
  for (const row of rows) groups.set(key(row), [...(groups.get(key(row)) ?? []), row]);
  return groups;
}

async function chunked<T>(rows: T[], size: number, write: (chunk: T[]) => Promise<unknown>) {
  for (let i = 0; i < rows.length; i += size) await write(rows.slice(i, i + size));
}

/** Loads the demo scenario in one transaction; returns false (and writes nothing) if any company exists. */
export async function seedDemo(database: Database): Promise<boolean> {
  const { db } = database;
  const [{ n }] = await db.select({ n: sql<number>`count(*)::int` }).from(companies);
  if (n > 0) return false;
  const { scenario, communityFeatures } = readScenario();

  // Hash each distinct password once: scrypt is deliberately slow.
  const hashes = new Map<string, string>();
  for (const u of scenario.companies.flatMap((c) => c.users)) {
    if (!hashes.has(u.password)) hashes.set(u.password, await hashPassword(u.password));
  }

  await db.transaction(async (tx) => {
    const companyIds = new Map<string, string>();
    const userIds = new Map<string, string>();
    for (const c of scenario.companies) {
      const [row] = await tx
        .insert(companies)
        .values({ name: c.name, ...c.settings })
        .returning({ id: companies.id });
      companyIds.set(c.key, row.id);
      const inserted = await tx
        .insert(users)
        .values(c.users.map((u) => ({ companyId: row.id, email: u.email, name: u.name, role: u.role, passwordHash: hashes.get(u.password)! })))
        .returning({ id: users.id, email: users.email });
      for (const u of inserted) userIds.set(u.email, u.id);
    }

    const builderIds = new Map<string, string>();
    for (const b of scenario.builders) {
      const [row] = await tx
        .insert(builders)
        .values({ companyId: companyIds.get(b.companyKey)!, name: b.name, notes: b.notes })
        .returning({ id: builders.id });
      builderIds.set(b.key, row.id);
    }

    const communityIds = new Map<string, string>();
    for (const f of communityFeatures) {
      const p = f.properties;
      const [row] = await tx
        .insert(communities)
        .values({
          companyId: companyIds.get(p.companyKey)!,
          name: p.name,
          boundary: sql`ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(f.geometry)}), 4326))` as unknown as string,
          yearFrom: p.yearFrom,
          yearTo: p.yearTo,
          jurisdiction: p.jurisdiction,
          passiveRequired: p.passiveRequired,
        })
        .returning({ id: communities.id });
      communityIds.set(p.key, row.id);
      if (p.builderKeys.length) {
        await tx.insert(communityBuilders).values(p.builderKeys.map((k) => ({ communityId: row.id, builderId: builderIds.get(k)! })));
      }
    }

    const fanIds = new Map<string, string>();
    for (const f of scenario.fans) {
      const [row] = await tx
        .insert(fans)
        .values({ companyId: companyIds.get(f.companyKey)!, name: f.name, maxStaticInWc: f.maxStaticInWc, curve: f.curve })
        .returning({ id: fans.id });
      fanIds.set(f.key, row.id);
    }

    // Outcomes are derived from the visits and tests, exactly as the app does after each visit.
    const visitsByHome = groupBy(scenario.visits, (v) => v.homeKey);
    const testsByHome = groupBy(scenario.radonTests, (t) => t.homeKey);
    const actionLevel = new Map(scenario.companies.map((c) => [c.key, c.settings.actionLevelBqM3]));

    const homeIds = new Map<string, string>();
    await chunked(scenario.homes, 500, async (chunk) => {
      const rows = await tx
        .insert(homes)
        .values(
          chunk.map((h) => ({
            companyId: companyIds.get(h.companyKey)!,
            communityId: h.communityKey ? communityIds.get(h.communityKey)! : null,
            builderId: h.builderKey ? builderIds.get(h.builderKey)! : null,
            number: h.number,
            street: h.street,
            unit: h.unit,
            city: h.city,
            state: h.state,
            zip: h.zip,
            addressKey: addressKey(h),
            location: sql`ST_SetSRID(ST_MakePoint(${h.lon}, ${h.lat}), 4326)` as unknown as string,
            yearBuilt: h.yearBuilt,
            foundation: h.foundation,
            passiveSystem: h.passiveSystem,
            pipeSizeIn: h.pipeSizeIn,
            suctionPointNote: h.suctionPointNote,
            footprint: h.footprint ? { type: 'Polygon', coordinates: [h.footprint] } : null,
            ownerName: h.ownerName,
            mailingAddress: h.mailingAddress,
            doNotContact: h.doNotContact,
            ...summariseHome(
              (visitsByHome.get(h.key) ?? []).map((v) => ({
                ...(v as unknown as OutcomeVisit),
                vacuumPa: v.vacuumInWc == null ? null : inWcToPa(v.vacuumInWc),
              })),
              (testsByHome.get(h.key) ?? []).map(
                (t): OutcomeTest => ({ ...(t as unknown as OutcomeTest), resultBqM3: pciLToBqM3(t.resultPciL) }),
              ),
              actionLevel.get(h.companyKey)!,
            ),
          })),
        )
        .returning({ id: homes.id });
      chunk.forEach((h, i) => homeIds.set(h.key, rows[i].id));
    });

    const homeCompany = new Map(scenario.homes.map((h) => [h.key, companyIds.get(h.companyKey)!]));
    await chunked(scenario.visits, 500, (chunk) =>
      tx.insert(visits).values(
        chunk.map((v) => ({
          id: crypto.randomUUID(),
          companyId: homeCompany.get(v.homeKey)!,
          homeId: homeIds.get(v.homeKey)!,
          technicianId: userIds.get(v.technicianEmail) ?? null,
          visitedOn: v.visitedOn,
          status: v.status,
          fanId: v.fanKey ? fanIds.get(v.fanKey)! : null,
          fanLocation: v.fanLocation ?? '',
          fanActivatedAt: v.status === 'completed' ? new Date(`${v.visitedOn}T15:00:00Z`) : null,
          vacuumPa: v.vacuumInWc == null ? null : inWcToPa(v.vacuumInWc),
          pipeSizeIn: v.pipeSizeIn,
          pipeLengthFt: v.pipeLengthFt,
          elbows: v.elbows,
          pipeEntry: v.pipeEntry ?? '',
          subSlabMaterial: v.subSlabMaterial,
          pressureField: v.pressureField,
          reworkNeeded: v.reworkNeeded,
          reworkDone: v.reworkDone,
          reworkReasons: v.reworkReasons,
          notes: v.notes ?? '',
        })),
      ),
    );
    await chunked(scenario.radonTests, 500, (chunk) =>
      tx.insert(radonTests).values(
        chunk.map((t) => ({
          companyId: homeCompany.get(t.homeKey)!,
          homeId: homeIds.get(t.homeKey)!,
          kind: t.kind,
          device: t.device,
          startedAt: new Date(t.startedAt),
          endedAt: new Date(t.endedAt),
          resultBqM3: pciLToBqM3(t.resultPciL),
          sideBySideGroup: t.sideBySideGroup,
        })),
      ),
    );
  });
  return true;
}
