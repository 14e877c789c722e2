import { readFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import GeoJSONVT from 'geojson-vt';
import type { Feature, FeatureCollection, Geometry, Point, Position } from 'geojson';
import type { StyleSpecification } from '@maplibre/maplibre-gl-style-spec';
import { AppError } from '../../lib/errors.js';
import {
  BASE_SOURCE,
  DEMO_LAYERS,
  DEMO_TILE_LAYERS,
  LOTS_MIN_ZOOM,
  PMTILES_LAYERS,
  REGULAR_FONT,
  SEMIBOLD_FONT,
  type DemoTileLayer,
} from './basemap-style-layers.js';

// vt-pbf and fontnik are CommonJS packages without type declarations.
const require = createRequire(import.meta.url);
const vtpbf = require('vt-pbf') as { fromGeojsonVt(layers: Record<string, unknown>, options: { version: number }): Uint8Array };

export const DEMO_DATA_DIR = fileURLToPath(new URL('../../../data/demo/', import.meta.url));

/** The base tile source's zoom span: MapLibre over-zooms z16 tiles beyond it, and the map opens at z10 at the widest. */
export const BASE_MIN_ZOOM = 10;
export const BASE_MAX_ZOOM = 16;

// ---------------------------------------------------------------------------------------------
// Vector tiles of the demo town
// ---------------------------------------------------------------------------------------------

/**
 * A tile with no layers. A vector tile is a protobuf `Tile` message (Mapbox Vector Tile spec 2.1,
 * §4.1) and a message with no fields encodes to zero bytes, so an empty body is a valid, empty
 * tile; MapLibre draws it as "nothing here" without the error a 404 would log.
 */
const EMPTY_TILE = Buffer.alloc(0);

/**
 * The demo town's whole z10–16 pyramid is ~115 tiles and ~170 KB (largest ~13 KB), so this holds all
 * of it many times over; the bounds matter for a larger data set, not for the demo.
 */
const DEFAULT_TILE_CACHE_BYTES = 16 * 1024 * 1024;
const DEFAULT_TILE_CACHE_ENTRIES = 2048;

export interface BaseTiles {
  /** The demo town's Mapbox Vector Tile (version 2) at z/x/y; an empty buffer where the town has nothing. */
  getTile(z: number, x: number, y: number): Buffer;
  /** Builds the tile indexes now rather than on the first request. */
  warm(): void;
}

type Indexes = Record<DemoTileLayer, GeoJSONVT>;

/**
 * Vector tiles cut from the demo town's GeoJSON in `dataDir`. The files are read and the
 * geojson-vt indexes built once, on first use; encoded tiles are kept in a bounded LRU cache.
 */
export function createBaseTiles(dataDir: string = DEMO_DATA_DIR, cache = { maxBytes: DEFAULT_TILE_CACHE_BYTES, maxEntries: DEFAULT_TILE_CACHE_ENTRIES }): BaseTiles {
  let indexes: Indexes | undefined;
  // A Map iterates in insertion order, so re-inserting on every hit makes its first key the least recently used.
  const tiles = new Map<string, Buffer>();
  let cachedBytes = 0;

  const ensureIndexes = () => (indexes ??= buildIndexes(loadDemoLayers(dataDir)));

  return {
    warm() {
      ensureIndexes();
    },
    getTile(z, x, y) {
      const key = `${z}/${x}/${y}`;
      const hit = tiles.get(key);
      if (hit) {
        tiles.delete(key);
        tiles.set(key, hit);
        return hit;
      }
      const tile = encodeTile(ensureIndexes(), z, x, y);
      // Empty tiles are as cheap to recompute as to look up; caching them would only evict real ones.
      if (tile.length === 0) return tile;
      tiles.set(key, tile);
      cachedBytes += tile.length;
      for (const [oldKey, old] of tiles) {
        if (cachedBytes <= cache.maxBytes && tiles.size <= cache.maxEntries) break;
        tiles.delete(oldKey);
        cachedBytes -= old.length;
      }
      return tile;
    },
  };
}

function encodeTile(indexes: Indexes, z: number, x: number, y: number): Buffer {
  // Above the source's maxzoom MapLibre over-zooms the z16 tile, and geojson-vt (maxZoom 16) has no
  // deeper tiles to give; answering at once also keeps stray z17–22 requests from walking the index.
  if (z > BASE_MAX_ZOOM) return EMPTY_TILE;
  const layers: Record<string, { features: unknown[] }> = {};
  for (const name of DEMO_TILE_LAYERS) {
    if (name === 'lots' && z < LOTS_MIN_ZOOM) continue;
    const tile = indexes[name].getTile(z, x, y);
    // MVT spec 2.1 §4.1: a layer SHOULD contain at least one feature, so empty layers are left out.
    if (tile && tile.features.length > 0) layers[name] = tile;
  }
  if (Object.keys(layers).length === 0) return EMPTY_TILE;
  const bytes = vtpbf.fromGeojsonVt(layers, { version: 2 });
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

function buildIndexes(layers: Record<DemoTileLayer, FeatureCollection>): Indexes {
  // maxZoom = the source's maxzoom: geojson-vt keeps full detail there and MapLibre over-zooms beyond.
  const options = { maxZoom: BASE_MAX_ZOOM };
  return Object.fromEntries(DEMO_TILE_LAYERS.map((name) => [name, new GeoJSONVT(layers[name], options)])) as Indexes;
}

/**
 * Reads the demo GeoJSON and keeps only what the style draws: tiles are public map furniture, so
 * business fields (a community's company, builders and years; a lot's home) stay out of them, and
 * smaller tiles are faster tiles.
 */
export function loadDemoLayers(dataDir: string): Record<DemoTileLayer, FeatureCollection> {
  const read = (file: string): FeatureCollection => {
    const fullPath = path.join(dataDir, file);
    try {
      return JSON.parse(readFileSync(fullPath, 'utf8')) as FeatureCollection;
    } catch (err) {
      throw new Error(`Cannot read the demo basemap file ${fullPath}; run \`npm run demo:generate\``, { cause: err });
    }
  };
  const pick = (fc: FeatureCollection, keys: string[]): FeatureCollection => ({
    type: 'FeatureCollection',
    features: fc.features.map((f) => ({
      type: 'Feature',
      geometry: f.geometry,
      properties: Object.fromEntries(keys.filter((k) => f.properties?.[k] != null).map((k) => [k, f.properties![k]])),
    })),
  });

  const communities = pick(read('communities.geojson'), ['name']);
  return {
    streets: mergeStreetSegments(pick(read('streets.geojson'), ['name', 'class'])),
    lots: pick(read('lots.geojson'), []),
    landuse: pick(read('landuse.geojson'), ['kind', 'name']),
    communities,
    community_labels: {
      type: 'FeatureCollection',
      features: communities.features.flatMap((f): Feature<Point>[] => {
        const ring = outerRing(f.geometry);
        return ring ? [{ type: 'Feature', properties: f.properties, geometry: { type: 'Point', coordinates: labelPoint(ring) } }] : [];
      }),
    },
  };
}

/**
 * Joins a street's block segments (the address-range file splits streets at every junction) back
 * into long lines. MapLibre places a line label only where the line is longer than the label, so
 * 100 m blocks would leave streets unnamed until z16; whole streets are also fewer features per tile.
 */
export function mergeStreetSegments(fc: FeatureCollection): FeatureCollection {
  const groups = new Map<string, { properties: Feature['properties']; lines: Position[][] }>();
  const rest: Feature[] = [];
  for (const f of fc.features) {
    if (f.geometry?.type !== 'LineString' || f.geometry.coordinates.length < 2) {
      rest.push(f);
      continue;
    }
    const key = `${f.properties?.name ?? ''}\u0000${f.properties?.class ?? ''}`;
    const group = groups.get(key) ?? { properties: f.properties, lines: [] };
    group.lines.push(f.geometry.coordinates);
    groups.set(key, group);
  }
  const merged: Feature[] = [];
  for (const { properties, lines } of groups.values()) {
    for (const coordinates of joinLines(lines)) merged.push({ type: 'Feature', properties, geometry: { type: 'LineString', coordinates } });
  }
  return { type: 'FeatureCollection', features: [...merged, ...rest] };
}

/** Greedily chains lines whose ends share exactly the same coordinate, reversing a line where needed. */
function joinLines(lines: Position[][]): Position[][] {
  const at = (p: Position) => `${p[0]},${p[1]}`;
  const byEnd = new Map<string, number[]>();
  lines.forEach((line, i) => {
    for (const p of [line[0], line[line.length - 1]]) byEnd.set(at(p), [...(byEnd.get(at(p)) ?? []), i]);
  });
  const used = new Set<number>();
  const takeAt = (p: Position): Position[] | undefined => {
    const i = byEnd.get(at(p))?.find((j) => !used.has(j));
    if (i === undefined) return undefined;
    used.add(i);
    const line = lines[i];
    return at(line[0]) === at(p) ? line : [...line].reverse();
  };
  const result: Position[][] = [];
  lines.forEach((line, i) => {
    if (used.has(i)) return;
    used.add(i);
    let chain = [...line];
    for (let next = takeAt(chain[chain.length - 1]); next; next = takeAt(chain[chain.length - 1])) chain = chain.concat(next.slice(1));
    for (let prev = takeAt(chain[0]); prev; prev = takeAt(chain[0])) chain = [...prev].reverse().concat(chain.slice(1));
    result.push(chain);
  });
  return result;
}

function outerRing(geometry: Geometry | null): Position[] | undefined {
  if (geometry?.type === 'Polygon') return geometry.coordinates[0];
  if (geometry?.type === 'MultiPolygon') {
    // The largest part carries the name.
    return geometry.coordinates.map((p) => p[0]).sort((a, b) => Math.abs(ringArea(b)) - Math.abs(ringArea(a)))[0];
  }
  return undefined;
}

function ringArea(ring: Position[]): number {
  let a = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) a += ring[j][0] * ring[i][1] - ring[i][0] * ring[j][1];
  return a / 2;
}

/**
 * A point inside the ring for its label: the area centroid when that falls inside (convex and most
 * plat outlines), otherwise the middle of the widest inside stretch of the horizontal line through
 * the centroid (an L- or U-shaped outline). Planar maths on lon/lat is fine at a town's scale.
 */
export function labelPoint(ring: Position[]): Position {
  const area = ringArea(ring);
  let cx = 0;
  let cy = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const cross = ring[j][0] * ring[i][1] - ring[i][0] * ring[j][1];
    cx += (ring[j][0] + ring[i][0]) * cross;
    cy += (ring[j][1] + ring[i][1]) * cross;
  }
  if (area === 0) return ring[0];
  cx /= 6 * area;
  cy /= 6 * area;
  const crossings: number[] = [];
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [x1, y1] = ring[j];
    const [x2, y2] = ring[i];
    if (y1 > cy !== y2 > cy) crossings.push(x1 + ((cy - y1) / (y2 - y1)) * (x2 - x1));
  }
  crossings.sort((a, b) => a - b);
  let best: [number, number] | undefined;
  for (let k = 0; k + 1 < crossings.length; k += 2) {
    if (cx >= crossings[k] && cx <= crossings[k + 1]) return [cx, cy];
    if (!best || crossings[k + 1] - crossings[k] > best[1] - best[0]) best = [crossings[k], crossings[k + 1]];
  }
  return best ? [(best[0] + best[1]) / 2, cy] : [cx, cy];
}

