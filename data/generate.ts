/**
 * Deterministic generator for the Tractwise demo scenario.
 *
 * Everything here is invented: the town of Tarrowby, its streets, builders, companies and people.
 * The coordinates sit on open prairie only so the basemap has somewhere to draw; nothing refers
 * to a real place. One fixed seed drives seedrandom, and no clock or Math.random is read, so two
 * runs write byte-identical files (the tests check this).
 *
 * Geometry is laid out in local metres (x east, y north) around ORIGIN and converted to lon/lat
 * with the same sphere turf uses, so turf's haversine lengths agree with the layout to well under
 * a metre — that is what lets a street-range geocoder land on the homes.
 *
 * Run: node_modules/.bin/tsx data/generate.ts
 */
import seedrandom from 'seedrandom';
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { Feature, FeatureCollection, LineString, Polygon, Position } from 'geojson';

// ---------------------------------------------------------------------------------------------
// Public shapes (the server's seeder can import these types)
// ---------------------------------------------------------------------------------------------

export type StreetClass = 'arterial' | 'collector' | 'local';
export type Role = 'admin' | 'manager' | 'estimator' | 'technician' | 'sales';
export type Foundation = 'slab' | 'basement' | 'crawlspace' | 'mixed';
export type PassiveSystem = 'yes' | 'no' | 'unknown';
export type VisitStatus = 'completed' | 'declined' | 'no_access';
export type SubSlabMaterial = 'clean_gravel' | 'mixed' | 'none' | 'unknown';
export type ReworkReason =
  | 'added_suction_point'
  | 'sealed_opening'
  | 'sealed_joint'
  | 'rerouted_pipe'
  | 'larger_fan'
  | 'other';
export type DeviceKind = 'continuous_monitor' | 'charcoal' | 'alpha_track' | 'electret';

export interface StreetProps {
  id: string;
  name: string;
  class: StreetClass;
  /** Left side of the line's direction: odd numbers, increasing along the line. */
  leftFrom: number;
  leftTo: number;
  /** Right side: even numbers, increasing along the line. */
  rightFrom: number;
  rightTo: number;
  zip: string;
  city: string;
}

export interface LotProps {
  homeKey: string;
}

export interface LandUseProps {
  kind: 'park' | 'water' | 'school';
  name: string;
}

export interface CommunityProps {
  key: string;
  companyKey: string;
  name: string;
  builderKeys: string[];
  yearFrom: number;
  yearTo: number;
  jurisdiction: string;
  passiveRequired: boolean;
}

export interface DemoUser {
  email: string;
  name: string;
  role: Role;
  password: string;
}

export interface DemoCompany {
  key: string;
  name: string;
  settings: { actionLevelBqM3: number; activationPriceCents: number; reworkPriceCents: number };
  users: DemoUser[];
}

export interface DemoBuilder {
  key: string;
  companyKey: string;
  name: string;
  notes: string;
}

export interface DemoFan {
  key: string;
  companyKey: string;
  name: string;
  maxStaticInWc: number;
  curve: { flowCfm: number; staticInWc: number }[];
}

export interface DemoHome {
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
  yearBuilt: number;
  foundation: Foundation;
  passiveSystem: PassiveSystem;
  pipeSizeIn: 3 | 4 | null;
  suctionPointNote: string;
  ownerName: string;
  mailingAddress: string;
  doNotContact: boolean;
  footprint: Position[];
}

export interface DemoVisit {
  key: string;
  homeKey: string;
  technicianEmail: string;
  visitedOn: string;
  status: VisitStatus;
  /** Fan installed at activation; its curve explains vacuumInWc. Null when nothing was installed. */
  fanKey: string | null;
  fanLocation: string | null;
  /** Manometer reading at activation, before any rework (rework results are in the notes). */
  vacuumInWc: number | null;
  pipeSizeIn: 3 | 4 | null;
  pipeLengthFt: number | null;
  elbows: number | null;
  pipeEntry: string | null;
  subSlabMaterial: SubSlabMaterial;
  pressureField: { label: string; distanceFt: number; differentialPa: number }[];
  reworkNeeded: boolean;
  reworkDone: boolean;
  reworkReasons: ReworkReason[];
  notes: string;
}

export interface DemoRadonTest {
  key: string;
  homeKey: string;
  kind: 'pre' | 'post';
  device: DeviceKind;
  startedAt: string;
  endedAt: string;
  resultPciL: number;
  sideBySideGroup: string | null;
}

export interface DemoScenario {
  town: { name: string; state: string; zip: string; center: [number, number]; bbox: [number, number, number, number] };
  companies: DemoCompany[];
  builders: DemoBuilder[];
  fans: DemoFan[];
  homes: DemoHome[];
  visits: DemoVisit[];
  radonTests: DemoRadonTest[];
}

export interface DemoData {
  streets: FeatureCollection<LineString, StreetProps>;
  lots: FeatureCollection<Polygon, LotProps>;
  landuse: FeatureCollection<Polygon | LineString, LandUseProps>;
  communities: FeatureCollection<Polygon, CommunityProps>;
  scenario: DemoScenario;
}

// ---------------------------------------------------------------------------------------------
// Fixed scenario constants
// ---------------------------------------------------------------------------------------------

export const DEMO_SEED = 'tractwise-demo-v1';
export const DEMO_PASSWORD = 'demo-pass-2026';
export const DEMO_FILES = {
  streets: 'demo/streets.geojson',
  lots: 'demo/lots.geojson',
  landuse: 'demo/landuse.geojson',
  communities: 'demo/communities.geojson',
  scenario: 'demo/scenario.json',
} as const;

const TOWN = 'Tarrowby';
// An invented two-letter state and unassigned ZIPs, so no address can be mistaken for a real one.
const STATE = 'ZZ';
const ZIP_WEST = '00090';
const ZIP_EAST = '00091';
const ORIGIN: [number, number] = [-96.62, 41.18];
const ACTION_LEVEL_PCI_L = 4; // 148 Bq/m³ / 37

// turf measures on a sphere of this radius; laying out on the same sphere keeps lengths consistent.
const R_EARTH_M = 6371008.8;
const M_PER_DEG_LAT = (R_EARTH_M * Math.PI) / 180;
const M_PER_DEG_LON = M_PER_DEG_LAT * Math.cos((ORIGIN[1] * Math.PI) / 180);

// Lot and house layout, in metres from the street centreline.
const LOT_NEAR_M = 8; // right-of-way half width
const LOT_FAR_M = 42; // about a 112 ft deep lot
const HOME_OFFSET_M = 15; // where the home's point sits; a range geocoder offsets about as much
const HOUSE_NEAR_M = 12.5; // front wall of the house body (garage sticks out in front)
const ROAD_INSET_M = 20; // community boundary stays off the arterial/collector right-of-way
const EDGE_INSET_M = 6; // boundary inset where a community edge is open land or another phase
const EDGE_MARGIN_M = 48; // street centreline to the community edge: room for a lot plus a gap
const CORNER_MARGIN_M = 44; // lots stop short of a cross street so corner lots do not overlap its lots
const DEAD_END_MARGIN_M = 6;
const ROW_SPACING_MIN_M = 100; // two lot depths back to back, plus a rear gap
const COURT_LEN_M = 100;

// ---------------------------------------------------------------------------------------------
// Random numbers
// ---------------------------------------------------------------------------------------------

class Rng {
  private readonly next: () => number;
  constructor(seed: string) {
    this.next = seedrandom(seed);
  }
  float(): number {
    return this.next();
  }
  range(a: number, b: number): number {
    return a + (b - a) * this.next();
  }
  int(a: number, b: number): number {
    return a + Math.floor(this.next() * (b - a + 1));
  }
  chance(p: number): boolean {
    return this.next() < p;
  }
  pick<T>(items: readonly T[]): T {
    return items[Math.floor(this.next() * items.length)];
  }
  weighted<K extends string>(weights: Record<K, number>): K {
    const keys = Object.keys(weights) as K[];
    const total = keys.reduce((sum, k) => sum + weights[k], 0);
    let r = this.next() * total;
    for (const k of keys) {
      r -= weights[k];
      if (r < 0) return k;
    }
    return keys[keys.length - 1];
  }
  normal(): number {
    // Box–Muller; 1 - u keeps log() away from zero.
    const u = 1 - this.next();
    const v = this.next();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  }
  logNormal(median: number, sigma: number): number {
    return median * Math.exp(sigma * this.normal());
  }
  shuffle<T>(items: readonly T[]): T[] {
    const out = items.slice();
    for (let i = out.length - 1; i > 0; i--) {
      const j = Math.floor(this.next() * (i + 1));
      [out[i], out[j]] = [out[j], out[i]];
    }
    return out;
  }
}

// ---------------------------------------------------------------------------------------------
// Small geometry helpers (local metres)
// ---------------------------------------------------------------------------------------------

type P = [number, number];

const round = (v: number, digits: number): number => {
  const f = 10 ** digits;
  const r = Math.round(v * f) / f;
  return r === 0 ? 0 : r; // never write -0
};

function toLonLat([x, y]: P): Position {
  return [round(ORIGIN[0] + x / M_PER_DEG_LON, 6), round(ORIGIN[1] + y / M_PER_DEG_LAT, 6)];
}

function cumulative(pts: P[]): number[] {
  const cum = [0];
  for (let i = 1; i < pts.length; i++) {
    cum.push(cum[i - 1] + Math.hypot(pts[i][0] - pts[i - 1][0], pts[i][1] - pts[i - 1][1]));
  }
  return cum;
}

