import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { VectorTile } from '@mapbox/vector-tile';
import { PbfReader } from 'pbf';
import { validateStyleMin, type StyleSpecification } from '@maplibre/maplibre-gl-style-spec';
import type { FeatureCollection, Position } from 'geojson';
import { AppError } from '../../lib/errors.js';
import { FIXTURE_CENTRE, tileAt, writeFixtureTown } from './basemap-fixture.js';
import { DEMO_TILE_LAYERS } from './basemap-style-layers.js';
import {
  createBaseTiles,
  DEMO_DATA_DIR,
  getGlyphs,
  getStyle,
  labelPoint,
  mergeStreetSegments,
  parseGlyphRange,
  resolveFontstack,
  type BaseTiles,
} from './basemap.service.js';

const decode = (buf: Buffer) => new VectorTile(new PbfReader(buf));
const propsOf = (tile: VectorTile, layer: string) => {
  const l = tile.layers[layer];
  return l ? Array.from({ length: l.length }, (_, i) => l.feature(i).properties) : [];
};

/**
 * Reads glyph ids from a glyph PBF as MapLibre defines it (maplibre-gl-js src/style/parse_glyph_pbf.ts,
 * after fontnik's proto/glyphs.proto): glyphs { repeated fontstack stacks = 1 },
 * fontstack { name = 1; range = 2; repeated glyph glyphs = 3 }, glyph { id = 1; ... }.
 */
function glyphIds(buf: Buffer): { ranges: string[]; ids: number[] } {
  const out = { ranges: [] as string[], ids: [] as number[] };
  new PbfReader(buf).readFields((tag, result, pbf) => {
    if (tag !== 1) return;
    pbf.readMessage((stackTag, r, p) => {
      if (stackTag === 2) r.ranges.push(p.readString());
      else if (stackTag === 3) {
        p.readMessage((glyphTag, rr, pp) => {
          if (glyphTag === 1) rr.ids.push(pp.readVarint());
        }, r);
      }
    }, result);
  }, out);
  return out;
}

