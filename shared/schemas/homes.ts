import { z } from 'zod';
import { FOUNDATIONS, OUTCOMES, PASSIVE_SYSTEM } from './enums.js';
import { Latitude, Longitude, YearBuilt, patchSchema } from './common.js';

const ZIP = z.string().trim().regex(/^\d{5}(-\d{4})?$/, 'must be a 5-digit ZIP or ZIP+4');

const HomeFields = z.object({
  number: z.string().trim().min(1).max(12),
  street: z.string().trim().min(1).max(120),
  unit: z.string().trim().max(20).nullable().default(null),
  city: z.string().trim().min(1).max(80),
  state: z.string().trim().regex(/^[A-Za-z]{2}$/, 'must be a two-letter state code').toUpperCase(),
  zip: ZIP,
  lon: Longitude,
  lat: Latitude,
  communityId: z.string().uuid().nullable().default(null),
  builderId: z.string().uuid().nullable().default(null),
  yearBuilt: YearBuilt.nullable().default(null),
  foundation: z.enum(FOUNDATIONS).nullable().default(null),
  passiveSystem: z.enum(PASSIVE_SYSTEM).default('unknown'),
  pipeSizeIn: z.union([z.literal(3), z.literal(4)]).nullable().default(null),
  suctionPointNote: z.string().max(2000).default(''),
  ownerName: z.string().max(160).default(''),
  mailingAddress: z.string().max(400).default(''),
  doNotContact: z.boolean().default(false),
});

export const HomeBody = HomeFields;
export const UpdateHomeBody = patchSchema(HomeFields);

export const HomeListQuery = z.object({
  communityId: z.string().uuid().optional(),
  builderId: z.string().uuid().optional(),
  outcome: z.enum(OUTCOMES).optional(),
  q: z.string().trim().max(120).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  offset: z.coerce.number().int().min(0).default(0),
});

export const HomeDto = z.object({
  id: z.string(),
  /** The home's short number: its feature id in the map's homes tiles. */
  ref: z.number().int(),
  address: z.string(),
  number: z.string(),
  street: z.string(),
  unit: z.string().nullable(),
  city: z.string(),
  state: z.string(),
  zip: z.string(),
  lon: z.number(),
  lat: z.number(),
  communityId: z.string().nullable(),
  communityName: z.string().nullable(),
  builderId: z.string().nullable(),
  builderName: z.string().nullable(),
  yearBuilt: z.number().nullable(),
  foundation: z.enum(FOUNDATIONS).nullable(),
  passiveSystem: z.enum(PASSIVE_SYSTEM),
  pipeSizeIn: z.number().nullable(),
  suctionPointNote: z.string(),
  outcome: z.enum(OUTCOMES),
  doNotContact: z.boolean(),
  /** Present only for roles allowed to see personal contact data. */
  contact: z.object({ ownerName: z.string(), mailingAddress: z.string() }).nullable(),
});
export type HomeDto = z.infer<typeof HomeDto>;

/** A home by its short number (a map tile's feature id), as a tap on the map names it. */
export const HomeRefParams = z.object({ ref: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER) });
