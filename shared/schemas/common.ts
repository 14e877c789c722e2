import { z } from 'zod';

export const IdParams = z.object({ id: z.string().uuid() });

/** A GeoJSON polygon ring list in lon/lat (RFC 7946): closed rings of at least four positions. */
const Position = z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)]);
const Ring = z
  .array(Position)
  .min(4, 'a ring needs at least four positions')
  .refine((r) => r[0][0] === r[r.length - 1][0] && r[0][1] === r[r.length - 1][1], 'a ring must be closed');
export const PolygonGeometry = z.object({ type: z.literal('Polygon'), coordinates: z.array(Ring).min(1) });
export type PolygonGeometry = z.infer<typeof PolygonGeometry>;

export const Longitude = z.number().min(-180).max(180);
export const Latitude = z.number().min(-90).max(90);
export const YearBuilt = z.number().int().min(1800).max(2100);

export const ApiErrorBody = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    fields: z.array(z.object({ field: z.string(), message: z.string() })).optional(),
  }),
});
export type ApiErrorBody = z.infer<typeof ApiErrorBody>;

type Undefaulted<S> = S extends z.ZodDefault<infer Inner> ? Inner : S;

/**
 * The PATCH form of a create schema: every field optional and no defaults, so a partial update
 * never resets the fields it does not mention. Refuses an empty body.
 */
export function patchSchema<T extends z.ZodRawShape>(create: z.ZodObject<T>) {
  const shape = Object.fromEntries(
    Object.entries(create.shape).map(([k, s]) => [k, (s instanceof z.ZodDefault ? s.unwrap() : s) as z.ZodType]),
  ) as unknown as { [K in keyof T]: Undefaulted<T[K]> };
  return z
    .object(shape)
    .partial()
    .refine((b) => Object.keys(b).length > 0, 'nothing to change');
}
