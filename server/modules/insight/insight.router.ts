import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { BuilderComparisonQuery } from '../../../shared/schemas/insight.js';
import { currentUser, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './insight.service.js';

/** Roles that compare builders and construction years (PRODUCT.md: managers; estimators quote from it). */
export const INSIGHT_ROLES = ['admin', 'manager', 'estimator'] as const;

export function insightRouter(db: Db): Router {
  const router = Router();
  router.get('/builders', requireRole(...INSIGHT_ROLES), validate({ query: BuilderComparisonQuery }), async (req, res) => {
    res.json(await service.builderComparison(db, currentUser(req).companyId, req.query as never));
  });
  return router;
}
