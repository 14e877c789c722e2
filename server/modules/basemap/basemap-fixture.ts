/**
 * Test-only: a tiny invented town written in the same shape as data/demo/*.geojson, so the basemap
 * tests do not depend on the demo generator's current output.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Feature, FeatureCollection, Position } from 'geojson';

export const FIXTURE_CENTRE: Position = [-96.62, 41.18];

const [cx, cy] = FIXTURE_CENTRE;
const square = (x: number, y: number, half: number): Position[][] => [
  [
    [x - half, y - half],
    [x + half, y - half],
    [x + half, y + half],
    [x - half, y + half],
    [x - half, y - half],
  ],
];
const collection = (features: Feature[]): FeatureCollection => ({ type: 'FeatureCollection', features });
const street = (id: string, name: string, cls: string, coordinates: Position[]): Feature => ({
  type: 'Feature',
  properties: { id, name, class: cls, leftFrom: 101, leftTo: 199, rightFrom: 100, rightTo: 198, zip: '00090', city: 'Fixtureville' },
  geometry: { type: 'LineString', coordinates },
});

/** Writes the fixture town into a fresh temporary directory and returns it. */
export function writeFixtureTown(): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'basemap-fixture-'));
  const files: Record<string, FeatureCollection> = {
    'streets.geojson': collection([
      // One street in two block segments, as the address-range file splits streets at junctions.
      street('fixture-ave-1', 'Fixture Ave', 'arterial', [[cx - 0.006, cy], [cx, cy]]),
      street('fixture-ave-2', 'Fixture Ave', 'arterial', [[cx, cy], [cx + 0.006, cy]]),
      street('sample-rd-1', 'Sample Rd', 'collector', [[cx, cy - 0.004], [cx, cy + 0.004]]),
      street('trial-ct-1', 'Trial Ct', 'local', [[cx + 0.002, cy], [cx + 0.002, cy + 0.002]]),
    ]),
    'lots.geojson': collection([
      { type: 'Feature', properties: { homeKey: 'h-0001' }, geometry: { type: 'Polygon', coordinates: square(cx + 0.0025, cy + 0.001, 0.0002) } },
      { type: 'Feature', properties: { homeKey: 'h-0002' }, geometry: { type: 'Polygon', coordinates: square(cx + 0.0015, cy + 0.001, 0.0002) } },
    ]),
    'landuse.geojson': collection([
      { type: 'Feature', properties: { kind: 'park', name: 'Proof Park' }, geometry: { type: 'Polygon', coordinates: square(cx - 0.003, cy + 0.002, 0.001) } },
      { type: 'Feature', properties: { kind: 'water', name: 'Proof Pond' }, geometry: { type: 'Polygon', coordinates: square(cx - 0.003, cy - 0.002, 0.0007) } },
      { type: 'Feature', properties: { kind: 'water', name: 'Proof Creek' }, geometry: { type: 'LineString', coordinates: [[cx - 0.005, cy - 0.003], [cx + 0.005, cy - 0.0035]] } },
    ]),
    'communities.geojson': collection([
      {
        type: 'Feature',
        properties: { key: 'fixture-meadows', companyKey: 'c-1', name: 'Fixture Meadows', builderKeys: ['b-1'], yearFrom: 1999, yearTo: 2004 },
        geometry: { type: 'Polygon', coordinates: square(cx + 0.002, cy + 0.001, 0.0015) },
      },
    ]),
  };
  for (const [file, fc] of Object.entries(files)) writeFileSync(path.join(dir, file), JSON.stringify(fc));
  return dir;
}

/** The tile holding lon/lat at zoom z (OpenStreetMap wiki, "Slippy map tilenames", Web Mercator). */
export function tileAt([lon, lat]: Position, z: number): { z: number; x: number; y: number } {
  const n = 2 ** z;
  const rad = (lat * Math.PI) / 180;
  return {
    z,
    x: Math.floor(((lon + 180) / 360) * n),
    y: Math.floor(((1 - Math.log(Math.tan(rad) + 1 / Math.cos(rad)) / Math.PI) / 2) * n),
  };
}