let demoTiles: BaseTiles | undefined;

/** The demo town's tile at z/x/y from `data/demo/`, shared by every caller in the process. */
export function getBaseTile(z: number, x: number, y: number): Buffer {
  demoTiles ??= createBaseTiles();
  return demoTiles.getTile(z, x, y);
}

// ---------------------------------------------------------------------------------------------
// Glyphs
// ---------------------------------------------------------------------------------------------

interface Fontnik {
  range(options: { font: Buffer; start: number; end: number }, callback: (err: Error | null, pbf: Buffer) => void): void;
  composite(pbfs: Buffer[], callback: (err: Error | null, pbf: Buffer) => void): void;
}
const fontnik = require('fontnik') as Fontnik;

const FONT_DIR = path.join(path.dirname(require.resolve('@fontsource/ibm-plex-sans/package.json')), 'files');
/**
 * The fonts the style names, as the WOFF 1 files fontnik reads (it cannot read WOFF 2). Fontsource
 * splits each weight into Unicode subsets; latin plus latin-ext covers the street and community
 * names of North American and European data.
 */
const FONT_WEIGHTS: Record<string, number> = { [REGULAR_FONT]: 400, [SEMIBOLD_FONT]: 600 };
const FONT_SUBSETS = ['latin', 'latin-ext'];
const fontFiles = new Map<string, Promise<Buffer[]>>();
// Keyed by resolved font and range, so it holds at most 2 fonts × 256 ranges whatever clients ask for.
const glyphCache = new Map<string, Promise<Buffer>>();

