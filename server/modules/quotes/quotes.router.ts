import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { CONTACT_ROLES } from '../../../shared/schemas/enums.js';
import { HomeResultsMailBody, QuoteBody, QuoteDecisionBody, QuoteListQuery, SendQuoteBody } from '../../../shared/schemas/quotes.js';
import { currentUser, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import type { Mailer } from '../mail/mail.service.js';
import * as service from './quotes.service.js';

/** Estimators build quotes; managers (and admins) approve them (PRODUCT.md roles). */
const QUOTE_ROLES = ['admin', 'manager', 'estimator'] as const;
const APPROVER_ROLES = ['admin', 'manager'] as const;

export function quotesRouter(db: Db, mailer: Mailer): Router {
  const router = Router();
  const quoters = requireRole(...QUOTE_ROLES);
  router.get('/', quoters, validate({ query: QuoteListQuery }), async (req, res) => {
    res.json({ quotes: await service.listQuotes(db, currentUser(req).companyId, req.query as never) });
  });
  router.get('/:id', quoters, validate({ params: IdParams }), async (req, res) => {
    res.json({ quote: await service.getQuote(db, currentUser(req).companyId, req.params.id as string) });
  });
  router.get('/:id/pdf', quoters, validate({ params: IdParams }), async (req, res) => {
    const { pdf, fileName } = await service.quotePdf(db, currentUser(req).companyId, req.params.id as string);
    res.set({ 'Content-Type': 'application/pdf', 'Content-Disposition': `inline; filename="${fileName}"`, 'Cache-Control': 'private, no-store' });
    res.send(pdf);
  });
  router.post('/', quoters, validate({ body: QuoteBody }), async (req, res) => {
    res.status(201).json({ quote: await service.createQuote(db, currentUser(req), req.body) });
  });
  router.post('/:id/approve', requireRole(...APPROVER_ROLES), validate({ params: IdParams }), async (req, res) => {
    res.json({ quote: await service.approveQuote(db, currentUser(req), req.params.id as string) });
  });
  router.post('/:id/send', quoters, validate({ params: IdParams, body: SendQuoteBody }), async (req, res) => {
    res.json({ quote: await service.sendQuote(db, mailer, currentUser(req), req.params.id as string, req.body.recipientEmail) });
  });
  router.post('/:id/decision', quoters, validate({ params: IdParams, body: QuoteDecisionBody }), async (req, res) => {
    res.json({ quote: await service.decideQuote(db, currentUser(req), req.params.id as string, req.body.decision) });
  });
  return router;
}

/** POST /api/home-results/:id/email — a homeowner's own results, for the roles that may contact owners. */
export function homeResultsRouter(db: Db, mailer: Mailer): Router {
  const router = Router();
  router.post('/:id/email', requireRole(...CONTACT_ROLES), validate({ params: IdParams, body: HomeResultsMailBody }), async (req, res) => {
    const sent = await service.emailHomeResults(db, mailer, currentUser(req).companyId, req.params.id as string, req.body.recipientEmail);
    res.json({ sent });
  });
  return router;
}
