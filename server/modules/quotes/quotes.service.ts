import type { Db } from '../../db/client.js';
import type { QuoteDto } from '../../../shared/schemas/quotes.js';
import { communityQuote } from '../../../shared/domain/quote.js';
import { OUTCOME_LABELS, type HomeOutcome } from '../../../shared/domain/outcome.js';
import { formatAddress } from '../../../shared/domain/address.js';
import { formatRadon, paToInWc, type RadonDisplayUnit } from '../../../shared/domain/units.js';
import { AppError } from '../../lib/errors.js';
import { getSettings } from '../settings/settings.repository.js';
import { communityCounts } from '../sampling/sampling.repository.js';
import { pooledPriorForCommunity } from '../insight/insight.service.js';
import type { Mailer } from '../mail/mail.service.js';
import { renderQuotePdf, priceRange } from './quote-pdf.js';
import { QUOTE_CAUTIONS } from './quote-words.js';
import * as repo from './quotes.repository.js';

type User = { id: string; companyId: string };

/** The frozen figures, re-derived: the method text and per-home prices follow exactly from what was stored. */
function recompute(row: repo.QuoteRow) {
  return communityQuote({
    homesTotal: row.homesTotal,
    homesSampled: row.homesSampled,
    failuresSampled: row.failuresSampled,
    activationPrice: row.activationPriceCents,
    reworkPrice: row.reworkPriceCents,
    confidence: row.confidence,
    ...(row.pooled ? { pooledPrior: { alpha: row.priorAlpha, beta: row.priorBeta } } : { prior: { alpha: row.priorAlpha, beta: row.priorBeta } }),
  });
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

function toDto(row: repo.QuoteRow): QuoteDto {
  const q = recompute(row);
  return {
    ...row,
    status: row.status as QuoteDto['status'],
    perHomeExpectedCents: q.perHomeExpected,
    perHomeUpperCents: q.perHomeUpper,
    method: q.method,
    createdAt: row.createdAt.toISOString(),
    approvedAt: iso(row.approvedAt),
    sentAt: iso(row.sentAt),
    decidedAt: iso(row.decidedAt),
  };
}

async function findOr404(db: Db, companyId: string, id: string) {
  const row = await repo.findQuote(db, companyId, id);
  if (!row) throw AppError.notFound('Quote');
  return row;
}

export async function getQuote(db: Db, companyId: string, id: string) {
  return toDto(await findOr404(db, companyId, id));
}

export async function listQuotes(db: Db, companyId: string, filter: { communityId?: string; status?: string }) {
  return (await repo.listQuotes(db, companyId, filter)).map(toDto);
}

/**
 * Prices a community from its sampled homes with the company's prices and confidence, and freezes
 * the figures on a draft quote. With `pooled`, the prior is fitted from the builder's other
 * communities (insight.service pooledPriorForCommunity); otherwise it is uniform Beta(1, 1).
 */
export async function createQuote(db: Db, user: User, body: { communityId: string; pooled: boolean; recipientEmail: string | null }) {
  const [counts, settings] = await Promise.all([communityCounts(db, user.companyId, body.communityId), getSettings(db, user.companyId)]);
  if (!counts) throw AppError.notFound('Community');
  if (!settings) throw AppError.notFound('Company');
  if (counts.homesTotal === 0) {
    throw AppError.unprocessable('This community has no homes to quote: import addresses first', [{ field: 'communityId', message: 'no homes' }]);
  }
  const prior = body.pooled ? (await pooledPriorForCommunity(db, user.companyId, body.communityId)).prior : { alpha: 1, beta: 1 };
  const q = communityQuote({
    homesTotal: counts.homesTotal,
    homesSampled: counts.sampled,
    failuresSampled: counts.failures,
    activationPrice: settings.activationPriceCents,
    reworkPrice: settings.reworkPriceCents,
    confidence: settings.quoteConfidence,
    ...(body.pooled ? { pooledPrior: prior } : { prior }),
  });
  const id = await repo.insertQuote(db, {
    companyId: user.companyId,
    communityId: body.communityId,
    status: 'draft',
    homesTotal: counts.homesTotal,
    homesSampled: counts.sampled,
    failuresSampled: counts.failures,
    priorAlpha: prior.alpha,
    priorBeta: prior.beta,
    pooled: body.pooled,
    confidence: settings.quoteConfidence,
    activationPriceCents: settings.activationPriceCents,
    reworkPriceCents: settings.reworkPriceCents,
    expectedReworks: q.expectedReworks,
    upperReworks: q.upperReworks,
    priceExpectedCents: q.priceExpected,
    priceUpperCents: q.priceUpper,
    recipientEmail: body.recipientEmail,
    createdBy: user.id,
  });
  return getQuote(db, user.companyId, id);
}

async function move(db: Db, companyId: string, id: string, from: readonly string[], set: Parameters<typeof repo.transition>[4], verb: string) {
  const current = await findOr404(db, companyId, id);
  if (!from.includes(current.status) || !(await repo.transition(db, companyId, id, from, set))) {
    throw AppError.conflict(`A ${current.status} quote cannot be ${verb}`, [{ field: 'status', message: `is ${current.status}; must be ${from.join(' or ')}` }]);
  }
  return getQuote(db, companyId, id);
}

export const approveQuote = (db: Db, user: User, id: string) =>
  move(db, user.companyId, id, ['draft'], { status: 'approved', approvedBy: user.id, approvedAt: new Date() }, 'approved');

export const decideQuote = (db: Db, user: User, id: string, decision: 'accepted' | 'declined') =>
  move(db, user.companyId, id, ['sent'], { status: decision, decidedAt: new Date() }, decision);

export async function quotePdf(db: Db, companyId: string, id: string) {
  const row = await findOr404(db, companyId, id);
  const q = recompute(row);
  const [settings, company, outline, homes] = await Promise.all([
    getSettings(db, companyId),
    repo.companyName(db, companyId),
    repo.communityOutline(db, companyId, row.communityId),
    repo.communityHomes(db, companyId, row.communityId),
  ]);
  const pdf = await renderQuotePdf({
    companyName: company,
    communityName: row.communityName,
    jurisdiction: outline?.jurisdiction ?? '',
    boundary: outline?.boundary ?? null,
    homes,
    status: row.status,
    quoteId: row.id,
    createdAt: row.createdAt,
    approvedByName: row.approvedByName,
    radonUnit: (settings?.radonUnit ?? 'pCi/L') as RadonDisplayUnit,
    actionLevelBqM3: settings?.actionLevelBqM3 ?? 148,
    homesTotal: row.homesTotal,
    homesSampled: row.homesSampled,
    failuresSampled: row.failuresSampled,
    confidence: row.confidence,
    activationPriceCents: row.activationPriceCents,
    reworkPriceCents: row.reworkPriceCents,
    expectedReworks: row.expectedReworks,
    upperReworks: row.upperReworks,
    priceExpectedCents: row.priceExpectedCents,
    priceUpperCents: row.priceUpperCents,
    perHomeUpperCents: q.perHomeUpper,
    method: q.method,
  });
  const fileName = `quote-${row.communityName.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '')}-${row.id.slice(0, 8)}.pdf`;
  return { pdf, fileName, row, company };
}

/**
 * E-mails an approved quote as a PDF. The state moves to "sent" only after the mail server
 * accepted the message; sending again re-sends (e.g. to a second board member).
 */
export async function sendQuote(db: Db, mailer: Mailer, user: User, id: string, recipientEmail?: string) {
  const current = await findOr404(db, user.companyId, id);
  if (!['approved', 'sent'].includes(current.status)) {
    throw AppError.conflict(`A ${current.status} quote cannot be sent: a manager approves it first`, [{ field: 'status', message: `is ${current.status}; must be approved` }]);
  }
  const to = recipientEmail ?? current.recipientEmail;
  if (!to) throw AppError.unprocessable('Who should receive the quote?', [{ field: 'recipientEmail', message: 'required: no recipient on the quote yet' }]);
  const { pdf, fileName, row, company } = await quotePdf(db, user.companyId, id);
  const range = priceRange(row.priceExpectedCents, row.priceUpperCents);
  try {
    await mailer.send(user.companyId, {
      to,
      subject: `Radon system activation quote for ${row.communityName}`,
      text:
        `Hello,\n\nAttached is ${company}'s quote for activating the passive radon systems in ${row.communityName} ` +
        `(${row.homesTotal} homes): ${range}, depending on how many homes need rework. ` +
        `The PDF explains what our sampled homes showed, what the price covers and the cautions that apply.\n\n${company}\n`,
      attachments: [{ filename: fileName, content: pdf, contentType: 'application/pdf' }],
    });
  } catch (err) {
    throw new AppError('INTERNAL', 502, `The mail server did not accept the quote: ${(err as Error).message}`);
  }
  await repo.transition(db, user.companyId, id, ['approved', 'sent'], { status: 'sent', sentAt: new Date(), recipientEmail: to });
  return getQuote(db, user.companyId, id);
}

/** A homeowner's own results in plain words (never another home's), e-mailed on request. */
export async function emailHomeResults(db: Db, mailer: Mailer, companyId: string, homeId: string, to: string) {
  const [home, settings, company] = await Promise.all([repo.homeForResults(db, companyId, homeId), getSettings(db, companyId), repo.companyName(db, companyId)]);
  if (!home) throw AppError.notFound('Home');
  if (home.doNotContact) throw AppError.unprocessable('This home is marked do-not-contact', [{ field: 'homeId', message: 'do not contact' }]);
  const unit = (settings?.radonUnit ?? 'pCi/L') as RadonDisplayUnit;
  const action = settings?.actionLevelBqM3 ?? 148;
  const address = `${formatAddress(home)}, ${home.city}, ${home.state} ${home.zip}`;
  const lines = [
    `Radon system results for ${address}`,
    '',
    `Status: ${OUTCOME_LABELS[home.outcome as HomeOutcome] ?? home.outcome}.`,
    home.lastVisitOn ? `Last activation visit: ${home.lastVisitOn}.` : 'No activation visit recorded yet.',
    home.lastVacuumPa != null ? `System gauge (manometer) reading: ${paToInWc(home.lastVacuumPa).toFixed(2)} in. WC.` : null,
    home.lastPostBqM3 != null
      ? `Latest post-mitigation radon test: ${formatRadon(home.lastPostBqM3, unit)} (action level ${formatRadon(action, unit)}): ${home.lastPostBqM3 >= action ? 'at or above the action level.' : 'below the action level.'}`
      : 'No post-mitigation radon test result yet.',
    '',
    'Good to know:',
    ...QUOTE_CAUTIONS.filter((_, i) => i === 2 || i === 4 || i === 5).map((c) => `- ${c}`),
    '',
    company,
  ].filter((l): l is string => l !== null);
  try {
    return await mailer.send(companyId, { to, subject: `Your home's radon system results: ${formatAddress(home)}`, text: lines.join('\n') });
  } catch (err) {
    throw new AppError('INTERNAL', 502, `The mail server did not accept the message: ${(err as Error).message}`);
  }
}

