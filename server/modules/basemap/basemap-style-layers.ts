import type { ExpressionSpecification, LayerSpecification } from '@maplibre/maplibre-gl-style-spec';

/**
 * The basemap's look: DESIGN.md's paper, ink and teal, drawn quietly so the homes layer the client
 * adds on top (source `homes`) carries the colour. Our own palette and layer set; it copies no
 * published map style.
 *
 * Layer ids are stable because the client and the browser tests refer to them. Both basemaps (the
 * demo town and a deployment's PMTiles archive) share the ids where the role is the same, so
 * client code can say "before street-labels" without knowing which basemap is running.
 * Community outlines and names are drawn by the client from the signed-in company's own
 * communities (always current, never another company's), so the style does not draw them:
 *
 *   background · landuse · water-fill · water-line · lots-fill · lots-outline · streets ·
 *   street-labels                                                   (demo town)
 *   background · landuse · water-fill · water-line · streets · street-labels · place-labels
 *                                                                     (PMTiles archive)
 *
 * Every layer reads the one vector source `base`.
 */
export const BASE_SOURCE = 'base';

export const COLOURS = {
  paper: '#F7F4EE',
  panel: '#FFFFFF',
  rule: '#DDD6CA',
  ink: '#1E2630',
  mutedInk: '#5B6573',
  accent: '#0F6E74',
  // Tints mixed towards the paper so they sit behind the Okabe–Ito home symbols without competing.
  park: '#DCE4D1',
  field: '#E9E6D8',
  otherLanduse: '#EFEBE3',
  water: '#CBDCE2',
  waterLine: '#9FBCC8',
  streetArterial: '#7C848E',
  streetCollector: '#99A0A8',
  streetLocal: '#B3B8BE',
} as const;

export const REGULAR_FONT = 'IBM Plex Sans Regular';
export const SEMIBOLD_FONT = 'IBM Plex Sans SemiBold';

/** Names of the layers inside the demo town's vector tiles (the `source-layer`s). */
export const DEMO_TILE_LAYERS = ['streets', 'lots', 'landuse', 'communities', 'community_labels'] as const;
export type DemoTileLayer = (typeof DEMO_TILE_LAYERS)[number];

/** Lots are only put into tiles from this zoom: below it they are sub-pixel clutter and most of a tile's bytes. */
export const LOTS_MIN_ZOOM = 15;

const labelPaint = {
  'text-color': COLOURS.mutedInk,
  'text-halo-color': COLOURS.paper,
  'text-halo-width': 1.5,
  'text-halo-blur': 0.5,
} as const;

/**
 * Street width in px by zoom; `widths` gives [z10, z13, z15, z16, z18] per street class. An
 * exponential curve keeps the on-screen width roughly proportional to the real width as the map
 * zooms (the style spec requires the zoom interpolation at the top of the expression, so the
 * class match sits inside each stop).
 */
function streetWidth(classProp: string, widths: Record<string, readonly number[]>, fallback: readonly number[]): ExpressionSpecification {
  const zooms = [10, 13, 15, 16, 18];
  const stops = zooms.flatMap((z, i) => [
    z,
    ['match', ['get', classProp], ...Object.entries(widths).flatMap(([cls, w]) => [cls, w[i]]), fallback[i]],
  ]);
  return ['interpolate', ['exponential', 1.6], ['zoom'], ...stops] as unknown as ExpressionSpecification;
}

function streetColour(classProp: string, colours: Record<string, string>, fallback: string): ExpressionSpecification {
  return ['match', ['get', classProp], ...Object.entries(colours).flatMap(([cls, c]) => [cls, c]), fallback] as unknown as ExpressionSpecification;
}

// Clipping a shape to a tile can make it multi-part; the style spec (expressions › geometry-type)
// reports those as the simple type, but some renderer releases said 'Multi…'. Matching both keeps
// the filter right either way.
const isPolygon: ExpressionSpecification = ['in', ['geometry-type'], ['literal', ['Polygon', 'MultiPolygon']]];
const isLine: ExpressionSpecification = ['in', ['geometry-type'], ['literal', ['LineString', 'MultiLineString']]];

const background: LayerSpecification = { id: 'background', type: 'background', paint: { 'background-color': COLOURS.paper } };

