// A local street-range geocoder for development and tests, speaking the CSV batch protocol of the
// public services (server/modules/geocoding/batch-protocol.ts). It knows only the demo town's streets
// (data/demo/streets.geojson) and places a house number the way range geocoders do: interpolated
// along its block by the side's address range (odd = left, even = right of the line's direction),
// then set off the centreline to that side. It never calls anything else.
//
//   GEOCODER_FAKE_PORT=3101 node --import tsx server/fakes/geocoder.ts
//   POST http://127.0.0.1:3101/geocode   multipart: addressFile = "id,street,city,state,zip" lines
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { normaliseStreet, parseStreetLine } from '../../shared/domain/address.js';
import { formatBatchAnswer, parseBatchRequest, type AnswerLine, type GeocodeRequest } from '../modules/geocoding/batch-protocol.js';

const HOST = '127.0.0.1';
/** Metres from the centreline, as data/generate.ts places demo homes (HOME_OFFSET_M). */
const SIDE_OFFSET_M = 15;
const MAX_BODY_BYTES = 64 * 1024 * 1024;
// Same sphere as turf and the demo generator.
const R_EARTH_M = 6371008.8;
const M_PER_DEG_LAT = (R_EARTH_M * Math.PI) / 180;

interface StreetSegment {
  id: string;
  name: string;
  key: string;
  zip: string;
  city: string;
  leftFrom: number;
  leftTo: number;
  rightFrom: number;
  rightTo: number;
  coordinates: [number, number][];
}

type StreetFeatures = {
  features: { properties: Omit<StreetSegment, 'key' | 'coordinates'>; geometry: { coordinates: [number, number][] } }[];
};

function loadSegments(file: URL | string): StreetSegment[] {
  const geojson = JSON.parse(fs.readFileSync(file, 'utf8')) as StreetFeatures;
  return geojson.features.map((f) => ({ ...f.properties, key: normaliseStreet(f.properties.name), coordinates: f.geometry.coordinates }));
}

/** The street's words without its suffix ("TAMARACK BEND DR" → "TAMARACK BEND"). */
const baseOf = (key: string) => key.split(' ').slice(0, -1).join(' ') || key;

/** Position `number` takes on `seg`, or null when the number is not in the range of its side. */
export function interpolate(seg: StreetSegment, number: number): { lon: number; lat: number; side: 'L' | 'R' } | null {
  const odd = number % 2 === 1;
  const [from, to] = odd ? [seg.leftFrom, seg.leftTo] : [seg.rightFrom, seg.rightTo];
  if (number < Math.min(from, to) || number > Math.max(from, to)) return null;
  const t = to === from ? 0 : (number - from) / (to - from);
  // Local metres around the segment's first vertex (an equirectangular plane, as the generator lays out).
  const [lon0, lat0] = seg.coordinates[0];
  const mPerDegLon = M_PER_DEG_LAT * Math.cos((lat0 * Math.PI) / 180);
  const pts = seg.coordinates.map(([lon, lat]) => [(lon - lon0) * mPerDegLon, (lat - lat0) * M_PER_DEG_LAT] as const);
  const cum = [0];
  for (let i = 1; i < pts.length; i++) cum.push(cum[i - 1] + Math.hypot(pts[i][0] - pts[i - 1][0], pts[i][1] - pts[i - 1][1]));
  const s = t * cum[cum.length - 1];
  let i = 1;
  while (i < pts.length - 1 && cum[i] < s) i++;
  const a = pts[i - 1];
  const b = pts[i];
  const len = cum[i] - cum[i - 1] || 1;
  const u = Math.min(1, Math.max(0, (s - cum[i - 1]) / len));
  const dir = [(b[0] - a[0]) / len, (b[1] - a[1]) / len];
  const sideSign = odd ? 1 : -1; // +1 = left of the direction of travel
  const x = a[0] + (b[0] - a[0]) * u - dir[1] * SIDE_OFFSET_M * sideSign;
  const y = a[1] + (b[1] - a[1]) * u + dir[0] * SIDE_OFFSET_M * sideSign;
  return { lon: lon0 + x / mPerDegLon, lat: lat0 + y / M_PER_DEG_LAT, side: odd ? 'L' : 'R' };
}

