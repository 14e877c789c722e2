import { z } from 'zod';

/** Where the failure rate behind the sample size comes from. */
export const RATE_SOURCES = ['assumed', 'observed'] as const;

export const SamplingPlanBody = z
  .object({
    communityId: z.string().uuid(),
    /** Half-width of the 95 % interval on the failure rate, e.g. 0.1 for ±10 points. */
    marginOfError: z.number().min(0.01).max(0.5),
    rateSource: z.enum(RATE_SOURCES).default('assumed'),
    /** Needed when rateSource is 'assumed'; 0.5 is the most conservative choice. */
    expectedRate: z.number().min(0).max(1).optional(),
  })
  .refine((b) => b.rateSource !== 'assumed' || b.expectedRate !== undefined, {
    path: ['expectedRate'],
    message: 'give the assumed failure rate (0.5 if unknown)',
  });
export type SamplingPlanBody = z.infer<typeof SamplingPlanBody>;

/** Preview of a plan's size without saving it. */
export const SampleSizeQuery = z.object({
  communityId: z.string().uuid(),
  marginOfError: z.coerce.number().min(0.01).max(0.5),
  rateSource: z.enum(RATE_SOURCES).default('assumed'),
  expectedRate: z.coerce.number().min(0).max(1).optional(),
});

export const SamplingPlanListQuery = z.object({ communityId: z.string().uuid().optional() });

export const SampleSizeDto = z.object({
  communityId: z.string(),
  homesTotal: z.number().int(),
  alreadySampled: z.number().int(),
  eligible: z.number().int(),
  expectedRate: z.number(),
  rateNote: z.string(),
  marginOfError: z.number(),
  /** Cochran's n with the finite-population correction, for the whole community. */
  sampleSize: z.number().int(),
  /** Homes still to visit: sampleSize less those already sampled, at most the eligible homes. */
  toVisit: z.number().int(),
});
export type SampleSizeDto = z.infer<typeof SampleSizeDto>;

export const PlannedHome = z.object({
  id: z.string(),
  address: z.string(),
  street: z.string(),
  lon: z.number(),
  lat: z.number(),
  outcome: z.string(),
  /** Sampled since the plan was made. */
  sampled: z.boolean(),
});

export const SamplingPlanDto = z.object({
  id: z.string(),
  communityId: z.string(),
  communityName: z.string(),
  marginOfError: z.number(),
  expectedRate: z.number(),
  sampleSize: z.number().int(),
  createdAt: z.string(),
  createdByName: z.string().nullable(),
  homes: z.array(PlannedHome),
});
export type SamplingPlanDto = z.infer<typeof SamplingPlanDto>;