// ---------------------------------------------------------------------------------------------
// Demo town: tiles built by basemap.service.ts from data/demo/*.geojson
// ---------------------------------------------------------------------------------------------

export const DEMO_LAYERS: LayerSpecification[] = [
  background,
  {
    id: 'landuse',
    type: 'fill',
    source: BASE_SOURCE,
    'source-layer': 'landuse',
    filter: ['all', isPolygon, ['!=', ['get', 'kind'], 'water']],
    paint: { 'fill-color': ['match', ['get', 'kind'], 'park', COLOURS.park, 'school', COLOURS.field, COLOURS.otherLanduse] },
  },
  {
    id: 'water-fill',
    type: 'fill',
    source: BASE_SOURCE,
    'source-layer': 'landuse',
    filter: ['all', isPolygon, ['==', ['get', 'kind'], 'water']],
    paint: { 'fill-color': COLOURS.water },
  },
  {
    // Creeks come as lines with kind 'water'.
    id: 'water-line',
    type: 'line',
    source: BASE_SOURCE,
    'source-layer': 'landuse',
    filter: ['all', isLine, ['==', ['get', 'kind'], 'water']],
    layout: { 'line-cap': 'round', 'line-join': 'round' },
    paint: { 'line-color': COLOURS.waterLine, 'line-width': ['interpolate', ['linear'], ['zoom'], 12, 0.8, 16, 2.5, 18, 4] },
  },
  {
    id: 'lots-fill',
    type: 'fill',
    source: BASE_SOURCE,
    'source-layer': 'lots',
    minzoom: LOTS_MIN_ZOOM,
    paint: { 'fill-color': COLOURS.panel, 'fill-opacity': ['interpolate', ['linear'], ['zoom'], LOTS_MIN_ZOOM, 0, 16, 0.5] },
  },
  {
    id: 'lots-outline',
    type: 'line',
    source: BASE_SOURCE,
    'source-layer': 'lots',
    minzoom: LOTS_MIN_ZOOM,
    paint: {
      'line-color': COLOURS.rule,
      'line-width': ['interpolate', ['linear'], ['zoom'], LOTS_MIN_ZOOM, 0.4, 18, 1.2],
      'line-opacity': ['interpolate', ['linear'], ['zoom'], LOTS_MIN_ZOOM, 0, 15.5, 1],
    },
  },
  {
    id: 'streets',
    type: 'line',
    source: BASE_SOURCE,
    'source-layer': 'streets',
    layout: {
      'line-cap': 'round',
      'line-join': 'round',
      // Arterials drawn last, so a junction shows the through street on top.
      'line-sort-key': ['match', ['get', 'class'], 'arterial', 3, 'collector', 2, 1],
    },
    paint: {
      'line-color': streetColour('class', { arterial: COLOURS.streetArterial, collector: COLOURS.streetCollector }, COLOURS.streetLocal),
      'line-width': streetWidth('class', { arterial: [0.9, 2, 4.5, 6.5, 15], collector: [0.6, 1.4, 3.4, 5, 12] }, [0.3, 0.8, 2.2, 3.4, 8.5]),
    },
  },
  {
    id: 'street-labels',
    type: 'symbol',
    source: BASE_SOURCE,
    'source-layer': 'streets',
    minzoom: 13,
    // Through streets are named from z13, the rest from z14 (zoom in a filter is evaluated per integer zoom).
    filter: ['any', ['!=', ['get', 'class'], 'local'], ['>=', ['zoom'], 14]],
    layout: {
      'symbol-placement': 'line',
      'symbol-spacing': 280,
      'text-field': ['get', 'name'],
      'text-font': [REGULAR_FONT],
      'text-size': ['interpolate', ['linear'], ['zoom'], 13, 10, 16, 12.5, 18, 14],
      'text-letter-spacing': 0.02,
      'text-max-angle': 30,
      'text-padding': 2,
    },
    paint: labelPaint,
  },
];

// ---------------------------------------------------------------------------------------------
// A deployment's PMTiles archive
// ---------------------------------------------------------------------------------------------

/**
 * Assumes the archive follows the Protomaps basemap schema, version 4
 * (https://docs.protomaps.com/basemaps/layers): layers `earth`, `water`, `landuse`, `roads` and
 * `places`, each with a `kind`. That is what the Protomaps planet build and `pmtiles extract` of it
 * produce; an archive in another schema (an OpenMapTiles-style `transportation` layer, say) draws
 * only the paper background and needs its own layer set here.
 *
 * `earth` (land) is not drawn: the background is already paper, and paper outside the archive's
 * clipped region reads as "no map here" rather than as sea.
 */
