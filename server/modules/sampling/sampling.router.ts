import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { SURVEY_EDITOR_ROLES } from '../../../shared/schemas/enums.js';
import { SampleSizeQuery, SamplingPlanBody, SamplingPlanListQuery } from '../../../shared/schemas/sampling.js';
import { currentUser, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './sampling.service.js';

/** Sampling plans: estimators (and managers, admins) choose which homes to sample. */
export function samplingRouter(db: Db): Router {
  const router = Router();
  const planners = requireRole(...SURVEY_EDITOR_ROLES);
  router.get('/size', planners, validate({ query: SampleSizeQuery }), async (req, res) => {
    res.json({ size: await service.sampleSize(db, currentUser(req).companyId, req.query as never) });
  });
  router.get('/plans', planners, validate({ query: SamplingPlanListQuery }), async (req, res) => {
    const { communityId } = req.query as { communityId?: string };
    res.json({ plans: await service.listPlans(db, currentUser(req).companyId, communityId) });
  });
  router.get('/plans/:id', planners, validate({ params: IdParams }), async (req, res) => {
    res.json({ plan: await service.getPlan(db, currentUser(req).companyId, req.params.id as string) });
  });
  router.post('/plans', planners, validate({ body: SamplingPlanBody }), async (req, res) => {
    res.status(201).json({ plan: await service.createPlan(db, currentUser(req), req.body) });
  });
  return router;
}
