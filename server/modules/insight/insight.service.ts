import type { Db } from '../../db/client.js';
import type { BuilderComparisonDto, BuilderComparisonQuery, CommunityEstimate, ComparisonRow } from '../../../shared/schemas/insight.js';
import { wilsonInterval, type BetaParams } from '../../../shared/domain/statistics.js';
import { backtestPooling, pooledEstimates, POOLING_METHOD, type PoolingGroup } from '../../../shared/domain/pooling-backtest.js';
import { formatRadon } from '../../../shared/domain/units.js';
import { AppError } from '../../lib/errors.js';
import { getSettings } from '../settings/settings.repository.js';
import * as repo from './insight.repository.js';

/** Homes of a community seen first in the back-test: "a community with two sampled homes" (issue #6). */
export const BACKTEST_SEEN = 2;

const cellKey = (c: { builderId: string | null; communityId: string | null; yearBuilt?: number | null }) =>
  `${c.builderId ?? '-'}|${c.communityId ?? '-'}${c.yearBuilt === undefined ? '' : `|${c.yearBuilt ?? '-'}`}`;

function wilson(k: number, n: number) {
  const w = wilsonInterval(k, n);
  return { rate: n > 0 ? w.rate : null, lower: w.lower, upper: w.upper };
}

interface CommunityGroup {
  builderId: string;
  builderName: string;
  communityId: string | null;
  communityName: string | null;
  homes: number;
  sampled: number;
  failures: number;
}

function communityGroups(cells: repo.CellRow[]): CommunityGroup[] {
  const groups = new Map<string, CommunityGroup>();
  for (const c of cells) {
    const key = cellKey({ builderId: c.builderId, communityId: c.communityId });
    const g = groups.get(key) ?? { builderId: c.builderId, builderName: c.builderName, communityId: c.communityId, communityName: c.communityName, homes: 0, sampled: 0, failures: 0 };
    g.homes += c.homes;
    g.sampled += c.sampled;
    g.failures += c.failures;
    groups.set(key, g);
  }
  return [...groups.values()];
}

/** Communities borrow from the builder's other communities; construction years from the same community's other years. */
const toPoolingGroup = (g: { builderId: string; communityId: string | null; yearBuilt?: number | null; sampled: number; failures: number }): PoolingGroup => ({
  key: cellKey(g),
  parentKey: g.yearBuilt === undefined ? g.builderId : cellKey({ builderId: g.builderId, communityId: g.communityId }),
  k: g.failures,
  n: g.sampled,
});

const points = (x: number) => `${(x * 100).toFixed(1)} points`;

function verdict(raw: number | null, pooled: number | null, seen: number): string {
  if (raw === null || pooled === null) return 'Too few communities with enough sampled homes to back-test the pooling yet.';
  const head = `Holding out each community and pretending only ${seen} of its homes had been sampled, the raw rate of those ${seen} homes missed its final rate by ${points(raw)} on average; the pooled estimate missed by ${points(pooled)}.`;
  return pooled < raw
    ? `${head} Pooling helps on your data.`
    : `${head} Pooling does not help on your data: this builder's communities differ more than chance (for example a design change between phases), so judge them on their own homes and quote with the raw rate.`;
}

/**
 * The builder comparison. Aggregates come from SQL for the whole company (pooling borrows from
 * every cell of a builder, whatever the filters); the filters then pick the rows shown.
 */