function pointAlong(pts: P[], cum: number[], s: number): { p: P; dir: P } {
  let i = 1;
  while (i < pts.length - 1 && cum[i] < s) i++;
  const a = pts[i - 1];
  const b = pts[i];
  const len = cum[i] - cum[i - 1];
  const t = len === 0 ? 0 : Math.min(1, Math.max(0, (s - cum[i - 1]) / len));
  return {
    p: [a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t],
    dir: [(b[0] - a[0]) / len, (b[1] - a[1]) / len],
  };
}

/** side +1 = left of the direction of travel, -1 = right. */
function offsetAlong(pts: P[], cum: number[], s: number, off: number, side: 1 | -1): P {
  const { p, dir } = pointAlong(pts, cum, s);
  return [p[0] - dir[1] * off * side, p[1] + dir[0] * off * side];
}

function signedArea(ring: P[]): number {
  let a = 0;
  for (let i = 0; i < ring.length - 1; i++) a += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return a / 2;
}

/** Closes the ring and makes it counter-clockwise, as RFC 7946 asks of exterior rings. */
function closeCcw(ring: P[]): P[] {
  const closed = [...ring, ring[0]];
  return signedArea(closed) < 0 ? closed.reverse() : closed;
}

function pointInRing([x, y]: P, ring: P[]): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/**
 * Separating-axis test on two lot rings, ignoring overlaps thinner than `tolM`. Lots are
 * near-convex quadrilaterals, so treating them as convex is at worst slightly cautious.
 */
function ringsOverlap(a: P[], b: P[], tolM = 0.5): boolean {
  for (const ring of [a, b]) {
    for (let i = 0; i < ring.length - 1; i++) {
      const nx = -(ring[i + 1][1] - ring[i][1]);
      const ny = ring[i + 1][0] - ring[i][0];
      const len = Math.hypot(nx, ny);
      if (len === 0) continue;
      const project = (r: P[]) => r.map(([x, y]) => (x * nx + y * ny) / len);
      const pa = project(a);
      const pb = project(b);
      const overlap = Math.min(Math.max(...pa), Math.max(...pb)) - Math.max(Math.min(...pa), Math.min(...pb));
      if (overlap < tolM) return false;
    }
  }
  return true;
}

function linspace(a: number, b: number, n: number): number[] {
  if (n === 1) return [(a + b) / 2];
  return Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
}

const slug = (s: string): string =>
  s
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '');

const vkey = ([x, y]: P): string => `${x.toFixed(3)},${y.toFixed(3)}`;

// ---------------------------------------------------------------------------------------------
// Scenario plan: companies, builders, communities
// ---------------------------------------------------------------------------------------------

const C1 = 'tarrowby-radon';
const C2 = 'ossing-air';

type Side = 'S' | 'N' | 'W' | 'E';

interface FailureProfile {
  /** Suction pit in a separately poured pad: the fan starves, the field never reaches the house slab. */
  isolatedPad: number;
  /** Native clay fill, little gravel: high vacuum, short field. */
  noGravel: number;
  /** Large openings (tub-drain cutout, open sump, slab joint): low vacuum, high flow. */
  leaky: number;
}

interface CommunityPlan extends CommunityProps {
  region: [number, number, number, number];
  roads: Side[];
  amplitudeM: number; // 0 = straight grid streets
  wavelengthM: number;
  phase: number;
  connectors: number;
  courts: boolean;
  entries: { side: Side; index: number }[];
  frontageM: number;
  rowNames: string[];
  connectorNames: string[];
  courtNames: string[];
  foundation: Record<Foundation, number>;
  passive: Record<PassiveSystem, number>;
  sampleRate: number;
  visitWindow: [string, string];
  failure: FailureProfile;
}

const COMPANIES: DemoCompany[] = [
  {
    key: C1,
    name: 'Tarrowby Radon Co.',
    settings: { actionLevelBqM3: 148, activationPriceCents: 59500, reworkPriceCents: 42500 },
    users: (
      [
        ['admin', 'Nora Kettleby'],
        ['manager', 'Elias Brandwick'],
        ['estimator', 'Tamsin Orrey'],
        ['technician', 'Dario Fenwright'],
        ['sales', 'Lucia Marchbank'],
      ] as [Role, string][]
    ).map(([role, name]) => ({ email: `${role}@tarrowby-radon.test`, name, role, password: DEMO_PASSWORD })),
  },
  {
    key: C2,
    name: 'Ossing Air & Radon',
    settings: { actionLevelBqM3: 148, activationPriceCents: 54900, reworkPriceCents: 39500 },
    users: (
      [
        ['admin', 'Wes Ossing'],
        ['technician', 'Kai Dunmere'],
      ] as [Role, string][]
    ).map(([role, name]) => ({ email: `${role}@ossing-air.test`, name, role, password: DEMO_PASSWORD })),
  },
];

const BUILDERS: DemoBuilder[] = [
  {
    key: 'brackwell',
    companyKey: C1,
    name: 'Brackwell Homes',
    notes:
      'Production builder, slab-on-grade with attached garage. In the 2005–2010 phases the passive riser sits in the garage slab, ' +
      'a separate pour from the house slab, so the suction point is often starved. Phases after the 2012 code update put the pit in the house slab.',
  },
  {
    key: 'ansel-vary',
    companyKey: C1,
    name: 'Ansel & Vary Construction',
    notes: 'Basement homes; 4-inch riser beside the sump in a continuous gravel bed. Few surprises; check sump lids on the early phases.',
  },
  {
    key: 'fenmark',
    companyKey: C1,
    name: 'Fenmark Homes',
    notes:
      'Slab and mixed foundations. Before 2012 many slabs were poured on native clay fill with little gravel: expect high vacuum and a short pressure field.',
  },
  {
    key: 'pellow',
    companyKey: C1,
    name: 'Pellow Custom Homes',
    notes: 'Small custom builder; deep basements, 4-inch risers, sealed sumps.',
  },
  {
    key: 'halvard',
    companyKey: C2,
    name: 'Halvard Homes',
    notes: 'Slab homes; some risers land in the porch pad.',
  },
];

const PIPE_BY_BUILDER: Record<string, 3 | 4> = { brackwell: 3, 'ansel-vary': 4, fenmark: 3, pellow: 4, halvard: 3 };

const CITY_JURISDICTION = 'City of Tarrowby';

const slabMostly: Record<Foundation, number> = { slab: 0.72, basement: 0.05, crawlspace: 0.03, mixed: 0.2 };
const basementMostly: Record<Foundation, number> = { slab: 0.06, basement: 0.86, crawlspace: 0.02, mixed: 0.06 };
const required: Record<PassiveSystem, number> = { yes: 0.9, no: 0.02, unknown: 0.08 };

