import { z } from 'zod';
import { OUTCOMES } from './enums.js';

/** Map filters: shared by the homes tile endpoint, the URL of the map page and its saved state. */
export const MapFilter = z.object({
  builderId: z.string().uuid().optional(),
  communityId: z.string().uuid().optional(),
  yearFrom: z.coerce.number().int().min(1800).max(2100).optional(),
  yearTo: z.coerce.number().int().min(1800).max(2100).optional(),
  /** Comma-separated outcomes. */
  outcome: z
    .string()
    .optional()
    .transform((s, ctx) => {
      if (!s) return undefined;
      const list = s.split(',').filter(Boolean);
      const bad = list.filter((o) => !(OUTCOMES as readonly string[]).includes(o));
      if (bad.length) ctx.addIssue({ code: 'custom', message: `unknown outcome: ${bad.join(', ')}` });
      return list as (typeof OUTCOMES)[number][];
    }),
});
export type MapFilter = z.infer<typeof MapFilter>;

export const TileParams = z
  .object({
    z: z.coerce.number().int().min(0).max(22),
    x: z.coerce.number().int().min(0),
    y: z.coerce.number().int().min(0),
  })
  .refine((t) => t.x < 2 ** t.z, { path: ['x'], message: 'outside the tile grid at this zoom' })
  .refine((t) => t.y < 2 ** t.z, { path: ['y'], message: 'outside the tile grid at this zoom' });

/** The map asks for homes tiles up to this zoom and draws deeper zooms from them (MVT overzoom). */
export const HOMES_MAX_TILE_ZOOM = 16;

/** Homes are drawn from this zoom up; below it the tile is empty (community outlines carry the view). */
export const HOMES_MIN_ZOOM = 11;

/**
 * From this zoom up each home is its own feature, with its id, so a tap opens it. Below it homes are
 * drawn as one feature per small cell (property `homes` = how many), and a tap zooms in.
 */
export const HOMES_DETAIL_MIN_ZOOM = 14;
