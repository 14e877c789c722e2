import { LRUCache } from 'lru-cache';
import type { Db } from '../../db/client.js';
import { HOMES_DETAIL_MIN_ZOOM, HOMES_MAX_TILE_ZOOM, HOMES_MIN_ZOOM, type MapFilter } from '../../../shared/schemas/map.js';
import * as repo from './home-tiles.repository.js';

/**
 * Homes tiles, cached in memory per company, filter and tile. The key includes the tile's own version
 * and the company's homes version, both bumped by database triggers (see repo.tileVersions), so a tile
 * is never served stale: the next request after a visit, an import or an edit builds the tiles that
 * draw the changed homes anew, and the rest of the map stays cached.
 */
/** Where a tile came from: the server's cache, the tiles the database stores (home_tiles), built now, or none (below the homes zooms: an empty tile). */
export type TileSource = 'cached' | 'stored' | 'built' | 'none';

export function createHomeTiles(db: Db, options: { maxBytes?: number } = {}) {
  const cache = new LRUCache<string, Buffer>({
    maxSize: options.maxBytes ?? 64 * 1024 * 1024,
    sizeCalculation: (tile) => Math.max(1, tile.length),
  });
  // Tiles being built: a map opened in several tabs, or by several people, asks for the same tiles at
  // once; they wait on one build.
  const building = new Map<string, Promise<{ data: Buffer; stored: boolean }>>();
  let hits = 0;
  let misses = 0;

  /**
   * The tile; where it came from (this cache, the tiles the database stores, built now, or none below
   * the homes zooms); and how long reading or building it took (null from the cache and for none).
   */
  async function tile(companyId: string, z: number, x: number, y: number, filter: MapFilter): Promise<{ data: Buffer; source: TileSource; ms: number | null }> {
    if (z < HOMES_MIN_ZOOM) return { data: Buffer.alloc(0), source: 'none', ms: null };
    const version = await repo.tileVersions(db, companyId, z, x, y);
    const key = [companyId, version.company, version.tile, z, x, y, filter.builderId ?? '', filter.communityId ?? '', filter.yearFrom ?? '', filter.yearTo ?? '', (filter.outcome ?? []).join(',')].join('|');
    const cached = cache.get(key);
    if (cached) {
      hits++;
      return { data: cached, source: 'cached', ms: null };
    }
    const started = performance.now();
    let pending = building.get(key);
    if (!pending) {
      misses++;
      pending = repo.homesTile(db, companyId, z, x, y, filter).finally(() => building.delete(key));
      building.set(key, pending);
      pending.then((read) => cache.set(key, read.data), () => undefined);
    }
    const read = await pending;
    return { data: read.data, source: read.stored ? 'stored' : 'built', ms: performance.now() - started };
  }

  return { tile, stats: () => ({ hits, misses, entries: cache.size, bytes: cache.calculatedSize }) };
}
export type HomeTiles = ReturnType<typeof createHomeTiles>;

/**
 * A connection's first tile loads PostGIS and the catalogs the query reads (measured 20-300 ms here):
 * the server builds an empty overview and detail tile, and reads a stored one, on each tile connection
 * when it starts, before the first map asks.
 */
export async function warmTileConnections(db: Db, connections: number) {
  const nobody = '00000000-0000-0000-0000-000000000000';
  await Promise.all(
    Array.from({ length: connections }, async () => {
      await db.execute(repo.homesTileQuery(nobody, HOMES_DETAIL_MIN_ZOOM - 1, 0, 0, { outcome: undefined }));
      await db.execute(repo.homesTileQuery(nobody, HOMES_MAX_TILE_ZOOM, 0, 0, { outcome: undefined }));
      await repo.homesTile(db, nobody, HOMES_DETAIL_MIN_ZOOM, 0, 0, { outcome: undefined });
    }),
  );
}
