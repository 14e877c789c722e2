import { Router } from 'express';
import path from 'node:path';
import { TileParams } from '../../../shared/schemas/map.js';
import { AppError } from '../../lib/errors.js';
import { validate } from '../../middleware/validate.js';
import { createBaseTiles, DEMO_DATA_DIR, getGlyphs, getStyle } from './basemap.service.js';

export interface BasemapRouterOptions {
  /** The base source's attribution, e.g. "Demo town: invented data" or "© OpenStreetMap contributors". */
  attribution: string;
  /** A PMTiles archive on disk; when set the style draws it instead of the demo town. */
  pmtilesPath?: string;
  /** Where the demo town's GeoJSON lives; tests point this at a fixture. */
  dataDir?: string;
}

const PMTILES_URL = '/map/basemap.pmtiles';

/**
 * The basemap, mounted at the app root:
 *   GET /map/style.json                  MapLibre style (URLs on the request's own origin)
 *   GET /tiles/base/:z/:x/:y.pbf         demo town vector tiles
 *   GET /glyphs/:fontstack/:range.pbf    label glyphs
 *   GET /map/basemap.pmtiles             the deployment's PMTiles archive (HTTP Range → 206), if configured
 *
 * No authentication: the style, tiles, glyphs and archive are map furniture (streets, parks, place
 * names, a font) with no customer data, and the sign-in page may draw a map. Customer data stays
 * in /tiles/homes, behind sign-in. Mount this before the session middleware so a tile request
 * does not read the session store.
 */
export function basemapRouter(options: BasemapRouterOptions): Router {
  const router = Router();
  const baseTiles = createBaseTiles(options.dataDir ?? DEMO_DATA_DIR);

  router.get('/map/style.json', (req, res) => {
    // The request's own origin (honouring `trust proxy`), so the style works behind any host name.
    const origin = `${req.protocol}://${req.get('host')}`;
    res.set('Cache-Control', 'public, max-age=300');
    res.json(getStyle(origin, { attribution: options.attribution, pmtilesUrl: options.pmtilesPath ? PMTILES_URL : undefined }));
  });

  router.get('/tiles/base/:z/:x/:y.pbf', validate({ params: TileParams }), (req, res) => {
    const { z, x, y } = req.params as unknown as { z: number; x: number; y: number };
    res.set({ 'Content-Type': 'application/x-protobuf', 'Cache-Control': 'public, max-age=3600' });
    res.send(baseTiles.getTile(z, x, y));
  });

  router.get('/glyphs/:fontstack/:range.pbf', async (req, res) => {
    const glyphs = await getGlyphs(req.params.fontstack, req.params.range);
    // A block of a shipped font only changes with a new font package, i.e. a new deployment.
    res.set({ 'Content-Type': 'application/x-protobuf', 'Cache-Control': 'public, max-age=86400' });
    res.send(glyphs);
  });

  if (options.pmtilesPath) {
    const archive = path.resolve(options.pmtilesPath);
    router.get(PMTILES_URL, (_req, res, next) => {
      // sendFile answers Range requests with 206 and the requested bytes, which is how the
      // pmtiles client reads the archive's directory and tiles without fetching the whole file.
      res.sendFile(
        archive,
        { acceptRanges: true, maxAge: '1h', headers: { 'Content-Type': 'application/vnd.pmtiles' } },
        (err?: Error & { status?: number; headers?: Record<string, string> }) => {
          if (!err || res.headersSent) return;
          if (err.status === 416) {
            // A range past the end is the client's mistake; Content-Range tells it the real size (RFC 9110 §15.5.17).
            if (err.headers) res.set(err.headers);
            next(new AppError('VALIDATION_FAILED', 416, 'The requested range is outside the basemap archive'));
            return;
          }
          // A configured archive that cannot be read is the server's fault: logged and answered 500.
          next(err);
        },
      );
    });
  }

  return router;
}