describe('base tiles from the fixture town', () => {
  let dir: string;
  let tiles: BaseTiles;
  beforeAll(() => {
    dir = writeFixtureTown();
    tiles = createBaseTiles(dir);
  });

  it('encodes the town centre at z14 as a version 2 vector tile whose streets carry name and class', () => {
    const { z, x, y } = tileAt(FIXTURE_CENTRE, 14);
    const tile = decode(tiles.getTile(z, x, y));
    // Mapbox Vector Tile spec 2.1 §4.1: layers carry version 2 and their extent (geojson-vt's 4096).
    expect(tile.layers.streets.version).toBe(2);
    expect(tile.layers.streets.extent).toBe(4096);
    const streets = propsOf(tile, 'streets');
    expect(streets.length).toBeGreaterThan(0);
    for (const p of streets) {
      // Only what the style draws: no address ranges, ZIPs or ids in public tiles.
      expect(Object.keys(p).sort()).toEqual(['class', 'name']);
      expect(['arterial', 'collector', 'local']).toContain(p.class);
    }
    expect(streets.map((p) => p.name).sort()).toEqual(['Fixture Ave', 'Sample Rd', 'Trial Ct']);
    expect(Object.keys(tile.layers).sort()).toEqual(['communities', 'community_labels', 'landuse', 'streets']);
  });

  it('puts lots into tiles only from z15, where the style draws them', () => {
    const at14 = tileAt(FIXTURE_CENTRE, 14);
    const at15 = tileAt(FIXTURE_CENTRE, 15);
    expect(decode(tiles.getTile(at14.z, at14.x, at14.y)).layers.lots).toBeUndefined();
    const lots = decode(tiles.getTile(at15.z, at15.x, at15.y)).layers.lots;
    expect(lots.length).toBe(2);
    expect(lots.feature(0).type).toBe(3); // MVT spec 2.1 §4.3.4: GeomType POLYGON = 3
    expect(lots.feature(0).properties).toEqual({});
  });

  it('keeps only public fields of communities and labels each once at a point inside it', () => {
    const { z, x, y } = tileAt(FIXTURE_CENTRE, 14);
    const tile = decode(tiles.getTile(z, x, y));
    expect(propsOf(tile, 'communities')).toEqual([{ name: 'Fixture Meadows' }]);
    const labels = tile.layers.community_labels;
    expect(labels.length).toBe(1);
    expect(labels.feature(0).type).toBe(1); // POINT
    const [lon, lat] = (labels.feature(0).toGeoJSON(x, y, z).geometry as { coordinates: number[] }).coordinates;
    // The fixture community is the square of half-side 0.0015° around centre + (0.002°, 0.001°).
    expect(lon).toBeCloseTo(FIXTURE_CENTRE[0] + 0.002, 4);
    expect(lat).toBeCloseTo(FIXTURE_CENTRE[1] + 0.001, 4);
  });

  it('answers a tile far outside the town with an empty but valid tile', () => {
    const { z, x, y } = tileAt([2.35, 48.85], 14);
    const buf = tiles.getTile(z, x, y);
    // A protobuf message with no fields is zero bytes (MVT spec 2.1 §4.1: a tile is a protobuf `Tile`).
    expect(buf.length).toBe(0);
    expect(Object.keys(decode(buf).layers)).toEqual([]);
  });

  it('leaves zooms above the source maxzoom (16) empty, for MapLibre to over-zoom z16', () => {
    const { z, x, y } = tileAt(FIXTURE_CENTRE, 17);
    expect(tiles.getTile(z, x, y).length).toBe(0);
  });

  it('serves a repeated tile from its cache', () => {
    const { z, x, y } = tileAt(FIXTURE_CENTRE, 13);
    expect(tiles.getTile(z, x, y)).toBe(tiles.getTile(z, x, y));
  });

  it('evicts the least recently used tile once over its budget', () => {
    const small = createBaseTiles(dir, { maxBytes: Number.MAX_SAFE_INTEGER, maxEntries: 2 });
    const [a, b, c] = [12, 13, 14].map((z) => tileAt(FIXTURE_CENTRE, z));
    const first = small.getTile(a.z, a.x, a.y);
    small.getTile(b.z, b.x, b.y);
    small.getTile(c.z, c.x, c.y);
    expect(small.getTile(a.z, a.x, a.y)).not.toBe(first);
    expect(small.getTile(a.z, a.x, a.y)).toEqual(first);
  });

  it('reports a missing data directory by name', () => {
    expect(() => createBaseTiles(path.join(dir, 'nowhere')).warm()).toThrow(/nowhere.*demo:generate/);
  });
});

describe('street and label geometry', () => {
  it('joins a street split into block segments back into one line, whatever each segment’s direction', () => {
    const fc: FeatureCollection = {
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: { name: 'A St', class: 'local' }, geometry: { type: 'LineString', coordinates: [[1, 0], [2, 0]] } },
        { type: 'Feature', properties: { name: 'A St', class: 'local' }, geometry: { type: 'LineString', coordinates: [[0, 0], [1, 0]] } },
        { type: 'Feature', properties: { name: 'A St', class: 'local' }, geometry: { type: 'LineString', coordinates: [[3, 0], [2, 0]] } },
        { type: 'Feature', properties: { name: 'B St', class: 'local' }, geometry: { type: 'LineString', coordinates: [[2, 0], [2, 1]] } },
      ],
    };
    const merged = mergeStreetSegments(fc).features;
    expect(merged).toHaveLength(2);
    const a = merged.find((f) => f.properties?.name === 'A St')!.geometry as { coordinates: Position[] };
    const xs = a.coordinates.map((p) => p[0]);
    expect(xs[0] < xs[xs.length - 1] ? xs : [...xs].reverse()).toEqual([0, 1, 2, 3]);
  });

  it('places a label inside an L-shaped outline whose centroid falls outside it', () => {
    // An L: the 0..3 × 0..1 bar plus the 0..1 × 1..3 leg; its centroid (≈ 1.1, 1.1) is in the notch.
    const ring: Position[] = [[0, 0], [3, 0], [3, 1], [1, 1], [1, 3], [0, 3], [0, 0]];
    const [x, y] = labelPoint(ring);
    const inBar = x > 0 && x < 3 && y > 0 && y < 1;
    const inLeg = x > 0 && x < 1 && y >= 1 && y < 3;
    expect(inBar || inLeg).toBe(true);
  });
});

