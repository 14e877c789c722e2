import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as turf from '@turf/turf';
import { startFakeGeocoder, type FakeGeocoder } from '../../fakes/geocoder.js';
import { httpBatchGeocoder, GeocoderUnavailableError } from './geocoder.js';
import { formatBatchAnswer, parseBatchAnswer } from './batch-protocol.js';

let fake: FakeGeocoder;
beforeAll(async () => {
  fake = await startFakeGeocoder(0);
});
afterAll(() => fake.close());

const scenario = JSON.parse(fs.readFileSync(new URL('../../../data/demo/scenario.json', import.meta.url), 'utf8')) as {
  homes: { key: string; number: string; street: string; city: string; state: string; zip: string; lon: number; lat: number }[];
};

describe('the fake street-range geocoder', () => {
  it('places every demo home where the demo town put it (range interpolation, 15 m to its side)', async () => {
    // data/README.md "Geocoding contract": each demo home stands where interpolating its number along its
    // block puts it, 15 m off the centreline to its side. Distances measured with turf (independent of the fake).
    const geocoder = httpBatchGeocoder({ url: fake.url, batchSize: 1000 });
    const homes = scenario.homes;
    const results = await geocoder.geocode(homes.map((h) => ({ id: h.key, street: `${h.number} ${h.street}`, city: h.city, state: h.state, zip: h.zip })));
    let worst = 0;
    for (const h of homes) {
      const r = results.get(h.key)!;
      expect(r.kind, `${h.number} ${h.street}`).toBe('match');
      if (r.kind !== 'match') continue;
      expect(r.exact).toBe(true);
      const miss = turf.distance([h.lon, h.lat], [r.lon, r.lat], { units: 'meters' });
      worst = Math.max(worst, miss);
    }
    // Coordinates are rounded to 6 decimals (≈ 0.1 m); the generator lays out on the same sphere.
    expect(worst).toBeLessThan(2);
    expect(fake.linesAnswered()).toBeGreaterThanOrEqual(homes.length);
  });

  it('puts odd numbers on the left and even numbers on the right of the line direction', async () => {
    // Sorrel Rd runs west → east (data/demo/streets.geojson): left = north, right = south.
    const geocoder = httpBatchGeocoder({ url: fake.url });
    const r = await geocoder.geocode([
      { id: 'odd', street: '1181 Sorrel Rd', city: 'Tarrowby', state: 'ZZ', zip: '00090' },
      { id: 'even', street: '1180 Sorrel Rd', city: 'Tarrowby', state: 'ZZ', zip: '00090' },
    ]);
    const odd = r.get('odd')!;
    const even = r.get('even')!;
    if (odd.kind !== 'match' || even.kind !== 'match') throw new Error('expected matches');
    expect(odd.lat).toBeGreaterThan(41.165611);
    expect(even.lat).toBeLessThan(41.165611);
    expect(turf.distance([odd.lon, odd.lat], [even.lon, even.lat], { units: 'meters' })).toBeCloseTo(30, 0);
  });

  it('answers no match for unknown streets and numbers outside every range, and a tie when two streets fit', async () => {
    const geocoder = httpBatchGeocoder({ url: fake.url });
    const r = await geocoder.geocode([
      { id: '1', street: '12 Nowhere Ln', city: 'Tarrowby', state: 'ZZ', zip: '00090' },
      { id: '2', street: '999999 Sorrel Rd', city: 'Tarrowby', state: 'ZZ', zip: '00090' },
      { id: '3', street: '1181 Sorrel', city: 'Tarrowby', state: 'ZZ', zip: '00090' },
      { id: '4', street: `${tieNumber()} Tamarack`, city: 'Tarrowby', state: 'ZZ', zip: '00090' },
      { id: '5', street: 'no number', city: 'Tarrowby', state: 'ZZ', zip: '00090' },
    ]);
    expect(r.get('1')).toEqual({ kind: 'no_match' });
    expect(r.get('2')).toEqual({ kind: 'no_match' });
    expect(r.get('3')).toMatchObject({ kind: 'match', exact: false, matchedAddress: '1181 SORREL RD, TARROWBY, ZZ, 00090' });
    expect(r.get('4')).toEqual({ kind: 'tie' });
    expect(r.get('5')).toEqual({ kind: 'no_match' });
  });

  it('reports an unreachable service instead of placing anything', async () => {
    const geocoder = httpBatchGeocoder({ url: 'http://127.0.0.1:9/geocode', timeoutMs: 2000 });
    await expect(geocoder.geocode([{ id: '1', street: '1 A St', city: 'X', state: 'ZZ', zip: '00090' }])).rejects.toBeInstanceOf(GeocoderUnavailableError);
  });
});

describe('the batch answer format', () => {
  it('round-trips matches, ties and no-matches and refuses unreadable coordinates', () => {
    const text = formatBatchAnswer([
      { id: 'a', input: '1 A St, X, ZZ, 00090', outcome: { kind: 'match', exact: true, matchedAddress: '1 A ST, X, ZZ, 00090', lon: -96.62, lat: 41.18 }, lineId: 's-1', side: 'L' },
      { id: 'b', input: 'b', outcome: { kind: 'tie' } },
      { id: 'c', input: 'c', outcome: { kind: 'no_match' } },
    ]);
    expect(text.split('\n')[0]).toBe('"a","1 A St, X, ZZ, 00090","Match","Exact","1 A ST, X, ZZ, 00090","-96.620000,41.180000","s-1","L"');
    const back = parseBatchAnswer(text + '\n"d","d","Match","Exact","D","abc,def"');
    expect(back.get('a')).toEqual({ kind: 'match', exact: true, matchedAddress: '1 A ST, X, ZZ, 00090', lon: -96.62, lat: 41.18 });
    expect(back.get('b')).toEqual({ kind: 'tie' });
    expect(back.get('c')).toEqual({ kind: 'no_match' });
    expect(back.get('d')).toEqual({ kind: 'no_match' });
  });
});

/** A number inside a range of both Tamarack Bend Dr and Tamarack Ridge Dr (read from the street file). */
function tieNumber(): number {
  const streets = JSON.parse(fs.readFileSync(new URL('../../../data/demo/streets.geojson', import.meta.url), 'utf8')) as {
    features: { properties: { name: string; leftFrom: number; leftTo: number; rightFrom: number; rightTo: number } }[];
  };
  const ranges = (name: string) =>
    streets.features
      .filter((f) => f.properties.name === name)
      .flatMap((f) => [
        [f.properties.leftFrom, f.properties.leftTo],
        [f.properties.rightFrom, f.properties.rightTo],
      ]);
  const bend = ranges('Tamarack Bend Dr');
  const ridge = ranges('Tamarack Ridge Dr');
  for (const [a, b] of bend) {
    for (let n = Math.min(a, b); n <= Math.max(a, b); n += 2) {
      if (ridge.some(([c, d]) => n >= Math.min(c, d) && n <= Math.max(c, d) && (n - c) % 2 === 0)) return n;
    }
  }
  throw new Error('no shared number');
}
