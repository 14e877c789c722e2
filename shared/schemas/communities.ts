import { z } from 'zod';
import { PolygonGeometry, patchSchema } from './common.js';

const CommunityFields = z.object({
  name: z.string().trim().min(1).max(120),
  boundary: PolygonGeometry,
  builderIds: z.array(z.string().uuid()).max(20).default([]),
  yearFrom: z.number().int().min(1900).max(2100).nullable().default(null),
  yearTo: z.number().int().min(1900).max(2100).nullable().default(null),
  jurisdiction: z.string().trim().max(120).default(''),
  passiveRequired: z.boolean().nullable().default(null),
});

const yearsInOrder = (b: { yearFrom?: number | null; yearTo?: number | null }) =>
  b.yearFrom == null || b.yearTo == null || b.yearFrom <= b.yearTo;

export const CommunityBody = CommunityFields.refine(yearsInOrder, {
  path: ['yearTo'],
  message: 'must not be before yearFrom',
});
export const UpdateCommunityBody = patchSchema(CommunityFields).refine(yearsInOrder, { path: ['yearTo'], message: 'must not be before yearFrom' });

export const CommunityDto = z.object({
  id: z.string(),
  name: z.string(),
  boundary: PolygonGeometry.nullable(),
  builderIds: z.array(z.string()),
  yearFrom: z.number().nullable(),
  yearTo: z.number().nullable(),
  jurisdiction: z.string(),
  passiveRequired: z.boolean().nullable(),
  homeCount: z.number(),
});
export type CommunityDto = z.infer<typeof CommunityDto>;