const COMMUNITIES: CommunityPlan[] = [
  {
    key: 'larkspur-meadows',
    companyKey: C1,
    name: 'Larkspur Meadows',
    builderKeys: ['ansel-vary'],
    yearFrom: 2003,
    yearTo: 2006,
    // Built before annexation, when the county did not require passive systems; the builder fitted them anyway.
    jurisdiction: 'Ellery County (unincorporated at the time)',
    passiveRequired: false,
    region: [-1600, 0, -800, 800],
    roads: ['S', 'N', 'W', 'E'],
    amplitudeM: 0,
    wavelengthM: 1,
    phase: 0,
    connectors: 4,
    courts: false,
    entries: [
      { side: 'W', index: 3 },
      { side: 'E', index: 3 },
      { side: 'S', index: 1 },
      { side: 'N', index: 2 },
    ],
    frontageM: 21,
    rowNames: ['Aster St', 'Bluestem St', 'Coneflower St', 'Dropseed St', 'Everlast St', 'Foxglove St', 'Goldenrod St'],
    connectorNames: ['Larkspur Ave', 'Prairie Smoke Ave', 'Sideoats Ave', 'Yarrow Ave'],
    courtNames: [],
    foundation: basementMostly,
    passive: { yes: 0.68, no: 0.12, unknown: 0.2 },
    sampleRate: 0.07,
    visitWindow: ['2023-04-03', '2023-11-15'],
    failure: { isolatedPad: 0, noGravel: 0.03, leaky: 0.06 },
  },
  {
    key: 'harrier-ridge',
    companyKey: C1,
    name: 'Harrier Ridge',
    builderKeys: ['ansel-vary'],
    yearFrom: 2011,
    yearTo: 2015,
    jurisdiction: CITY_JURISDICTION,
    passiveRequired: true,
    region: [-1600, -400, -800, 0],
    roads: ['N', 'W', 'E'],
    amplitudeM: 15,
    wavelengthM: 600,
    phase: 0.6,
    connectors: 3,
    courts: false,
    entries: [
      { side: 'N', index: 1 },
      { side: 'W', index: 1 },
    ],
    frontageM: 19,
    rowNames: ['Harrier Ridge Dr', 'Kestrel Way', 'Merlin Ln'],
    connectorNames: ['Goshawk Trl', 'Falconer Pl', 'Kite Hollow Ln'],
    courtNames: [],
    foundation: basementMostly,
    passive: required,
    sampleRate: 0.08,
    visitWindow: ['2024-05-01', '2025-03-28'],
    failure: { isolatedPad: 0, noGravel: 0.03, leaky: 0.07 },
  },
  {
    key: 'tamarack-bend-1',
    companyKey: C1,
    name: 'Tamarack Bend Phase 1',
    builderKeys: ['brackwell'],
    yearFrom: 2005,
    yearTo: 2007,
    jurisdiction: CITY_JURISDICTION,
    passiveRequired: true,
    region: [-800, 0, 0, 400],
    roads: ['S', 'W', 'E'],
    amplitudeM: 22,
    wavelengthM: 520,
    phase: 0,
    connectors: 3,
    courts: false,
    entries: [
      { side: 'S', index: 1 },
      { side: 'E', index: 1 },
      { side: 'W', index: 0 },
    ],
    frontageM: 18,
    rowNames: ['Tamarack Bend Dr', 'Larchmere Ln', 'Spruce Hollow Way'],
    connectorNames: ['Hemlock Trl', 'Balsam Pl', 'Fir Knoll Ln'],
    courtNames: [],
    foundation: slabMostly,
    passive: required,
    sampleRate: 0.13,
    visitWindow: ['2023-09-05', '2024-06-28'],
    failure: { isolatedPad: 0.5, noGravel: 0.04, leaky: 0.08 },
  },
  {
    key: 'tamarack-bend-2',
    companyKey: C1,
    name: 'Tamarack Bend Phase 2',
    builderKeys: ['brackwell'],
    yearFrom: 2008,
    yearTo: 2010,
    jurisdiction: CITY_JURISDICTION,
    passiveRequired: true,
    region: [-800, 400, 0, 800],
    roads: ['N', 'W', 'E'],
    amplitudeM: 22,
    wavelengthM: 520,
    phase: Math.PI / 2,
    connectors: 3,
    courts: false,
    entries: [
      { side: 'N', index: 1 },
      { side: 'W', index: 1 },
      { side: 'E', index: 2 },
    ],
    frontageM: 18,
    rowNames: ['Tamarack Ridge Dr', 'Cedar Brake Ln', 'Juniper Fold Way'],
    connectorNames: ['Pinyon Cir', 'Boxelder Trl', 'Hackberry Ln'],
    courtNames: [],
    foundation: slabMostly,
    passive: required,
    sampleRate: 0.12,
    visitWindow: ['2024-03-04', '2024-10-31'],
    failure: { isolatedPad: 0.38, noGravel: 0.03, leaky: 0.07 },
  },
  {
    key: 'sedgefield-commons',
    companyKey: C1,
    name: 'Sedgefield Commons',
    builderKeys: ['brackwell'],
    yearFrom: 2014,
    yearTo: 2018,
    jurisdiction: CITY_JURISDICTION,
    passiveRequired: true,
    region: [-800, -800, 0, -400],
    roads: ['S', 'W', 'E'],
    amplitudeM: 12,
    wavelengthM: 700,
    phase: 2,
    connectors: 4,
    courts: false,
    entries: [
      { side: 'S', index: 1 },
      { side: 'E', index: 1 },
    ],
    frontageM: 18,
    rowNames: ['Sedgefield Dr', 'Bulrush Ln', 'Cattail Way'],
    connectorNames: ['Wiregrass Pl', 'Switchgrass Trl', 'Canary Reed Ln', 'Rushwick Pl'],
    courtNames: [],
    foundation: slabMostly,
    passive: required,
    sampleRate: 0.09,
    visitWindow: ['2024-08-05', '2025-05-30'],
    failure: { isolatedPad: 0.04, noGravel: 0.02, leaky: 0.08 },
  },
  {
    key: 'fennel-creek',
    companyKey: C1,
    name: 'Fennel Creek',
    builderKeys: ['fenmark'],
    yearFrom: 2006,
    yearTo: 2011,
    jurisdiction: CITY_JURISDICTION,
    passiveRequired: true,
    region: [0, 0, 800, 560],
    roads: ['S', 'W', 'E'],
    amplitudeM: 20,
    wavelengthM: 480,
    phase: 1,
    connectors: 3,
    courts: true,
    entries: [
      { side: 'S', index: 1 },
      { side: 'W', index: 1 },
      { side: 'E', index: 2 },
    ],
    frontageM: 18,
    rowNames: ['Fennel Creek Dr', 'Chervil Ln', 'Anise Way', 'Dill Meadow Ln'],
    connectorNames: ['Caraway Trl', 'Lovage Pl', 'Tarragon Ln'],
    courtNames: ['Borage Ct', 'Chicory Ct', 'Hyssop Ct', 'Sweet Cicely Ct'],
    foundation: { slab: 0.62, basement: 0.08, crawlspace: 0.02, mixed: 0.28 },
    passive: required,
    sampleRate: 0.12,
    visitWindow: ['2023-06-01', '2024-09-30'],
    failure: { isolatedPad: 0.02, noGravel: 0.3, leaky: 0.08 },
  },
  {
    key: 'fennel-creek-north',
    companyKey: C1,
    name: 'Fennel Creek North',
    builderKeys: ['fenmark'],
    yearFrom: 2013,
    yearTo: 2017,
    jurisdiction: CITY_JURISDICTION,
    passiveRequired: true,
    region: [0, 800, 800, 1200],
    roads: ['S', 'W', 'E'],
    amplitudeM: 18,
    wavelengthM: 560,
    phase: 0.3,
    connectors: 3,
    courts: false,
    entries: [
      { side: 'S', index: 1 },
      { side: 'E', index: 1 },
    ],
    frontageM: 18,
    rowNames: ['Fennel Ridge Dr', 'Angelica Way', 'Marjoram Ln'],
    connectorNames: ['Savory Trl', 'Lemon Balm Pl', 'Coriander Ln'],
    courtNames: [],
    foundation: { slab: 0.6, basement: 0.12, crawlspace: 0.02, mixed: 0.26 },
    passive: required,
    sampleRate: 0.09,
    visitWindow: ['2024-10-01', '2025-08-29'],
    failure: { isolatedPad: 0.01, noGravel: 0.12, leaky: 0.06 },
  },
  {
    key: 'copperleaf-estates',
    companyKey: C1,
    name: 'Copperleaf Estates',
    builderKeys: ['pellow', 'ansel-vary'],
    yearFrom: 2016,
    yearTo: 2021,
    jurisdiction: CITY_JURISDICTION,
    passiveRequired: true,
    region: [0, -400, 800, 0],
    roads: ['N', 'W', 'E'],
    amplitudeM: 12,
    wavelengthM: 640,
    phase: 2.4,
    connectors: 3,
    courts: true,
    entries: [
      { side: 'N', index: 1 },
      { side: 'E', index: 0 },
    ],
    frontageM: 25,
    rowNames: ['Copperleaf Dr', 'Bronzewing Way'],
    connectorNames: ['Verdigris Trl', 'Patina Pl', 'Rustleaf Ln'],
    courtNames: ['Brass Lantern Ct', 'Tinsmith Ct', 'Gilded Oak Ct', 'Kettle Copper Ct'],
    foundation: basementMostly,
    passive: required,
    sampleRate: 0.08,
    visitWindow: ['2025-02-03', '2025-10-17'],
    failure: { isolatedPad: 0, noGravel: 0.04, leaky: 0.08 },
  },
  {
    key: 'millstone-reach',
    companyKey: C2,
    name: 'Millstone Reach',
    builderKeys: ['halvard'],
    yearFrom: 2009,
    yearTo: 2013,
    jurisdiction: CITY_JURISDICTION,
    passiveRequired: true,
    region: [800, -800, 1200, -400],
    roads: ['S', 'W'],
    amplitudeM: 10,
    wavelengthM: 400,
    phase: 0.8,
    connectors: 2,
    courts: false,
    entries: [
      { side: 'W', index: 1 },
      { side: 'S', index: 0 },
    ],
    frontageM: 18,
    rowNames: ['Millstone Dr', 'Grindstone Ln', 'Quernwood Way'],
    connectorNames: ['Millrace Trl', 'Sluicegate Pl'],
    courtNames: [],
    foundation: slabMostly,
    passive: required,
    sampleRate: 0.12,
    visitWindow: ['2024-04-01', '2025-06-30'],
    failure: { isolatedPad: 0.15, noGravel: 0.03, leaky: 0.08 },
  },
];

// Section-line roads every half mile-ish (800 m): arterials on the outer lines and the middle, collectors between.
const EW_ROADS: { y: number; name: string; cls: StreetClass }[] = [
  { y: -1600, name: 'Sorrel Rd', cls: 'arterial' },
  { y: -800, name: 'Granary St', cls: 'collector' },
  { y: 0, name: 'Tarrowby Blvd', cls: 'arterial' },
  { y: 800, name: 'Kiln Ave', cls: 'collector' },
  { y: 1600, name: 'Halden Rd', cls: 'arterial' },
];
const NS_ROADS: { x: number; name: string; cls: StreetClass }[] = [
  { x: -1600, name: 'Westmark Rd', cls: 'arterial' },
  { x: -800, name: 'Furrow St', cls: 'collector' },
  { x: 0, name: 'Ember Ave', cls: 'arterial' },
  { x: 800, name: 'Bramblecote Ave', cls: 'collector' },
  { x: 1600, name: 'Eastmark Rd', cls: 'arterial' },
];
const GRID = [-1600, -800, 0, 800, 1600];
const ARTERIAL_END_M = 1750; // arterials run on past the town edge; collectors stop at the arterials

// Farmsteads along the outer arterials: homes outside any community.
const RURAL_STRETCHES: { road: string; side: 1 | -1; from: number; to: number }[] = [
  { road: 'Halden Rd', side: 1, from: -1600, to: 0 }, // north side
  { road: 'Sorrel Rd', side: -1, from: -800, to: 800 }, // south side
];

// ---------------------------------------------------------------------------------------------
// Street network
// ---------------------------------------------------------------------------------------------

interface HomeRule {
  community: CommunityPlan | null;
  frontageM: number;
  lotFarM: number;
  sides: { left: boolean; right: boolean };
  /** Along-chain window (m) in which homes may stand; used for farm stretches of arterials. */
  window: [number, number] | null;
  vacancy: number;
  noHomesFirst: boolean; // the first segment is an entry drive from a section road
  noHomesLast: boolean;
}

interface Chain {
  name: string;
  cls: StreetClass;
  pts: P[];
  homes: HomeRule | null;
  communityKey: string | null;
}

interface Segment {
  id: string;
  chain: Chain;
  index: number;
  count: number;
  pts: P[];
  cum: number[];
  len: number;
  sStart: number; // along-chain distance of the first vertex
  props: StreetProps;
}

