import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { FIELD_ROLES } from '../../../shared/schemas/enums.js';
import { HomeIdParams, RadonTestBody, VisitBody } from '../../../shared/schemas/visits.js';
import { currentUser, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './visits.service.js';

/** POST /api/homes/:homeId/visits and /radon-tests: 201 when stored, 200 for a retry of the same id. */
export function visitsRouter(db: Db): Router {
  const router = Router();
  const field = requireRole(...FIELD_ROLES);
  router.post('/:homeId/visits', field, validate({ params: HomeIdParams, body: VisitBody }), async (req, res) => {
    const { created, visit, home } = await service.recordVisit(db, currentUser(req), req.params.homeId as string, req.body);
    res.status(created ? 201 : 200).json({ visit, home });
  });
  router.post('/:homeId/radon-tests', field, validate({ params: HomeIdParams, body: RadonTestBody }), async (req, res) => {
    const { created, test } = await service.recordRadonTest(db, currentUser(req), req.params.homeId as string, req.body);
    res.status(created ? 201 : 200).json({ test });
  });
  return router;
}
