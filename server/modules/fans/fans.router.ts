import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { FanBody } from '../../../shared/schemas/visits.js';
import { currentUser, requireAuth, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './fans.service.js';

/** The company's fan models with their curves: everyone reads them (the visit form), admins keep them. */
export function fansRouter(db: Db): Router {
  const router = Router();
  const admin = requireRole('admin');
  router.get('/', requireAuth, async (req, res) => {
    res.json({ fans: await service.listFans(db, currentUser(req).companyId) });
  });
  router.post('/', admin, validate({ body: FanBody }), async (req, res) => {
    res.status(201).json({ fan: await service.createFan(db, currentUser(req).companyId, req.body) });
  });
  router.put('/:id', admin, validate({ params: IdParams, body: FanBody }), async (req, res) => {
    res.json({ fan: await service.updateFan(db, currentUser(req).companyId, req.params.id as string, req.body) });
  });
  return router;
}