function insertVertex(chain: Chain, p: P): void {
  for (let i = 0; i < chain.pts.length; i++) {
    if (vkey(chain.pts[i]) === vkey(p)) return;
  }
  for (let i = 1; i < chain.pts.length; i++) {
    const a = chain.pts[i - 1];
    const b = chain.pts[i];
    const dx = b[0] - a[0];
    const dy = b[1] - a[1];
    const t = ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / (dx * dx + dy * dy);
    if (t <= 0 || t >= 1) continue;
    const d = Math.hypot(a[0] + dx * t - p[0], a[1] + dy * t - p[1]);
    if (d < 0.01) {
      chain.pts.splice(i, 0, p);
      return;
    }
  }
  throw new Error(`junction ${vkey(p)} is not on ${chain.name}`);
}

function buildSectionRoads(): Map<string, Chain> {
  const roads = new Map<string, Chain>();
  for (const r of EW_ROADS) {
    const end = r.cls === 'arterial' ? ARTERIAL_END_M : 1600;
    const xs = [-end, ...GRID.filter((x) => Math.abs(x) < end), end];
    roads.set(r.name, { name: r.name, cls: r.cls, pts: xs.map((x) => [x, r.y] as P), homes: null, communityKey: null });
  }
  for (const r of NS_ROADS) {
    const end = r.cls === 'arterial' ? ARTERIAL_END_M : 1600;
    const ys = [-end, ...GRID.filter((y) => Math.abs(y) < end), end];
    roads.set(r.name, { name: r.name, cls: r.cls, pts: ys.map((y) => [r.x, y] as P), homes: null, communityKey: null });
  }
  for (const stretch of RURAL_STRETCHES) {
    const chain = roads.get(stretch.road)!;
    const start = chain.pts[0][0];
    chain.homes = {
      community: null,
      frontageM: 130,
      lotFarM: 70,
      sides: { left: stretch.side === 1, right: stretch.side === -1 },
      window: [stretch.from - start, stretch.to - start],
      vacancy: 0.35,
      noHomesFirst: false,
      noHomesLast: false,
    };
  }
  return roads;
}

function roadOnEdge(roads: Map<string, Chain>, plan: CommunityPlan, side: Side): Chain {
  const [x0, y0, x1, y1] = plan.region;
  const found =
    side === 'S' || side === 'N'
      ? EW_ROADS.find((r) => r.y === (side === 'S' ? y0 : y1))
      : NS_ROADS.find((r) => r.x === (side === 'W' ? x0 : x1));
  if (!found || !plan.roads.includes(side)) throw new Error(`${plan.key}: no road on ${side}`);
  return roads.get(found.name)!;
}

interface CommunityLayout {
  plan: CommunityPlan;
  polygon: P[];
  chains: Chain[];
}

/** Lays out a ladder of (optionally curving) rows joined by straight connectors, plus courts. */
function layoutCommunity(plan: CommunityPlan, roads: Map<string, Chain>): CommunityLayout {
  const [x0, y0, x1, y1] = plan.region;
  const inset = (side: Side) => (plan.roads.includes(side) ? ROAD_INSET_M : EDGE_INSET_M);
  const px0 = x0 + inset('W');
  const px1 = x1 - inset('E');
  const py0 = y0 + inset('S');
  const py1 = y1 - inset('N');
  const A = plan.amplitudeM;
  const yMin = py0 + EDGE_MARGIN_M + A;
  const yMax = py1 - (plan.courts ? COURT_LEN_M + 12 : EDGE_MARGIN_M) - A;
  const nRows = Math.max(2, Math.floor((yMax - yMin) / ROW_SPACING_MIN_M) + 1);
  const rowYs = linspace(yMin, yMax, nRows);
  const xa = px0 + EDGE_MARGIN_M;
  const xb = px1 - EDGE_MARGIN_M;
  const conXs = linspace(xa, xb, plan.connectors);
  const courtXs: number[] = [];
  if (plan.courts) {
    for (let i = 1; i < conXs.length; i++) {
      const gap = conXs[i] - conXs[i - 1];
      // Two courts where the block is long enough to keep their lots apart, otherwise one.
      const n = gap > 300 ? 2 : 1;
      for (let k = 1; k <= n; k++) courtXs.push(conXs[i - 1] + (gap * k) / (n + 1));
    }
  }
  const f = (k: number, x: number) =>
    rowYs[k] + (A === 0 ? 0 : A * Math.sin((2 * Math.PI * (x - xa)) / plan.wavelengthM + plan.phase));

  const rule = (first: boolean, last: boolean): HomeRule => ({
    community: plan,
    frontageM: plan.frontageM,
    lotFarM: LOT_FAR_M,
    sides: { left: true, right: true },
    window: null,
    vacancy: 0,
    noHomesFirst: first,
    noHomesLast: last,
  });
  const has = (side: Side, index: number) => plan.entries.some((e) => e.side === side && e.index === index);
  const chains: Chain[] = [];
  const take = (names: string[], i: number) => {
    if (!names[i]) throw new Error(`${plan.key}: not enough street names`);
    return names[i];
  };

  for (let k = 0; k < nRows; k++) {
    const junctionXs = [...conXs, ...(k === nRows - 1 ? courtXs : [])];
    const xs = new Set<number>(junctionXs);
    const step = A === 0 ? 1e9 : 12; // straight rows need no intermediate vertices
    for (let x = xa + step; x < xb; x += step) {
      if (junctionXs.every((j) => Math.abs(j - x) > 1)) xs.add(x);
    }
    const pts: P[] = [...xs].sort((a, b) => a - b).map((x) => [x, f(k, x)]);
    const west = has('W', k);
    const east = has('E', k);
    if (west) pts.unshift([x0, f(k, xa)]);
    if (east) pts.push([x1, f(k, xb)]);
    const chain: Chain = { name: take(plan.rowNames, k), cls: 'local', pts, homes: rule(west, east), communityKey: plan.key };
    if (west) insertVertex(roadOnEdge(roads, plan, 'W'), pts[0]);
    if (east) insertVertex(roadOnEdge(roads, plan, 'E'), pts[pts.length - 1]);
    chains.push(chain);
  }
  conXs.forEach((x, i) => {
    const pts: P[] = rowYs.map((_, k) => [x, f(k, x)]);
    const south = has('S', i);
    const north = has('N', i);
    if (south) pts.unshift([x, y0]);
    if (north) pts.push([x, y1]);
    if (south) insertVertex(roadOnEdge(roads, plan, 'S'), pts[0]);
    if (north) insertVertex(roadOnEdge(roads, plan, 'N'), pts[pts.length - 1]);
    chains.push({ name: take(plan.connectorNames, i), cls: 'local', pts, homes: rule(south, north), communityKey: plan.key });
  });
  courtXs.forEach((x, i) => {
    const y = f(nRows - 1, x);
    chains.push({
      name: take(plan.courtNames, i),
      cls: 'local',
      pts: [
        [x, y],
        [x, y + COURT_LEN_M],
      ],
      homes: rule(false, false),
      communityKey: plan.key,
    });
  });

  // Chamfered corners: the corner squares hold no lots (rows start at the connectors), and a cut corner reads as a plat.
  const c = 30;
  const polygon = closeCcw([
    [px0 + c, py0],
    [px1 - c, py0],
    [px1, py0 + c],
    [px1, py1 - c],
    [px1 - c, py1],
    [px0 + c, py1],
    [px0, py1 - c],
    [px0, py0 + c],
  ]);
  return { plan, polygon, chains };
}

/** Cuts chains at every vertex another chain shares and numbers each block, TIGER-style. */
function splitIntoSegments(chains: Chain[]): Segment[] {
  const owners = new Map<string, Set<Chain>>();
  for (const chain of chains) {
    for (const p of chain.pts) {
      const k = vkey(p);
      if (!owners.has(k)) owners.set(k, new Set());
      owners.get(k)!.add(chain);
    }
  }
  const segments: Segment[] = [];
  for (const chain of chains) {
    const cuts = [0];
    for (let i = 1; i < chain.pts.length - 1; i++) {
      if (owners.get(vkey(chain.pts[i]))!.size > 1) cuts.push(i);
    }
    cuts.push(chain.pts.length - 1);
    const chainCum = cumulative(chain.pts);
    // House numbers run about one per metre from a town-wide baseline (west for east–west streets,
    // south for north–south ones), so parallel streets carry similar numbers, as in a grid town.
    const first = chain.pts[0];
    const last = chain.pts[chain.pts.length - 1];
    const eastWest = Math.abs(last[0] - first[0]) >= Math.abs(last[1] - first[1]);
    const baseline = eastWest ? first[0] : first[1];
    const base = 2 * Math.round((100 + baseline + 1800) / 2);
    const numberAt = (s: number) => base + 2 * Math.round(s / 2);
    const chainSlug = slug(chain.name);
    for (let c = 0; c < cuts.length - 1; c++) {
      const pts = chain.pts.slice(cuts[c], cuts[c + 1] + 1);
      const a = numberAt(chainCum[cuts[c]]);
      const b = numberAt(chainCum[cuts[c + 1]]);
      if (b - a < 4) throw new Error(`${chain.name}: block too short to number`);
      const mid = pts[Math.floor(pts.length / 2)];
      const cum = cumulative(pts);
      segments.push({
        id: `${chainSlug}-${c + 1}`,
        chain,
        index: c,
        count: cuts.length - 1,
        pts,
        cum,
        len: cum[cum.length - 1],
        sStart: chainCum[cuts[c]],
        props: {
          id: `${chainSlug}-${c + 1}`,
          name: chain.name,
          class: chain.cls,
          leftFrom: a + 1,
          leftTo: b - 1,
          rightFrom: a,
          rightTo: b - 2,
          zip: mid[0] <= 0 ? ZIP_WEST : ZIP_EAST, // Ember Ave (x = 0) divides the two ZIPs
          city: TOWN,
        },
      });
    }
  }
  return segments;
}