const PARK_KINDS = ['park', 'garden', 'grass', 'forest', 'wood', 'nature_reserve', 'protected_area', 'national_park', 'cemetery', 'golf_course', 'recreation_ground', 'playground', 'dog_park'];
const FIELD_KINDS = ['school', 'college', 'university', 'kindergarten', 'pitch', 'stadium', 'farmland', 'orchard'];
const ROAD_KINDS = ['highway', 'major_road', 'medium_road', 'minor_road', 'other', 'path'];

export const PMTILES_LAYERS: LayerSpecification[] = [
  background,
  {
    id: 'landuse',
    type: 'fill',
    source: BASE_SOURCE,
    'source-layer': 'landuse',
    filter: ['in', ['get', 'kind'], ['literal', [...PARK_KINDS, ...FIELD_KINDS]]],
    paint: { 'fill-color': ['case', ['in', ['get', 'kind'], ['literal', PARK_KINDS]], COLOURS.park, COLOURS.field] },
  },
  {
    id: 'water-fill',
    type: 'fill',
    source: BASE_SOURCE,
    'source-layer': 'water',
    filter: isPolygon,
    paint: { 'fill-color': COLOURS.water },
  },
  {
    id: 'water-line',
    type: 'line',
    source: BASE_SOURCE,
    'source-layer': 'water',
    filter: isLine,
    layout: { 'line-cap': 'round', 'line-join': 'round' },
    paint: { 'line-color': COLOURS.waterLine, 'line-width': ['interpolate', ['linear'], ['zoom'], 12, 0.8, 16, 2.5, 18, 4] },
  },
  {
    id: 'streets',
    type: 'line',
    source: BASE_SOURCE,
    'source-layer': 'roads',
    filter: ['in', ['get', 'kind'], ['literal', ROAD_KINDS]],
    layout: {
      'line-cap': 'round',
      'line-join': 'round',
      'line-sort-key': ['match', ['get', 'kind'], 'highway', 5, 'major_road', 4, 'medium_road', 3, 'minor_road', 2, 1],
    },
    paint: {
      'line-color': streetColour(
        'kind',
        { highway: COLOURS.streetArterial, major_road: COLOURS.streetArterial, medium_road: COLOURS.streetCollector },
        COLOURS.streetLocal,
      ),
      'line-width': streetWidth(
        'kind',
        {
          highway: [1.2, 2.6, 5.5, 8, 18],
          major_road: [0.9, 2, 4.5, 6.5, 15],
          medium_road: [0.6, 1.4, 3.4, 5, 12],
          minor_road: [0.3, 0.8, 2.2, 3.4, 8.5],
        },
        [0.2, 0.4, 1, 1.5, 3],
      ),
    },
  },
  {
    id: 'street-labels',
    type: 'symbol',
    source: BASE_SOURCE,
    'source-layer': 'roads',
    minzoom: 13,
    filter: ['in', ['get', 'kind'], ['literal', ['highway', 'major_road', 'medium_road', 'minor_road']]],
    layout: {
      'symbol-placement': 'line',
      'symbol-spacing': 280,
      'text-field': ['get', 'name'],
      'text-font': [REGULAR_FONT],
      'text-size': ['interpolate', ['linear'], ['zoom'], 13, 10, 16, 12.5, 18, 14],
      'text-letter-spacing': 0.02,
      'text-max-angle': 30,
      'text-padding': 2,
    },
    paint: labelPaint,
  },
  {
    id: 'place-labels',
    type: 'symbol',
    source: BASE_SOURCE,
    'source-layer': 'places',
    filter: ['in', ['get', 'kind'], ['literal', ['locality', 'macrohood', 'neighbourhood']]],
    layout: {
      'text-field': ['get', 'name'],
      'text-font': [SEMIBOLD_FONT],
      'text-size': ['interpolate', ['linear'], ['zoom'], 10, 11, 14, 13, 17, 15],
      'text-letter-spacing': 0.04,
      'text-max-width': 8,
    },
    paint: { ...labelPaint, 'text-color': COLOURS.ink },
  },
];
