import { z } from 'zod';

/** Filters of the builder comparison (and of the map link each row leads to). */
export const BuilderComparisonQuery = z
  .object({
    builderId: z.string().uuid().optional(),
    communityId: z.string().uuid().optional(),
    yearFrom: z.coerce.number().int().min(1800).max(2100).optional(),
    yearTo: z.coerce.number().int().min(1800).max(2100).optional(),
  })
  .refine((q) => q.yearFrom === undefined || q.yearTo === undefined || q.yearFrom <= q.yearTo, {
    path: ['yearTo'],
    message: 'must not be before yearFrom',
  });
export type BuilderComparisonQuery = z.infer<typeof BuilderComparisonQuery>;

const Interval = z.object({ rate: z.number().nullable(), lower: z.number(), upper: z.number() });

export const ReasonCount = z.object({ reason: z.string(), count: z.number().int() });

/** One builder × community × construction-year cell. Rates are proportions (0–1). */
export const ComparisonRow = z.object({
  builderId: z.string().nullable(),
  builderName: z.string().nullable(),
  communityId: z.string().nullable(),
  communityName: z.string().nullable(),
  yearBuilt: z.number().int().nullable(),
  homes: z.number().int(),
  sampled: z.number().int(),
  failures: z.number().int(),
  /** Wilson (1927) score interval at 95 %; rate null when nothing was sampled. */
  wilson: Interval,
  /** Partially pooled towards the builder's other cells (shared/domain/pooling-backtest.ts). */
  pooled: Interval,
  medianVacuumPa: z.number().nullable(),
  medianPostBqM3: z.number().nullable(),
  topReworkReasons: z.array(ReasonCount),
});
export type ComparisonRow = z.infer<typeof ComparisonRow>;

/** One builder × community: the unit a quote borrows strength for. */
export const CommunityEstimate = z.object({
  builderId: z.string().nullable(),
  builderName: z.string().nullable(),
  communityId: z.string().nullable(),
  communityName: z.string().nullable(),
  homes: z.number().int(),
  sampled: z.number().int(),
  failures: z.number().int(),
  wilson: Interval,
  pooled: Interval,
  priorSource: z.enum(['same_parent', 'all_groups', 'uniform']),
});
export type CommunityEstimate = z.infer<typeof CommunityEstimate>;

export const BacktestSummary = z.object({
  seen: z.number().int(),
  groupsScored: z.number().int(),
  meanErrorRaw: z.number().nullable(),
  meanErrorPooled: z.number().nullable(),
  meanErrorRestOnly: z.number().nullable(),
  /** Plain-English reading of the back-test for the page. */
  verdict: z.string(),
  rows: z.array(
    z.object({
      builderName: z.string().nullable(),
      communityName: z.string().nullable(),
      n: z.number().int(),
      k: z.number().int(),
      actualRate: z.number(),
      restRate: z.number(),
      errorRaw: z.number(),
      errorPooled: z.number(),
      errorRestOnly: z.number(),
    }),
  ),
});
export type BacktestSummary = z.infer<typeof BacktestSummary>;

export const BuilderComparisonDto = z.object({
  rows: z.array(ComparisonRow),
  communities: z.array(CommunityEstimate),
  backtest: BacktestSummary,
  actionLevelBqM3: z.number(),
  /** Plain-English statement of the interval and pooling methods, shown on the page. */
  method: z.object({ interval: z.string(), pooling: z.string(), failure: z.string() }),
});
export type BuilderComparisonDto = z.infer<typeof BuilderComparisonDto>;