/** For each segment end and side, how far back lots must stay: a cross street there has lots of its own. */
function sideMargins(segments: Segment[]): Map<Segment, { start: [number, number]; end: [number, number] }> {
  const atNode = new Map<string, { seg: Segment; away: P }[]>();
  const unit = (a: P, b: P): P => {
    const l = Math.hypot(b[0] - a[0], b[1] - a[1]);
    return [(b[0] - a[0]) / l, (b[1] - a[1]) / l];
  };
  for (const seg of segments) {
    const n = seg.pts.length;
    const add = (p: P, away: P) => {
      const k = vkey(p);
      if (!atNode.has(k)) atNode.set(k, []);
      atNode.get(k)!.push({ seg, away });
    };
    add(seg.pts[0], unit(seg.pts[0], seg.pts[1]));
    add(seg.pts[n - 1], unit(seg.pts[n - 1], seg.pts[n - 2]));
  }
  const margins = new Map<Segment, { start: [number, number]; end: [number, number] }>();
  for (const seg of segments) {
    const n = seg.pts.length;
    // [left, right] margins; `travel` is the direction of travel at that end.
    const at = (p: P, travel: P): [number, number] => {
      let left = false;
      let right = false;
      for (const other of atNode.get(vkey(p))!) {
        if (other.seg === seg) continue;
        const cross = travel[0] * other.away[1] - travel[1] * other.away[0];
        if (cross > 0.3) left = true;
        if (cross < -0.3) right = true;
      }
      return [left ? CORNER_MARGIN_M : DEAD_END_MARGIN_M, right ? CORNER_MARGIN_M : DEAD_END_MARGIN_M];
    };
    margins.set(seg, {
      start: at(seg.pts[0], unit(seg.pts[0], seg.pts[1])),
      end: at(seg.pts[n - 1], unit(seg.pts[n - 2], seg.pts[n - 1])),
    });
  }
  return margins;
}

// ---------------------------------------------------------------------------------------------
// People
// ---------------------------------------------------------------------------------------------

const FIRST_NAMES = [
  'Ada', 'Alden', 'Amara', 'Anders', 'Bea', 'Bram', 'Calla', 'Cyrus', 'Dalia', 'Desmond', 'Edie', 'Emeric',
  'Fern', 'Felix', 'Greta', 'Gideon', 'Hana', 'Hollis', 'Ines', 'Ivo', 'Juno', 'Jasper', 'Kaia', 'Lars',
  'Leona', 'Linus', 'Mara', 'Milo', 'Nadia', 'Nils', 'Odette', 'Orin', 'Pia', 'Quentin', 'Rosa', 'Rafe',
  'Selma', 'Soren', 'Talia', 'Tobias', 'Una', 'Vera', 'Viktor', 'Wren', 'Xavi', 'Yara', 'Zane', 'Elin',
  'Marcus', 'Priya', 'Omar', 'Lena', 'Dmitri', 'Keiko', 'Ruth', 'Samuel', 'Grace', 'Theo', 'Ivy', 'Luca',
];
const LAST_NAMES = [
  'Ashcombe', 'Barrowclough', 'Bellmont', 'Birchall', 'Caddrick', 'Carrow', 'Coldwell', 'Dannecker',
  'Dray', 'Elvery', 'Fairhurst', 'Fenlow', 'Gadsby', 'Galloran', 'Haldane', 'Hartwell', 'Ibbotson',
  'Jessop', 'Kemble', 'Kirrin', 'Lanyard', 'Lockridge', 'Maddox-Hale', 'Merriwether', 'Nettleford',
  'Norcott', 'Oakshott', 'Orpwood', 'Pennock', 'Quarrie', 'Radley-Shaw', 'Rookwood', 'Saltash',
  'Seddon', 'Thackery', 'Tolliver', 'Umbridge', 'Vantassel', 'Wadlow', 'Whitcombe', 'Yardley',
  'Zeller', 'Abernook', 'Brisco', 'Calloway-Finch', 'Delacorte', 'Esterby', 'Fosswick', 'Greymarsh',
  'Holloway-Pike', 'Ingleby', 'Jorvick', 'Kestner', 'Lindqvist', 'Morrow', 'Nakashima', 'Okafor',
  'Petrakis', 'Quill', 'Ravensdale',
];
const ELSEWHERE_STREETS = ['Harbor Light Dr', 'Old Mill Rd', 'Ninebark Ln', 'Sandpiper Ct', 'Granite Way', 'Orchard Row'];
const ELSEWHERE_CITIES: [string, string][] = [
  ['Marrowvale', '00093'],
  ['Kettle Crossing', '00095'],
  ['Brindle Falls', '00097'],
];

function ownerName(rng: Rng): string {
  const last = rng.pick(LAST_NAMES);
  const kind = rng.weighted({ single: 0.62, couple: 0.3, trust: 0.04, company: 0.04 });
  if (kind === 'couple') {
    const a = rng.pick(FIRST_NAMES);
    let b = rng.pick(FIRST_NAMES);
    if (b === a) b = FIRST_NAMES[(FIRST_NAMES.indexOf(a) + 7) % FIRST_NAMES.length];
    return `${a} & ${b} ${last}`;
  }
  if (kind === 'trust') return `${last} Family Trust`;
  if (kind === 'company') return `${rng.pick(['Prairie Key', 'Ninebark', 'Stoneyard', 'Tallgrass'])} Rentals LLC`;
  return `${rng.pick(FIRST_NAMES)} ${last}`;
}

// ---------------------------------------------------------------------------------------------
// Homes
// ---------------------------------------------------------------------------------------------

interface HomeDraft {
  home: DemoHome;
  lot: P[];
  local: P;
  plan: CommunityPlan | null;
}

function suctionNote(builderKey: string | null, year: number, foundation: Foundation): string {
  if (builderKey === 'brackwell') {
    return year < 2012
      ? 'Suction pit under the garage slab (separate pour from the house slab); riser in the garage wall'
      : 'Suction pit at the centre of the house slab, utility closet; riser in an interior chase';
  }
  if (builderKey === 'fenmark') return 'Laundry room slab; riser in the laundry wall';
  if (builderKey === 'halvard') return 'Suction pit near the front porch pad; riser in the garage';
  if (foundation === 'basement' || foundation === 'mixed') return 'Basement floor beside the sump; riser in the mechanical room';
  return 'Utility room slab; riser in the utility closet';
}

function makeHomes(segments: Segment[], rng: Rng): HomeDraft[] {
  const margins = sideMargins(segments);
  const drafts: HomeDraft[] = [];
  // Where a curving row meets a connector at a slant, a connector's corner lot can still clip a row
  // lot; rows are laid out first, so the later (side-street) lot gives way.
  const CELL_M = 100;
  const placed = new Map<string, P[][]>();
  const cellOf = ([x, y]: P) => [Math.floor(x / CELL_M), Math.floor(y / CELL_M)];
  const clashes = (lot: P[]): boolean => {
    const [cx, cy] = cellOf(lot[0]);
    for (let dx = -1; dx <= 1; dx++) {
      for (let dy = -1; dy <= 1; dy++) {
        for (const other of placed.get(`${cx + dx},${cy + dy}`) ?? []) if (ringsOverlap(lot, other)) return true;
      }
    }
    return false;
  };
  for (const seg of segments) {
    const rule = seg.chain.homes;
    if (!rule) continue;
    if ((rule.noHomesFirst && seg.index === 0) || (rule.noHomesLast && seg.index === seg.count - 1)) continue;
    if (rule.window) {
      const mid = seg.sStart + seg.len / 2;
      if (mid < rule.window[0] || mid > rule.window[1]) continue;
    }
    const m = margins.get(seg)!;
    for (const side of [-1, 1] as const) {
      if (side === -1 && !rule.sides.right) continue;
      if (side === 1 && !rule.sides.left) continue;
      const sideIdx = side === 1 ? 0 : 1;
      const s0 = m.start[sideIdx];
      const s1 = seg.len - m.end[sideIdx];
      const usable = s1 - s0;
      const count = Math.floor(usable / rule.frontageM);
      if (count < 1) continue;
      // Stretch lots to fill the block, but not into odd-looking wide lots: centre the rest instead.
      const frontage = Math.min(usable / count, rule.frontageM * 1.35);
      const lead = s0 + (usable - frontage * count) / 2;
      const from = side === 1 ? seg.props.leftFrom : seg.props.rightFrom;
      const to = side === 1 ? seg.props.leftTo : seg.props.rightTo;
      let prev = -Infinity;
      for (let i = 0; i < count; i++) {
        const sA = lead + i * frontage;
        const sB = sA + frontage;
        if (rule.vacancy > 0 && rng.chance(rule.vacancy)) continue;
        const sMid = (sA + sB) / 2;
        let n = from + 2 * Math.round(((to - from) * (sMid / seg.len)) / 2);
        if (n <= prev) n = prev + 2;
        if (n > to) continue;
        prev = n;
        // The house goes exactly where interpolating its number along the block puts it.
        const sHome = (seg.len * (n - from)) / (to - from);
        const local = offsetAlong(seg.pts, seg.cum, sHome, HOME_OFFSET_M, side);
        const ss = [sA, sA + frontage / 3, sA + (2 * frontage) / 3, sB];
        const lot = closeCcw([
          ...ss.map((s) => offsetAlong(seg.pts, seg.cum, s, LOT_NEAR_M, side)),
          ...ss.reverse().map((s) => offsetAlong(seg.pts, seg.cum, s, rule.lotFarM, side)),
        ]);
        if (clashes(lot)) continue;
        const [cx, cy] = cellOf(lot[0]);
        placed.set(`${cx},${cy}`, [...(placed.get(`${cx},${cy}`) ?? []), lot]);
        const footprint = houseOutline(seg, sHome, side, Math.min(frontage, 22), rng);
        drafts.push({
          home: {
            key: '',
            companyKey: rule.community?.companyKey ?? C1,
            communityKey: rule.community?.key ?? null,
            builderKey: null,
            number: String(n),
            street: seg.props.name,
            unit: null,
            city: TOWN,
            state: STATE,
            zip: seg.props.zip,
            lon: 0,
            lat: 0,
            yearBuilt: 0,
            foundation: 'slab',
            passiveSystem: 'unknown',
            pipeSizeIn: null,
            suctionPointNote: '',
            ownerName: '',
            mailingAddress: '',
            doNotContact: false,
            footprint: footprint.map(toLonLat),
          },
          lot,
          local,
          plan: rule.community,
        });
      }
    }
  }
  return drafts;
}