/** The first font of a comma-separated stack that we ship; Regular when none is. */
export function resolveFontstack(fontstack: string): string {
  return fontstack.split(',').map((f) => f.trim()).find((f) => Object.hasOwn(FONT_WEIGHTS, f)) ?? REGULAR_FONT;
}

/** Parses `start-end`; MapLibre asks for 256-code-point blocks aligned on 256, up to U+FFFF. */
export function parseGlyphRange(range: string): { start: number; end: number } {
  const match = /^(\d{1,5})-(\d{1,5})$/.exec(range);
  const start = match ? Number(match[1]) : NaN;
  const end = match ? Number(match[2]) : NaN;
  if (!(start % 256 === 0 && end === start + 255 && end <= 65535)) {
    const message = 'must be a 256-code-point block such as 0-255 or 256-511, ending at 65535 at most';
    throw new AppError('VALIDATION_FAILED', 400, `Invalid glyph range: ${message}`, [{ field: 'range', message }]);
  }
  return { start, end };
}

/**
 * Signed-distance-field glyphs for MapLibre (its glyph PBF format) of one 256-code-point block,
 * rendered by fontnik from the shipped IBM Plex Sans, latin and latin-ext subsets merged.
 * Rendering costs ~70 ms a block, so each block is rendered once per process.
 */
