import { writeFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import path from 'node:path';
import express from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { VectorTile } from '@mapbox/vector-tile';
import { PbfReader } from 'pbf';
import { errorHandler } from '../../middleware/error-handler.js';
import { FIXTURE_CENTRE, tileAt, writeFixtureTown } from './basemap-fixture.js';
import { basemapRouter, type BasemapRouterOptions } from './basemap.router.js';

const servers: Server[] = [];

/** The router alone on an ephemeral port, with the app's error middleware; no session, no sign-in. */
async function start(options: BasemapRouterOptions): Promise<string> {
  const app = express();
  app.use(basemapRouter(options));
  app.use(errorHandler);
  const server = app.listen(0, '127.0.0.1');
  await new Promise<void>((resolve) => server.once('listening', resolve));
  servers.push(server);
  return `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
}

let demo: string;
let withArchive: string;
const archiveBytes = Buffer.from(Array.from({ length: 1000 }, (_, i) => (i * 7) % 256));

beforeAll(async () => {
  const dataDir = writeFixtureTown();
  const archive = path.join(dataDir, 'region.pmtiles');
  // Not a real archive: the byte pattern only lets the test check which bytes came back.
  writeFileSync(archive, archiveBytes);
  demo = await start({ attribution: 'Demo town: invented data', dataDir });
  withArchive = await start({ attribution: '© OpenStreetMap contributors', dataDir, pmtilesPath: archive });
});
afterAll(async () => {
  await Promise.all(servers.map((s) => new Promise((resolve) => s.close(resolve))));
});

describe('GET /map/style.json', () => {
  it('points every URL at the origin the request came to', async () => {
    const res = await fetch(`${demo}/map/style.json`);
    expect(res.status).toBe(200);
    const style = await res.json();
    expect(style.sources.base.tiles).toEqual([`${demo}/tiles/base/{z}/{x}/{y}.pbf`]);
    expect(style.glyphs).toBe(`${demo}/glyphs/{fontstack}/{range}.pbf`);
    expect(style.sources.base.attribution).toBe('Demo town: invented data');
  });

  it('draws the configured PMTiles archive instead of the demo town', async () => {
    const style = await (await fetch(`${withArchive}/map/style.json`)).json();
    expect(style.sources.base).toEqual({ type: 'vector', url: `pmtiles://${withArchive}/map/basemap.pmtiles`, attribution: '© OpenStreetMap contributors' });
  });
});

describe('GET /tiles/base/:z/:x/:y.pbf', () => {
  it('serves a vector tile of the town as public, cacheable protobuf', async () => {
    const { z, x, y } = tileAt(FIXTURE_CENTRE, 14);
    const res = await fetch(`${demo}/tiles/base/${z}/${x}/${y}.pbf`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/x-protobuf');
    expect(res.headers.get('cache-control')).toBe('public, max-age=3600');
    const tile = new VectorTile(new PbfReader(new Uint8Array(await res.arrayBuffer())));
    expect(tile.layers.streets.length).toBeGreaterThan(0);
  });

  it('answers 200 with an empty tile where there is no town', async () => {
    const res = await fetch(`${demo}/tiles/base/14/0/0.pbf`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/x-protobuf');
    expect((await res.arrayBuffer()).byteLength).toBe(0);
  });

  it.each([
    ['23/0/0', 'z'],
    ['-1/0/0', 'z'],
    ['1.5/0/0', 'z'],
    ['abc/0/0', 'z'],
    ['2/4/0', 'x'],
    ['2/0/4', 'y'],
    ['0/1/0', 'x'],
  ])('rejects %s with a 400 naming %s', async (zxy, field) => {
    const res = await fetch(`${demo}/tiles/base/${zxy}.pbf`);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe('VALIDATION_FAILED');
    expect(typeof body.error.message).toBe('string');
    expect(body.error.fields).toEqual(expect.arrayContaining([{ field, message: expect.any(String) }]));
  });
});

describe('GET /glyphs/:fontstack/:range.pbf', () => {
  it('serves a glyph block for a font stack, using the first font it ships', async () => {
    const res = await fetch(`${demo}/glyphs/${encodeURIComponent('Noto Sans Bold,IBM Plex Sans SemiBold')}/0-255.pbf`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/x-protobuf');
    expect((await res.arrayBuffer()).byteLength).toBeGreaterThan(1000);
  });

  it('rejects a range that is not a 256-code-point block', async () => {
    const res = await fetch(`${demo}/glyphs/IBM%20Plex%20Sans%20Regular/0-300.pbf`);
    expect(res.status).toBe(400);
    expect((await res.json()).error).toMatchObject({ code: 'VALIDATION_FAILED', fields: [{ field: 'range' }] });
  });
});

describe('GET /map/basemap.pmtiles', () => {
  it('answers a Range request with 206 and exactly those bytes (RFC 9110 §14.2, §15.3.7)', async () => {
    const res = await fetch(`${withArchive}/map/basemap.pmtiles`, { headers: { Range: 'bytes=100-199' } });
    expect(res.status).toBe(206);
    expect(res.headers.get('content-range')).toBe('bytes 100-199/1000');
    expect(Buffer.from(await res.arrayBuffer())).toEqual(archiveBytes.subarray(100, 200));
  });

  it('answers a range past the end with 416 and the real size', async () => {
    const res = await fetch(`${withArchive}/map/basemap.pmtiles`, { headers: { Range: 'bytes=5000-5100' } });
    expect(res.status).toBe(416);
    expect(res.headers.get('content-range')).toBe('bytes */1000');
  });

  it('serves the whole archive without a Range header', async () => {
    const res = await fetch(`${withArchive}/map/basemap.pmtiles`);
    expect(res.status).toBe(200);
    expect(res.headers.get('accept-ranges')).toBe('bytes');
    expect(Buffer.from(await res.arrayBuffer())).toEqual(archiveBytes);
  });

  it('is not served when no archive is configured', async () => {
    expect((await fetch(`${demo}/map/basemap.pmtiles`)).status).toBe(404);
  });
});