/** An L-shaped outline: house body set back from the street with the garage stepping forward. */
function houseOutline(seg: Segment, s: number, side: 1 | -1, frontage: number, rng: Rng): P[] {
  const { p, dir } = pointAlong(seg.pts, seg.cum, s);
  const nrm: P = [-dir[1] * side, dir[0] * side];
  const w = Math.min(rng.range(11, 16), frontage - 4);
  const d = rng.range(11, 14.5);
  const g = rng.range(0.38, 0.48) * w;
  const gp = rng.range(2.5, 3.5);
  const mirror = rng.chance(0.5) ? -1 : 1;
  const near = HOUSE_NEAR_M;
  const shape: P[] = [
    [-w / 2, near],
    [w / 2 - g, near],
    [w / 2 - g, near - gp],
    [w / 2, near - gp],
    [w / 2, near + d],
    [-w / 2, near + d],
  ];
  return closeCcw(shape.map(([a, b]) => [p[0] + dir[0] * a * mirror + nrm[0] * b, p[1] + dir[1] * a * mirror + nrm[1] * b]));
}

function describeHomes(drafts: HomeDraft[], layouts: CommunityLayout[], rng: Rng): void {
  const counters = new Map<string, number>();
  for (const d of drafts) {
    const h = d.home;
    const plan = d.plan;
    const [lon, lat] = toLonLat(d.local);
    h.lon = lon;
    h.lat = lat;
    if (plan) {
      const [x0, , x1] = plan.region;
      const frac = (d.local[0] - x0) / (x1 - x0);
      // Phases were built out west to east, give or take a year.
      const span = plan.yearTo - plan.yearFrom + 1;
      let year = plan.yearFrom + Math.floor(frac * span);
      if (rng.chance(0.3)) year += rng.pick([-1, 1]);
      h.yearBuilt = Math.min(plan.yearTo, Math.max(plan.yearFrom, year));
      h.builderKey = plan.builderKeys.length > 1 && frac > 0.5 ? plan.builderKeys[1] : plan.builderKeys[0];
      h.foundation = rng.weighted(plan.foundation);
      h.passiveSystem = rng.weighted(plan.passive);
      h.pipeSizeIn = h.passiveSystem === 'yes' ? PIPE_BY_BUILDER[h.builderKey] : null;
      h.suctionPointNote = h.passiveSystem === 'yes' ? suctionNote(h.builderKey, h.yearBuilt, h.foundation) : '';
      const layout = layouts.find((l) => l.plan.key === plan.key)!;
      if (!pointInRing(d.local, layout.polygon)) throw new Error(`${plan.key}: home outside the community boundary`);
    } else {
      h.yearBuilt = rng.int(1948, 1996);
      h.foundation = rng.weighted({ slab: 0.1, basement: 0.55, crawlspace: 0.3, mixed: 0.05 });
      h.passiveSystem = rng.weighted({ yes: 0, no: 0.7, unknown: 0.3 });
      h.suctionPointNote = '';
    }
    h.ownerName = ownerName(rng);
    const address = `${h.number} ${h.street}, ${TOWN}, ${STATE} ${h.zip}`;
    const absentee = h.ownerName.endsWith('LLC') ? rng.chance(0.8) : rng.chance(0.05);
    if (absentee) {
      const [city, zip] = rng.pick(ELSEWHERE_CITIES);
      h.mailingAddress = rng.chance(0.3)
        ? `PO Box ${rng.int(100, 9899)}, ${city}, ${STATE} ${zip}`
        : `${rng.int(10, 9899)} ${rng.pick(ELSEWHERE_STREETS)}, ${city}, ${STATE} ${zip}`;
    } else {
      h.mailingAddress = address;
    }
    h.doNotContact = rng.chance(0.03);
    const n = (counters.get('h') ?? 0) + 1;
    counters.set('h', n);
    h.key = `h-${String(n).padStart(4, '0')}`;
  }
}

// ---------------------------------------------------------------------------------------------
// Fans, visits, radon tests
// ---------------------------------------------------------------------------------------------

/** Typical in-line radon fan shape: static pressure falls faster as flow rises. */
function fanCurve(maxStatic: number, maxFlow: number): { flowCfm: number; staticInWc: number }[] {
  const steps = 8;
  return Array.from({ length: steps + 1 }, (_, i) => {
    const q = (maxFlow * i) / steps;
    return { flowCfm: Math.round(q), staticInWc: round(maxStatic * (1 - (q / maxFlow) ** 1.8), 2) };
  });
}

const FAN_SPECS: { key: string; companyKey: string; name: string; maxStatic: number; maxFlow: number }[] = [
  { key: 'corvane-s2', companyKey: C1, name: 'Corvane S2 (standard)', maxStatic: 2.7, maxFlow: 165 },
  { key: 'corvane-h4', companyKey: C1, name: 'Corvane H4 (high suction)', maxStatic: 4.3, maxFlow: 110 },
  { key: 'corvane-l1', companyKey: C1, name: 'Corvane L1 (high flow)', maxStatic: 1.6, maxFlow: 285 },
  { key: 'quillfan-q3', companyKey: C2, name: 'Quillfan Q3', maxStatic: 3.2, maxFlow: 140 },
  { key: 'quillfan-q1', companyKey: C2, name: 'Quillfan Q1 (high flow)', maxStatic: 1.9, maxFlow: 230 },
];

type Scenario = 'good' | 'isolated_pad' | 'no_gravel' | 'leaky';

const DAY_MS = 86_400_000;
const dateMs = (iso: string) => Date.parse(`${iso}T00:00:00Z`);
const isoDay = (ms: number) => new Date(ms).toISOString().slice(0, 10);
const isoTime = (ms: number) => new Date(ms).toISOString();

const TEST_HOLE_ROOMS = ['hall closet', 'kitchen pantry', 'bedroom closet', 'laundry room', 'garage corner', 'under stairs', 'mechanical room'];

interface VisitContext {
  rng: Rng;
  visits: DemoVisit[];
  tests: DemoRadonTest[];
  fans: DemoFan[];
  sideBySide: number;
}

function addTest(ctx: VisitContext, t: Omit<DemoRadonTest, 'key'>): DemoRadonTest {
  const test = { key: `rt-${String(ctx.tests.length + 1).padStart(4, '0')}`, ...t };
  ctx.tests.push(test);
  return test;
}

function shortTestHours(rng: Rng, device: DeviceKind): number {
  if (device === 'alpha_track') return rng.int(91, 150) * 24; // long-term: more than 90 days
  if (device === 'continuous_monitor') return rng.int(48, 72);
  if (device === 'charcoal') return rng.int(48, 96);
  return rng.int(48, 120);
}

function pickScenario(rng: Rng, plan: CommunityPlan, home: DemoHome): Scenario {
  const f = { ...plan.failure };
  // Tighter inspections of the gas-permeable layer from 2012 on (the story's code update).
  const codeFactor = home.yearBuilt >= 2012 ? 0.5 : 1;
  // The oldest Fenmark slabs were the worst; the builder improved its fill gradually.
  const earlyFactor = home.builderKey === 'fenmark' && home.yearBuilt <= 2008 ? 1.35 : 1;
  const iso = f.isolatedPad * codeFactor;
  const nog = f.noGravel * codeFactor * earlyFactor;
  const leak = f.leaky * codeFactor;
  return rng.weighted({ isolated_pad: iso, no_gravel: nog, leaky: leak, good: Math.max(0, 1 - iso - nog - leak) });
}