export async function builderComparison(db: Db, companyId: string, query: BuilderComparisonQuery): Promise<BuilderComparisonDto> {
  const [cells, settings] = await Promise.all([repo.builderYearCells(db, companyId), getSettings(db, companyId)]);
  if (!settings) throw AppError.notFound('Company');

  const pooledCells = pooledEstimates(cells.map(toPoolingGroup));
  const groups = communityGroups(cells);
  const communityPoolingGroups = groups.map(toPoolingGroup);
  const pooledGroups = pooledEstimates(communityPoolingGroups);
  const backtest = backtestPooling(communityPoolingGroups, { seen: BACKTEST_SEEN });

  const matches = (r: { builderId: string | null; communityId: string | null; yearBuilt?: number | null }) =>
    (!query.builderId || r.builderId === query.builderId) &&
    (!query.communityId || r.communityId === query.communityId) &&
    (r.yearBuilt === undefined ||
      ((query.yearFrom === undefined || (r.yearBuilt != null && r.yearBuilt >= query.yearFrom)) &&
        (query.yearTo === undefined || (r.yearBuilt != null && r.yearBuilt <= query.yearTo))));

  const rows: ComparisonRow[] = cells
    .map((c, i) => ({
      ...c,
      wilson: wilson(c.failures, c.sampled),
      pooled: { rate: pooledCells[i].pooledRate, lower: pooledCells[i].lower, upper: pooledCells[i].upper },
    }))
    .filter(matches);

  const communities: CommunityEstimate[] = groups
    .map((g, i) => ({
      ...g,
      wilson: wilson(g.failures, g.sampled),
      pooled: { rate: pooledGroups[i].pooledRate, lower: pooledGroups[i].lower, upper: pooledGroups[i].upper },
      priorSource: pooledGroups[i].priorSource,
    }))
    .filter(matches);

  const names = new Map(groups.map((g) => [cellKey(g), g]));
  return {
    rows,
    communities,
    backtest: {
      seen: backtest.seen,
      groupsScored: backtest.groupsScored,
      meanErrorRaw: backtest.meanErrorRaw,
      meanErrorPooled: backtest.meanErrorPooled,
      meanErrorRestOnly: backtest.meanErrorRestOnly,
      verdict: verdict(backtest.meanErrorRaw, backtest.meanErrorPooled, backtest.seen),
      rows: backtest.rows.map((r) => ({
        builderName: names.get(r.key)?.builderName ?? null,
        communityName: names.get(r.key)?.communityName ?? null,
        n: r.n,
        k: r.k,
        actualRate: r.actualRate,
        restRate: r.restRate,
        errorRaw: r.errorRaw,
        errorPooled: r.errorPooled,
        errorRestOnly: r.errorRestOnly,
      })),
    },
    actionLevelBqM3: settings.actionLevelBqM3,
    method: {
      interval: 'Each failure rate carries a Wilson (1927) score 95 % interval: with few sampled homes the interval is wide, so a rate from two homes never looks as certain as one from forty.',
      failure: `A failure is a sampled home whose activation alone did not bring it below the action level (${formatRadon(settings.actionLevelBqM3, settings.radonUnit as 'pCi/L' | 'Bq/m3')}), or that needed rework.`,
      pooling: `${POOLING_METHOD} Construction-year rows borrow in the same way from the other years of the same builder's community.`,
    },
  };
}

/**
 * The prior a pooled quote starts from: for each builder in the community, the Beta prior fitted
 * from that builder's other communities (this community held out, so its homes count once, when
 * the quote updates the prior with them); several builders are blended in proportion to their
 * homes here.
 */
export async function pooledPriorForCommunity(db: Db, companyId: string, communityId: string): Promise<{ prior: BetaParams; note: string }> {
  const [cells, builders] = await Promise.all([repo.builderYearCells(db, companyId), repo.buildersInCommunity(db, companyId, communityId)]);
  const groups = communityGroups(cells);
  const estimates = pooledEstimates(groups.map(toPoolingGroup));
  const totalHomes = builders.reduce((s, b) => s + b.homes, 0);
  if (totalHomes === 0) return { prior: { alpha: 1, beta: 1 }, note: 'no builder on record for this community: uniform Beta(1, 1)' };
  let alpha = 0;
  let beta = 0;
  for (const b of builders) {
    const i = groups.findIndex((g) => g.builderId === b.builderId && g.communityId === communityId);
    const prior = i >= 0 ? estimates[i].prior : { alpha: 1, beta: 1 };
    alpha += (b.homes / totalHomes) * prior.alpha;
    beta += (b.homes / totalHomes) * prior.beta;
  }
  const note = builders.length > 1 ? "blended from each builder's other communities in proportion to its homes here" : "fitted from the builder's other communities";
  return { prior: { alpha, beta }, note };
}