/** Geocodes one request line against the segments. */
export function createMatcher(segments: StreetSegment[]) {
  const byKey = new Map<string, StreetSegment[]>();
  for (const s of segments) byKey.set(s.key, [...(byKey.get(s.key) ?? []), s]);

  return function match(req: GeocodeRequest): AnswerLine {
    const input = [req.street, req.city, req.state, req.zip].join(', ');
    const none: AnswerLine = { id: req.id, input, outcome: { kind: 'no_match' } };
    const line = parseStreetLine(req.street);
    const number = line ? Number.parseInt(line.number, 10) : NaN;
    if (!line || !Number.isFinite(number)) return none;
    const key = normaliseStreet(line.street);
    const zip = req.zip.slice(0, 5);

    const hitsOn = (segs: StreetSegment[]) =>
      segs.flatMap((seg) => {
        const at = interpolate(seg, number);
        return at ? [{ seg, at }] : [];
      });
    let exact = true;
    let hits = hitsOn(byKey.get(key) ?? []);
    if (hits.length === 0) {
      // Like the public services, accept a street written without (or with another) suffix, if only one street fits.
      exact = false;
      const base = baseOf(key);
      const candidates = [...byKey.entries()].filter(([k]) => k !== key && (baseOf(k) === base || baseOf(k).startsWith(`${key} `) || baseOf(k) === key));
      hits = candidates.flatMap(([, segs]) => hitsOn(segs));
    }
    const streets = new Set(hits.map((h) => h.seg.key));
    if (streets.size === 0) return none;
    if (streets.size > 1) return { id: req.id, input, outcome: { kind: 'tie' } };
    const { seg, at } = hits.find((h) => h.seg.zip === zip) ?? hits[0];
    if (seg.zip !== zip || seg.city.toUpperCase() !== req.city.trim().toUpperCase()) exact = false;
    return {
      id: req.id,
      input,
      lineId: seg.id,
      side: at.side,
      outcome: {
        kind: 'match',
        exact,
        matchedAddress: `${line.number} ${seg.name}, ${seg.city}, ${req.state}, ${seg.zip}`.toUpperCase(),
        lon: at.lon,
        lat: at.lat,
      },
    };
  };
}

export interface FakeGeocoder {
  port: number;
  /** The batch endpoint to give the app as GEOCODER_URL. */
  url: string;
  /** Address lines answered so far. */
  linesAnswered(): number;
  close(): Promise<void>;
}

/** Starts the fake on loopback (port 0 picks a free port). */
export async function startFakeGeocoder(port: number, streetsFile: URL | string = new URL('../../data/demo/streets.geojson', import.meta.url)): Promise<FakeGeocoder> {
  const match = createMatcher(loadSegments(streetsFile));
  let answered = 0;

  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', `http://${HOST}`);
    if (req.method === 'GET' && url.pathname === '/health') {
      res.end('ok');
      return;
    }
    if (req.method !== 'POST') {
      res.statusCode = 405;
      res.end('POST a multipart form with addressFile');
      return;
    }
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (c: Buffer) => {
      size += c.length;
      if (size > MAX_BODY_BYTES) {
        res.statusCode = 413;
        res.end('too large');
        req.destroy();
        return;
      }
      chunks.push(c);
    });
    req.on('end', () => {
      if (res.writableEnded) return;
      // undici's multipart parser (Node's own fetch) reads the form.
      new Response(Buffer.concat(chunks), { headers: { 'content-type': req.headers['content-type'] ?? '' } })
        .formData()
        .then(async (form) => {
          const file = form.get('addressFile');
          if (!file || typeof file === 'string') {
            res.statusCode = 400;
            res.end('addressFile is missing');
            return;
          }
          const lines = parseBatchRequest(await file.text()).map(match);
          answered += lines.length;
          res.setHeader('Content-Type', 'text/csv; charset=utf-8');
          res.end(formatBatchAnswer(lines));
        })
        .catch(() => {
          res.statusCode = 400;
          res.end('not a multipart form');
        });
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, HOST, () => resolve());
  });
  const actual = (server.address() as AddressInfo).port;
  return {
    port: actual,
    url: `http://${HOST}:${actual}/geocode`,
    linesAnswered: () => answered,
    close: async () => {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
    },
  };
}

// Standalone: the start and test scripts run this file as its own process.
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const fake = await startFakeGeocoder(Number(process.env.GEOCODER_FAKE_PORT ?? 3101));
  process.stdout.write(`Geocoder fake (demo town streets) on ${fake.url}\n`);
  const stop = () => void fake.close().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