function makeVisit(ctx: VisitContext, plan: CommunityPlan, home: DemoHome, technicianEmail: string): void {
  const { rng } = ctx;
  const [wFrom, wTo] = plan.visitWindow.map(dateMs);
  let day = wFrom + rng.int(0, Math.round((wTo - wFrom) / DAY_MS)) * DAY_MS;
  if (new Date(day).getUTCDay() === 0) day += DAY_MS; // no Sunday visits
  const visitedOn = isoDay(day);
  const key = `v-${String(ctx.visits.length + 1).padStart(4, '0')}`;
  const status: VisitStatus = rng.weighted({ completed: 0.91, declined: 0.055, no_access: 0.035 });
  const basement = home.foundation === 'basement';

  // Pre-mitigation test: the homeowner's or ours, shortly before the visit.
  const preLevel = round(Math.min(38, Math.max(2.2, rng.logNormal(7.5, 0.6))), 1);
  if (status === 'completed' || rng.chance(0.7)) {
    const device = rng.weighted({ charcoal: 0.45, continuous_monitor: 0.35, electret: 0.12, alpha_track: 0.08 });
    const hours = shortTestHours(rng, device);
    const end = day - rng.int(3, 20) * DAY_MS + rng.int(13, 22) * 3_600_000;
    addTest(ctx, {
      homeKey: home.key,
      kind: 'pre',
      device,
      startedAt: isoTime(end - hours * 3_600_000),
      endedAt: isoTime(end),
      resultPciL: preLevel,
      sideBySideGroup: null,
    });
  }

  if (status !== 'completed') {
    ctx.visits.push({
      key,
      homeKey: home.key,
      technicianEmail,
      visitedOn,
      status,
      fanKey: null,
      fanLocation: null,
      vacuumInWc: null,
      pipeSizeIn: home.pipeSizeIn,
      pipeLengthFt: null,
      elbows: null,
      pipeEntry: null,
      subSlabMaterial: 'unknown',
      pressureField: [],
      reworkNeeded: false,
      reworkDone: false,
      reworkReasons: [],
      notes:
        status === 'declined'
          ? rng.pick(['Owner declined after the estimate.', 'Owner wants to retest before deciding.', 'Owner declined; plans to sell this year.'])
          : rng.pick(['No one home at the scheduled time; left a door hanger.', 'Attic access blocked by stored items; to reschedule.', 'Gate locked and dog in the yard; no access.']),
    });
    return;
  }

  const scenario = pickScenario(rng, plan, home);
  const fans = ctx.fans.filter((f) => f.companyKey === home.companyKey);
  const standard = fans[0];
  const highSuction = fans.find((f) => f.name.includes('high suction')) ?? standard;
  const highFlow = fans.find((f) => f.name.includes('high flow')) ?? standard;
  let fan = standard;
  if (basement && scenario !== 'no_gravel' && rng.chance(0.35)) fan = highFlow;
  if (scenario === 'no_gravel' && home.builderKey === 'fenmark' && rng.chance(0.4)) fan = highSuction;
  const maxS = fan.maxStaticInWc;

  let vacuum: number;
  if (scenario === 'good') vacuum = Math.min(1.8, Math.max(0.4, rng.range(0.25, 0.62) * maxS));
  else if (scenario === 'isolated_pad') vacuum = rng.range(0.88, 0.97) * maxS;
  else if (scenario === 'no_gravel') vacuum = rng.range(0.68, 0.86) * maxS;
  else vacuum = Math.min(0.29, rng.range(0.05, 0.17) * maxS);
  vacuum = round(vacuum, 2);

  // Pressure field: differential decays roughly exponentially with distance from the suction point.
  const holes = rng.int(2, 4);
  const rooms = rng.shuffle(TEST_HOLE_ROOMS);
  const [d0, lambdaFt] =
    scenario === 'good'
      ? [rng.range(25, 70), rng.range(18, 35)]
      : scenario === 'no_gravel'
        ? [rng.range(40, 90), rng.range(5, 9)]
        : scenario === 'leaky'
          ? [rng.range(3, 10), rng.range(8, 14)]
          : [0, 1];
  const pressureField = Array.from({ length: holes }, (_, i) => {
    const distanceFt = rng.int(8 + i * 10, 15 + i * 10);
    const dp = scenario === 'isolated_pad' ? rng.range(0, 0.3) : d0 * Math.exp(-distanceFt / lambdaFt) * rng.range(0.85, 1.15);
    return { label: `TH-${i + 1} ${rooms[i]}`, distanceFt, differentialPa: round(dp, 1) };
  });

  let reworkNeeded = false;
  let reworkDone = false;
  let reasons: ReworkReason[] = [];
  let notes: string;
  let diagnosedOnSite = false;
  const roomForPoint = rng.pick(['utility closet', 'hall closet', 'laundry room']);
  if (scenario === 'good') {
    notes = rng.pick([
      `Activated on the ${fan.name}; ${vacuum} in. WC. Field reached every test hole.`,
      `Fan in, ${vacuum} in. WC, good gravel at the pit. Labelled system and monitor.`,
      `Routine activation: ${vacuum} in. WC, field extends across the slab.`,
    ]);
  } else if (scenario === 'isolated_pad') {
    reworkNeeded = true;
    diagnosedOnSite = rng.chance(0.6);
    reworkDone = rng.chance(0.7);
    reasons = rng.chance(0.3) ? ['added_suction_point', 'rerouted_pipe'] : ['added_suction_point'];
    notes =
      `Suction pit is in a separately poured pad: ${vacuum} in. WC, near the fan's maximum, and no measurable field under the house slab.` +
      (reworkDone
        ? ` Added a suction point in the ${roomForPoint} and tied it into the riser; re-read ${round(rng.range(0.9, 1.6), 2)} in. WC.`
        : ' Quoted a second suction point through the house slab; waiting on the owner.');
  } else if (scenario === 'no_gravel') {
    reworkNeeded = true;
    diagnosedOnSite = rng.chance(0.5);
    reworkDone = rng.chance(0.6);
    const r = rng.weighted({ fan: 0.5, point: 0.3, both: 0.2 });
    reasons = r === 'fan' ? ['larger_fan'] : r === 'point' ? ['added_suction_point'] : ['added_suction_point', 'larger_fan'];
    notes =
      `Clay fill under the slab, little gravel at the pit: ${vacuum} in. WC and the field dies out past ${pressureField[1].distanceFt} ft.` +
      (reworkDone
        ? r === 'fan'
          ? ` Swapped to the ${highSuction.name}.`
          : ' Added a second suction point across the slab.'
        : ' Recommended a larger fan or a second suction point.');
  } else {
    reworkNeeded = true;
    diagnosedOnSite = rng.chance(0.4);
    reworkDone = rng.chance(0.75);
    const opening = basement
      ? rng.pick(['unsealed sump lid', 'open slab-to-wall joint', 'open floor drain'])
      : rng.pick(['open tub-drain cutout under the primary bath', 'unsealed shower-drain cutout', 'open slab joint at the garage step']);
    reasons = opening.includes('joint') ? ['sealed_joint'] : rng.chance(0.12) ? ['sealed_opening', 'other'] : ['sealed_opening'];
    notes =
      `Low vacuum (${vacuum} in. WC) with strong airflow: ${opening}.` +
      (reworkDone ? ` Sealed it; re-read ${round(rng.range(0.5, 1.3), 2)} in. WC.` : ' Sealing quoted; not yet done.');
  }

  const slab = !basement;
  const pipeEntry =
    home.builderKey === 'brackwell' && home.yearBuilt < 2012
      ? 'Garage slab (separate pour); riser in the garage wall'
      : home.builderKey === 'fenmark'
        ? 'Laundry room slab; riser in the laundry wall'
        : home.builderKey === 'halvard'
          ? 'Porch-side slab; riser in the garage'
          : slab
            ? 'House slab, utility closet; riser in an interior chase'
            : 'Basement floor beside the sump; riser in the mechanical room';
  const subSlabMaterial: SubSlabMaterial =
    scenario === 'no_gravel'
      ? rng.pick<SubSlabMaterial>(['none', 'mixed'])
      : rng.weighted({ clean_gravel: 0.8, unknown: 0.15, mixed: 0.05 });

  ctx.visits.push({
    key,
    homeKey: home.key,
    technicianEmail,
    visitedOn,
    status,
    fanKey: fan.key,
    fanLocation: slab
      ? rng.weighted({ 'Garage attic': 0.7, Attic: 0.3 })
      : rng.weighted({ Attic: 0.6, 'Garage attic': 0.25, 'Exterior wall, side yard': 0.15 }),
    vacuumInWc: vacuum,
    pipeSizeIn: home.pipeSizeIn ?? 3,
    pipeLengthFt: slab ? rng.int(18, 32) : rng.int(28, 45),
    elbows: rng.int(2, 5),
    pipeEntry,
    subSlabMaterial,
    pressureField,
    reworkNeeded,
    reworkDone,
    reworkReasons: reasons,
    notes,
  });

  // Post-mitigation tests start at least a day after the fan runs (ANSI/AARST MAH-2019 §7.3.2);
  // we start two or more calendar days after the visit date so the rule holds whatever the visit hour.
  const postTest = (startDay: number, level: number, pair: boolean) => {
    const device = rng.weighted({ continuous_monitor: 0.65, charcoal: 0.25, electret: 0.1 });
    const start = startDay + rng.int(14, 20) * 3_600_000;
    const end = start + shortTestHours(rng, device) * 3_600_000;
    const group = pair ? `sbs-${String(++ctx.sideBySide).padStart(2, '0')}` : null;
    addTest(ctx, { homeKey: home.key, kind: 'post', device, startedAt: isoTime(start), endedAt: isoTime(end), resultPciL: level, sideBySideGroup: group });
    if (pair) {
      // Side-by-side devices agree to within a few tenths; the product averages them.
      const second = round(Math.max(0.2, level * rng.range(0.86, 1.14)), 1);
      addTest(ctx, { homeKey: home.key, kind: 'post', device, startedAt: isoTime(start), endedAt: isoTime(end), resultPciL: second, sideBySideGroup: group });
    }
  };
  const goodLevel = () => round(Math.min(3.6, Math.max(0.2, rng.logNormal(0.9, 0.6))), 1);
  const firstPostDay = day + rng.int(2, 5) * DAY_MS;
  if (!reworkNeeded) {
    postTest(firstPostDay, goodLevel(), rng.chance(0.05));
  } else if (diagnosedOnSite) {
    // Fixed on the spot: only the post-rework test; if the owner has not approved, a confirming test.
    if (reworkDone) postTest(firstPostDay, goodLevel(), false);
    else if (rng.chance(0.5)) postTest(firstPostDay, round(Math.max(ACTION_LEVEL_PCI_L + 0.1, preLevel * rng.range(0.35, 0.8)), 1), false);
  } else {
    postTest(firstPostDay, round(Math.max(ACTION_LEVEL_PCI_L + 0.1, preLevel * rng.range(0.35, 0.8)), 1), false);
    if (reworkDone) postTest(firstPostDay + rng.int(21, 45) * DAY_MS, goodLevel(), false);
  }
}