describe('glyphs', () => {
  it('renders 0-255 of IBM Plex Sans Regular as a glyph PBF that includes A (U+0041 = 65)', async () => {
    const buf = await getGlyphs('IBM Plex Sans Regular', '0-255');
    const { ranges, ids } = glyphIds(buf);
    expect(ranges).toEqual(['0-255']);
    expect(ids).toContain(65);
    expect(ids).toContain(0xe9); // é: latin-1, needed for names like "Gérard Rd"
    expect(ids.every((id) => id >= 0 && id <= 255)).toBe(true);
  });

  it('merges the latin-ext subset into the same block (U+0141 Ł is only in latin-ext)', async () => {
    const { ids } = glyphIds(await getGlyphs('IBM Plex Sans SemiBold', '256-511'));
    expect(ids).toContain(0x141);
  });

  it('renders a block once and then answers from its cache', async () => {
    const first = await getGlyphs('IBM Plex Sans Regular', '512-767');
    expect(await getGlyphs('IBM Plex Sans Regular, Noto Sans Regular', '512-767')).toBe(first);
  });

  it('uses the first shipped font of a stack and falls back to Regular', () => {
    expect(resolveFontstack('Noto Sans Bold,IBM Plex Sans SemiBold')).toBe('IBM Plex Sans SemiBold');
    expect(resolveFontstack('Arial Unicode MS Regular')).toBe('IBM Plex Sans Regular');
    expect(resolveFontstack('toString')).toBe('IBM Plex Sans Regular');
  });

  it.each(['0-256', '1-256', '256-255', '65536-65791', 'a-b', '0-255x', '-256--1', ''])('rejects the range %j', async (range) => {
    expect(() => parseGlyphRange(range)).toThrow(AppError);
    await expect(getGlyphs('IBM Plex Sans Regular', range)).rejects.toMatchObject({ code: 'VALIDATION_FAILED', status: 400 });
  });

  it('accepts the last block, 65280-65535', () => {
    expect(parseGlyphRange('65280-65535')).toEqual({ start: 65280, end: 65535 });
  });
});