export async function getGlyphs(fontstack: string, range: string): Promise<Buffer> {
  const { start, end } = parseGlyphRange(range);
  const font = resolveFontstack(fontstack);
  const key = `${font}/${start}`;
  let glyphs = glyphCache.get(key);
  if (!glyphs) {
    glyphs = renderGlyphs(font, start, end);
    // A failure is not cached: the next request tries again.
    glyphs.catch(() => glyphCache.delete(key));
    glyphCache.set(key, glyphs);
  }
  return glyphs;
}

async function renderGlyphs(font: string, start: number, end: number): Promise<Buffer> {
  const files = await loadFontFiles(font);
  const parts = await Promise.all(files.map((file) => callback<Buffer>((done) => fontnik.range({ font: file, start, end }, done))));
  // composite merges the subsets into one fontstack message (first file wins where both have a glyph),
  // instead of the two stacks a plain concatenation would give.
  return callback<Buffer>((done) => fontnik.composite(parts, done));
}

function loadFontFiles(font: string): Promise<Buffer[]> {
  let files = fontFiles.get(font);
  if (!files) {
    const weight = FONT_WEIGHTS[font];
    files = Promise.all(FONT_SUBSETS.map((subset) => readFile(path.join(FONT_DIR, `ibm-plex-sans-${subset}-${weight}-normal.woff`))));
    files.catch(() => fontFiles.delete(font));
    fontFiles.set(font, files);
  }
  return files;
}

function callback<T>(run: (done: (err: Error | null, value: T) => void) => void): Promise<T> {
  return new Promise((resolve, reject) => run((err, value) => (err ? reject(err) : resolve(value))));
}

// ---------------------------------------------------------------------------------------------
// Style
// ---------------------------------------------------------------------------------------------

export interface StyleOptions {
  /** Path (on this app) of a PMTiles archive to draw instead of the demo town, e.g. `/map/basemap.pmtiles`. */
  pmtilesUrl?: string;
  /** Shown in the map's attribution control; must satisfy the data's licence (OpenStreetMap: "© OpenStreetMap contributors"). */
  attribution: string;
}

/**
 * The MapLibre style (style spec version 8) of the basemap, with every URL on `origin`: the app
 * serves tiles, glyphs and any PMTiles archive itself and the browser never contacts another host.
 * The client adds its `homes` source and layers on top (layer ids: basemap-style-layers.ts).
 */
export function getStyle(origin: string, options: StyleOptions): StyleSpecification {
  const base = options.pmtilesUrl
    ? // The pmtiles:// protocol (registered by the client) reads the archive's header for zooms and bounds.
      { type: 'vector' as const, url: `pmtiles://${origin}${options.pmtilesUrl}`, attribution: options.attribution }
    : {
        type: 'vector' as const,
        tiles: [`${origin}/tiles/base/{z}/{x}/{y}.pbf`],
        minzoom: BASE_MIN_ZOOM,
        maxzoom: BASE_MAX_ZOOM,
        attribution: options.attribution,
      };
  return {
    version: 8,
    name: 'Tractwise paper',
    sources: { [BASE_SOURCE]: base },
    glyphs: `${origin}/glyphs/{fontstack}/{range}.pbf`,
    // Copies: callers may add to the layer list without changing the next response.
    layers: structuredClone(options.pmtilesUrl ? PMTILES_LAYERS : DEMO_LAYERS),
  };
}
