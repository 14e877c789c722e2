import type { Db } from '../../db/client.js';
import type { SampleSizeDto, SamplingPlanDto } from '../../../shared/schemas/sampling.js';
import { planSample, sampleSizeForCommunity } from '../../../shared/domain/sampling.js';
import { posteriorBeta } from '../../../shared/domain/statistics.js';
import { formatAddress } from '../../../shared/domain/address.js';
import { AppError } from '../../lib/errors.js';
import { pooledPriorForCommunity } from '../insight/insight.service.js';
import * as repo from './sampling.repository.js';

export interface SizeInput {
  communityId: string;
  marginOfError: number;
  rateSource: 'assumed' | 'observed';
  expectedRate?: number;
}

const pct = (x: number) => `${Math.round(x * 1000) / 10} %`;

async function sizeFor(db: Db, companyId: string, input: SizeInput) {
  const counts = await repo.communityCounts(db, companyId, input.communityId);
  if (!counts) throw AppError.notFound('Community');
  if (counts.homesTotal === 0) {
    throw AppError.unprocessable('This community has no homes yet: import addresses first', [{ field: 'communityId', message: 'no homes' }]);
  }
  let expectedRate: number;
  let rateNote: string;
  if (input.rateSource === 'assumed') {
    if (input.expectedRate === undefined) throw AppError.unprocessable('Give the assumed failure rate', [{ field: 'expectedRate', message: 'required when the rate is assumed' }]);
    expectedRate = input.expectedRate;
    rateNote = expectedRate === 0.5 ? 'assumed 50 %, the most cautious choice (largest sample)' : `assumed ${pct(expectedRate)}`;
  } else {
    // The observed rate, pooled with the builder's other communities so that two sampled homes
    // (or none) do not set the sample size on their own.
    const { prior, note } = await pooledPriorForCommunity(db, companyId, input.communityId);
    const post = posteriorBeta(prior, counts.failures, counts.sampled);
    expectedRate = post.alpha / (post.alpha + post.beta);
    rateNote = `observed ${counts.failures} failure(s) in ${counts.sampled} sampled home(s), pooled with a prior ${note}: ${pct(expectedRate)}`;
  }
  const candidates = await repo.candidateHomes(db, companyId, input.communityId);
  const sampleSize = sampleSizeForCommunity({ homesTotal: counts.homesTotal, marginOfError: input.marginOfError, expectedRate });
  const size: SampleSizeDto = {
    communityId: input.communityId,
    homesTotal: counts.homesTotal,
    alreadySampled: counts.sampled,
    eligible: candidates.length,
    expectedRate,
    rateNote,
    marginOfError: input.marginOfError,
    sampleSize,
    toVisit: Math.min(candidates.length, Math.max(0, sampleSize - counts.sampled)),
  };
  return { size, candidates };
}

export async function sampleSize(db: Db, companyId: string, input: SizeInput): Promise<SampleSizeDto> {
  return (await sizeFor(db, companyId, input)).size;
}

export async function getPlan(db: Db, companyId: string, id: string): Promise<SamplingPlanDto> {
  const plan = await repo.findPlan(db, companyId, id);
  if (!plan) throw AppError.notFound('Sampling plan');
  const homes = await repo.planHomes(db, companyId, id);
  return {
    ...plan,
    createdAt: plan.createdAt.toISOString(),
    homes: homes.map((h) => ({ id: h.id, address: formatAddress(h), street: h.street, lon: h.lon, lat: h.lat, outcome: h.outcome, sampled: h.sampled })),
  };
}

/**
 * Saves a plan: Cochran's size with the finite-population correction, then that many unsampled,
 * contactable homes spread across the community by farthest-point selection (planSample).
 * The plan and its homes are written in one transaction.
 */
export async function createPlan(db: Db, user: { id: string; companyId: string }, input: SizeInput): Promise<SamplingPlanDto> {
  const { size, candidates } = await sizeFor(db, user.companyId, input);
  const chosen = planSample({ homes: candidates, count: size.toVisit });
  const id = await db.transaction((tx) =>
    repo.insertPlan(
      tx,
      {
        companyId: user.companyId,
        communityId: input.communityId,
        marginOfError: input.marginOfError,
        expectedRate: size.expectedRate,
        sampleSize: size.sampleSize,
        createdBy: user.id,
      },
      chosen,
    ),
  );
  return getPlan(db, user.companyId, id);
}

export async function listPlans(db: Db, companyId: string, communityId?: string) {
  const rows = await repo.listPlans(db, companyId, communityId);
  return rows.map((p) => ({ ...p, createdAt: p.createdAt.toISOString() }));
}