/** Every string in the style that looks like a URL. */
function urlsIn(value: unknown): string[] {
  return JSON.stringify(value).match(/[a-z][a-z0-9+.-]*:\/\/[^"\\\s]*/gi) ?? [];
}

describe('style', () => {
  const origin = 'http://127.0.0.1:3000';

  function checkStructure(style: StyleSpecification, sourceLayers: readonly string[]) {
    // MapLibre style spec: root `version` must be 8; every layer but background names an existing source.
    expect(style.version).toBe(8);
    expect(validateStyleMin(style)).toEqual([]);
    const ids = style.layers.map((l) => l.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const layer of style.layers) {
      if (layer.type === 'background') continue;
      expect(style.sources).toHaveProperty((layer as { source: string }).source);
      expect(sourceLayers).toContain((layer as { 'source-layer': string })['source-layer']);
    }
    expect(style.glyphs).toBe(`${origin}/glyphs/{fontstack}/{range}.pbf`);
    // No request may leave the machine: every URL is on the app's own origin.
    const urls = urlsIn(style);
    expect(urls.length).toBeGreaterThan(0);
    for (const url of urls) expect(url.replace(/^pmtiles:\/\//, '').startsWith(`${origin}/`)).toBe(true);
    // Only the fonts the glyph endpoint renders (the client's community labels use SemiBold).
    const fonts = style.layers.flatMap((l) => ((l.layout as Record<string, unknown> | undefined)?.['text-font'] as string[] | undefined) ?? []);
    expect(fonts.length).toBeGreaterThan(0);
    for (const font of fonts) expect(['IBM Plex Sans Regular', 'IBM Plex Sans SemiBold']).toContain(font);
  }

  it('draws the demo town from this origin’s tiles with the layers the tiles contain', () => {
    const style = getStyle(origin, { attribution: 'Demo town: invented data' });
    checkStructure(style, DEMO_TILE_LAYERS);
    expect(style.sources.base).toEqual({
      type: 'vector',
      tiles: [`${origin}/tiles/base/{z}/{x}/{y}.pbf`],
      minzoom: 10,
      maxzoom: 16,
      attribution: 'Demo town: invented data',
    });
    expect(style.layers.map((l) => l.id)).toEqual([
      'background',
      'landuse',
      'water-fill',
      'water-line',
      'lots-fill',
      'lots-outline',
      'streets',
      'street-labels',
    ]);
  });

  it('uses the product palette (DESIGN.md)', () => {
    const style = getStyle(origin, { attribution: 'x' });
    const layer = (id: string) => style.layers.find((l) => l.id === id) as { paint: Record<string, unknown>; layout?: Record<string, unknown> };
    expect(layer('background').paint['background-color']).toBe('#F7F4EE');
    expect(layer('lots-outline').paint['line-color']).toBe('#DDD6CA');
    expect(layer('street-labels').paint['text-color']).toBe('#5B6573');
    expect(layer('street-labels').paint['text-halo-color']).toBe('#F7F4EE');
    expect(layer('street-labels').layout?.['symbol-placement']).toBe('line');
  });

  it('reads a configured PMTiles archive through the pmtiles protocol on the same origin', () => {
    const style = getStyle(origin, { attribution: '© OpenStreetMap contributors', pmtilesUrl: '/map/basemap.pmtiles' });
    // Protomaps basemap schema v4 layer names (docs.protomaps.com/basemaps/layers).
    checkStructure(style, ['earth', 'water', 'landuse', 'roads', 'places']);
    expect(style.sources.base).toEqual({ type: 'vector', url: `pmtiles://${origin}/map/basemap.pmtiles`, attribution: '© OpenStreetMap contributors' });
  });

  it('hands out a fresh copy each time, so a caller’s edits do not leak into the next response', () => {
    const style = getStyle(origin, { attribution: 'x' });
    style.layers.pop();
    expect(getStyle(origin, { attribution: 'x' }).layers.at(-1)?.id).toBe('street-labels');
  });
});

const demoFiles = ['streets', 'lots', 'landuse', 'communities'].map((f) => path.join(DEMO_DATA_DIR, `${f}.geojson`));

describe.skipIf(!demoFiles.every((f) => existsSync(f)))('the generated demo town (data/demo)', () => {
  const tiles = createBaseTiles();
  // The town centre: the middle of the streets' bounding box.
  const centre = (() => {
    const fc = JSON.parse(readFileSync(demoFiles[0], 'utf8')) as FeatureCollection;
    const coords = fc.features.flatMap((f) => (f.geometry as { coordinates: Position[] }).coordinates);
    const lons = coords.map((p) => p[0]);
    const lats = coords.map((p) => p[1]);
    return [(Math.min(...lons) + Math.max(...lons)) / 2, (Math.min(...lats) + Math.max(...lats)) / 2];
  })();

  it('has named, classed streets in the z14 tile at the town centre', () => {
    const { z, x, y } = tileAt(centre, 14);
    const tile = decode(tiles.getTile(z, x, y));
    const streets = propsOf(tile, 'streets');
    expect(streets.length).toBeGreaterThan(5);
    for (const p of streets) {
      expect(typeof p.name).toBe('string');
      expect(['arterial', 'collector', 'local']).toContain(p.class);
    }
    expect(tile.layers.communities.length).toBeGreaterThan(0);
    // Every source-layer the style reads exists in the demo tiles (lots from z15).
    const at15 = tileAt(centre, 15);
    const names = new Set([...Object.keys(tile.layers), ...Object.keys(decode(tiles.getTile(at15.z, at15.x, at15.y)).layers)]);
    for (const layer of getStyle('http://h', { attribution: 'x' }).layers) {
      if ('source-layer' in layer) expect(names).toContain(layer['source-layer']);
    }
  });
});
