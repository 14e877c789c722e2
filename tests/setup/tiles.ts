import { VectorTile } from '@mapbox/vector-tile';
import { PbfReader } from 'pbf';

/** Slippy-map tile containing a lon/lat (OpenStreetMap tile-naming convention). */
export function tileFor(lon: number, lat: number, z: number): { z: number; x: number; y: number } {
  const n = 2 ** z;
  const x = Math.floor(((lon + 180) / 360) * n);
  const latRad = (lat * Math.PI) / 180;
  const y = Math.floor(((1 - Math.log(Math.tan(latRad) + 1 / Math.cos(latRad)) / Math.PI) / 2) * n);
  return { z, x, y };
}

export function decodeTile(buf: ArrayBuffer | Uint8Array): VectorTile {
  return new VectorTile(new PbfReader(buf instanceof Uint8Array ? buf : new Uint8Array(buf)));
}
