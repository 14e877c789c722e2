import { Router } from 'express';
import { currentUser, requireRole } from '../../middleware/auth.js';
import { AppError } from '../../lib/errors.js';
import type { Mailer } from './mail.service.js';

/** GET /api/mail/outbox — development only: the mail this server sent for the signed-in company. */
export function mailRouter(mailer: Mailer): Router {
  const router = Router();
  router.get('/outbox', requireRole('admin', 'manager', 'estimator', 'sales'), (req, res) => {
    if (!mailer.outboxEnabled) throw AppError.notFound('Outbox');
    res.json({ messages: mailer.outbox(currentUser(req).companyId) });
  });
  return router;
}
