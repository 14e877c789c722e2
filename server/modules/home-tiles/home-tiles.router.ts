import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { MapFilter, TileParams } from '../../../shared/schemas/map.js';
import { currentUser } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import { createHomeTiles } from './home-tiles.service.js';

/**
 * GET /tiles/homes/:z/:x/:y.pbf — the signed-in company's homes as a vector tile, filtered like the map.
 * db: the tile connections (Database.tiles).
 */
export function homeTilesRouter(db: Db): Router {
  const router = Router();
  const homeTiles = createHomeTiles(db);
  router.get('/:z/:x/:y.pbf', validate({ params: TileParams, query: MapFilter }), async (req, res) => {
    const user = currentUser(req);
    const { z, x, y } = req.params as unknown as { z: number; x: number; y: number };
    const { data, source, ms } = await homeTiles.tile(user.companyId, z, x, y, req.query as unknown as MapFilter);
    res.set({
      'Content-Type': 'application/x-protobuf',
      // Private: the tile carries one company's customer data. no-cache: the browser revalidates
      // every time (Express answers 304 on an unchanged ETag), so a home whose outcome a visit or
      // test just changed shows on the very next tile request. The server-side cache is keyed on
      // the tile's and the company's versions (see home-tiles.service.ts), so it is never stale either.
      'Cache-Control': 'private, no-cache',
      // W3C Server Timing: whether the tile came from the cache, from the stored tiles or was built, and how long that took.
      'Server-Timing': ms == null ? `tile;desc="${source}"` : `tile;desc="${source}";dur=${ms.toFixed(1)}`,
    });
    res.send(data);
  });
  return router;
}
