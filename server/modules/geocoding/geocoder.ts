import { formatBatchRequest, parseBatchAnswer, type GeocodeOutcome, type GeocodeRequest } from './batch-protocol.js';

export type { GeocodeOutcome, GeocodeRequest } from './batch-protocol.js';

/** Turns addresses into coordinates. Outcomes come back by request id; unmatched and tied ones are never placed. */
export interface Geocoder {
  geocode(rows: readonly GeocodeRequest[], onProgress?: (done: number) => void): Promise<Map<string, GeocodeOutcome>>;
}

export class GeocoderUnavailableError extends Error {
  constructor(
    readonly url: string,
    reason: string,
  ) {
    super(`the geocoder at ${url} did not answer (${reason})`);
    this.name = 'GeocoderUnavailableError';
  }
}

export interface HttpBatchGeocoderOptions {
  url: string;
  /** Lines per request: the public batch services accept up to 10,000 per file. */
  batchSize?: number;
  timeoutMs?: number;
  /** Extra form fields some services require (e.g. which reference data set to match against). */
  formFields?: Record<string, string>;
}

/** Client for a street-range batch geocoder speaking the CSV batch protocol (see batch-protocol.ts). */
export function httpBatchGeocoder({ url, batchSize = 2_500, timeoutMs = 120_000, formFields = {} }: HttpBatchGeocoderOptions): Geocoder {
  async function post(batch: readonly GeocodeRequest[]): Promise<Map<string, GeocodeOutcome>> {
    let lastError = '';
    // One retry: a batch geocoder behind a load balancer drops the odd connection.
    for (let attempt = 0; attempt < 2; attempt++) {
      const form = new FormData();
      for (const [k, v] of Object.entries(formFields)) form.append(k, v);
      form.append('addressFile', new Blob([formatBatchRequest(batch)], { type: 'text/csv' }), 'addresses.csv');
      try {
        const res = await fetch(url, { method: 'POST', body: form, signal: AbortSignal.timeout(timeoutMs) });
        const text = await res.text();
        if (res.ok) return parseBatchAnswer(text);
        lastError = `HTTP ${res.status}`;
        if (res.status < 500) break;
      } catch (err) {
        lastError = err instanceof Error ? (err.cause instanceof Error ? err.cause.message : err.message) : String(err);
      }
    }
    throw new GeocoderUnavailableError(url, lastError);
  }

  return {
    async geocode(rows, onProgress) {
      const results = new Map<string, GeocodeOutcome>();
      for (let i = 0; i < rows.length; i += batchSize) {
        const batch = rows.slice(i, i + batchSize);
        const answers = await post(batch);
        // An id the service left out of its answer is unmatched, not placed.
        for (const r of batch) results.set(r.id, answers.get(r.id) ?? { kind: 'no_match' });
        onProgress?.(Math.min(rows.length, i + batch.length));
      }
      return results;
    },
  };
}