/** One deliberately awkward side-by-side pair: one device above 4, the average below it. */
function addStraddlingPair(ctx: VisitContext): void {
  const visit = ctx.visits.find((v) => v.status === 'completed' && !v.reworkNeeded && v.homeKey && v.technicianEmail.endsWith('tarrowby-radon.test'));
  if (!visit) return;
  const start = dateMs(visit.visitedOn) + 3 * DAY_MS + 15 * 3_600_000;
  const end = start + 48 * 3_600_000;
  const group = `sbs-${String(++ctx.sideBySide).padStart(2, '0')}`;
  // Replace the visit's single post test with the pair so the home has one post result set.
  const existing = ctx.tests.filter((t) => t.homeKey === visit.homeKey && t.kind === 'post');
  for (const t of existing) ctx.tests.splice(ctx.tests.indexOf(t), 1);
  for (const level of [3.6, 4.1]) {
    addTest(ctx, { homeKey: visit.homeKey, kind: 'post', device: 'charcoal', startedAt: isoTime(start), endedAt: isoTime(end), resultPciL: level, sideBySideGroup: group });
  }
  visit.notes += ' Side-by-side charcoal pair read 3.6 and 4.1 pCi/L (average 3.9).';
}

// ---------------------------------------------------------------------------------------------
// Land use
// ---------------------------------------------------------------------------------------------

function rect(x0: number, y0: number, x1: number, y1: number): P[] {
  return closeCcw([
    [x0, y0],
    [x1, y0],
    [x1, y1],
    [x0, y1],
  ]);
}

function makeLanduse(): Feature<Polygon | LineString, LandUseProps>[] {
  const pond: P[] = [];
  for (let i = 0; i < 36; i++) {
    const a = (2 * Math.PI * i) / 36;
    // A slightly lopsided ellipse reads as a pond rather than a drawn shape.
    pond.push([400 + 160 * Math.cos(a) + 18 * Math.cos(2 * a), 680 + 62 * Math.sin(a)]);
  }
  const creek: P[] = [];
  for (let x = 560; x <= 1760; x += 40) creek.push([x, 690 - (x - 560) * 0.25 + 20 * Math.sin((x - 560) / 90)]);
  const poly = (kind: LandUseProps['kind'], name: string, ring: P[]): Feature<Polygon, LandUseProps> => ({
    type: 'Feature',
    properties: { kind, name },
    geometry: { type: 'Polygon', coordinates: [ring.map(toLonLat)] },
  });
  return [
    poly('park', 'Commons Park', rect(-780, -380, -420, -20)),
    poly('school', 'Tarrowby Elementary Field', rect(-400, -380, -20, -20)),
    poly('park', 'Fennel Creek Greenway', rect(20, 572, 780, 780)),
    poly('water', 'Fennel Pond', closeCcw(pond)),
    { type: 'Feature', properties: { kind: 'water', name: 'Fennel Creek' }, geometry: { type: 'LineString', coordinates: creek.map(toLonLat) } },
  ];
}

// ---------------------------------------------------------------------------------------------
// The generator
// ---------------------------------------------------------------------------------------------

/** Builds the whole demo scenario in memory. Pure: same seed, same result. */
export function generateDemo(seed: string = DEMO_SEED): DemoData {
  // Separate streams so that tuning, say, visit outcomes does not reshuffle owners or house shapes.
  const geoRng = new Rng(`${seed}:geometry`);
  const peopleRng = new Rng(`${seed}:people`);
  const visitRng = new Rng(`${seed}:visits`);

  const roads = buildSectionRoads();
  const layouts = COMMUNITIES.map((plan) => layoutCommunity(plan, roads));
  const chains = [...roads.values(), ...layouts.flatMap((l) => l.chains)];
  const names = new Set<string>();
  for (const c of chains) {
    if (names.has(c.name)) throw new Error(`street name used twice: ${c.name}`);
    names.add(c.name);
  }
  const segments = splitIntoSegments(chains);
  const drafts = makeHomes(segments, geoRng);
  // Company 1 first, then company 2, so keys read in a stable, tenant-grouped order.
  drafts.sort((a, b) => (a.home.companyKey === b.home.companyKey ? 0 : a.home.companyKey === C1 ? -1 : 1));
  describeHomes(drafts, layouts, peopleRng);
  const homes = drafts.map((d) => d.home);

  const fans: DemoFan[] = FAN_SPECS.map((f) => ({
    key: f.key,
    companyKey: f.companyKey,
    name: f.name,
    maxStaticInWc: f.maxStatic,
    curve: fanCurve(f.maxStatic, f.maxFlow),
  }));
  const ctx: VisitContext = { rng: visitRng, visits: [], tests: [], fans, sideBySide: 0 };
  for (const plan of COMMUNITIES) {
    const technician = COMPANIES.find((c) => c.key === plan.companyKey)!.users.find((u) => u.role === 'technician')!;
    const all = homes.filter((h) => h.communityKey === plan.key);
    const eligible = all.filter((h) => h.passiveSystem === 'yes' && !h.doNotContact);
    const chosen = visitRng.shuffle(eligible).slice(0, Math.round(plan.sampleRate * all.length));
    chosen.sort((a, b) => a.key.localeCompare(b.key));
    for (const home of chosen) makeVisit(ctx, plan, home, technician.email);
  }
  addStraddlingPair(ctx);
  ctx.visits.sort((a, b) => a.visitedOn.localeCompare(b.visitedOn) || a.homeKey.localeCompare(b.homeKey));
  ctx.visits.forEach((v, i) => (v.key = `v-${String(i + 1).padStart(4, '0')}`));
  ctx.tests.sort((a, b) => a.startedAt.localeCompare(b.startedAt) || a.homeKey.localeCompare(b.homeKey) || a.key.localeCompare(b.key));
  ctx.tests.forEach((t, i) => (t.key = `rt-${String(i + 1).padStart(4, '0')}`));

  const streets: FeatureCollection<LineString, StreetProps> = {
    type: 'FeatureCollection',
    features: segments.map((s) => ({ type: 'Feature', properties: s.props, geometry: { type: 'LineString', coordinates: s.pts.map(toLonLat) } })),
  };
  const lots: FeatureCollection<Polygon, LotProps> = {
    type: 'FeatureCollection',
    features: drafts.map((d) => ({ type: 'Feature', properties: { homeKey: d.home.key }, geometry: { type: 'Polygon', coordinates: [d.lot.map(toLonLat)] } })),
  };
  const communities: FeatureCollection<Polygon, CommunityProps> = {
    type: 'FeatureCollection',
    features: layouts.map(({ plan, polygon }) => ({
      type: 'Feature',
      properties: {
        key: plan.key,
        companyKey: plan.companyKey,
        name: plan.name,
        builderKeys: plan.builderKeys,
        yearFrom: plan.yearFrom,
        yearTo: plan.yearTo,
        jurisdiction: plan.jurisdiction,
        passiveRequired: plan.passiveRequired,
      },
      geometry: { type: 'Polygon', coordinates: [polygon.map(toLonLat)] },
    })),
  };
  const landuse: FeatureCollection<Polygon | LineString, LandUseProps> = { type: 'FeatureCollection', features: makeLanduse() };

  const bbox: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const f of [...streets.features, ...lots.features]) {
    const coords = f.geometry.type === 'Polygon' ? f.geometry.coordinates[0] : f.geometry.coordinates;
    for (const [lon, lat] of coords) {
      bbox[0] = Math.min(bbox[0], lon);
      bbox[1] = Math.min(bbox[1], lat);
      bbox[2] = Math.max(bbox[2], lon);
      bbox[3] = Math.max(bbox[3], lat);
    }
  }

  return {
    streets,
    lots,
    landuse,
    communities,
    scenario: {
      town: { name: TOWN, state: STATE, zip: ZIP_WEST, center: ORIGIN, bbox },
      companies: COMPANIES,
      builders: BUILDERS,
      fans,
      homes,
      visits: ctx.visits,
      radonTests: ctx.tests,
    },
  };
}

// ---------------------------------------------------------------------------------------------
// Serialisation: one feature / one record per line, so diffs of the committed files stay readable.
// ---------------------------------------------------------------------------------------------

function featureCollectionText(fc: FeatureCollection): string {
  return `{"type":"FeatureCollection","features":[\n${fc.features.map((f) => JSON.stringify(f)).join(',\n')}\n]}\n`;
}

function scenarioText(s: DemoScenario): string {
  const parts = Object.entries(s).map(([k, v]) =>
    Array.isArray(v) ? `${JSON.stringify(k)}: [\n${v.map((item) => JSON.stringify(item)).join(',\n')}\n]` : `${JSON.stringify(k)}: ${JSON.stringify(v)}`,
  );
  return `{\n${parts.join(',\n')}\n}\n`;
}

/** File contents keyed by path relative to data/. */
export function serialiseDemo(data: DemoData): Record<string, string> {
  return {
    [DEMO_FILES.streets]: featureCollectionText(data.streets),
    [DEMO_FILES.lots]: featureCollectionText(data.lots),
    [DEMO_FILES.landuse]: featureCollectionText(data.landuse),
    [DEMO_FILES.communities]: featureCollectionText(data.communities),
    [DEMO_FILES.scenario]: scenarioText(data.scenario),
  };
}

export function writeDemo(dataDir: string): Record<string, string> {
  const files = serialiseDemo(generateDemo());
  for (const [rel, text] of Object.entries(files)) {
    const path = join(dataDir, rel);
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(path, text);
  }
  return files;
}

// Write files only when run as a script, so tests can import the generator without side effects.
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const dataDir = dirname(fileURLToPath(import.meta.url));
  const files = writeDemo(dataDir);
  for (const [rel, text] of Object.entries(files)) console.log(`${rel}  ${(text.length / 1024).toFixed(0)} KiB`);
}
