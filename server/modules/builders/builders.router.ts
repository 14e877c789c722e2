import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { BuilderBody, UpdateBuilderBody } from '../../../shared/schemas/builders.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { SURVEY_EDITOR_ROLES } from '../../../shared/schemas/enums.js';
import { currentUser, requireAuth, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './builders.service.js';

export function buildersRouter(db: Db): Router {
  const router = Router();
  const editors = requireRole(...SURVEY_EDITOR_ROLES);
  router.get('/', requireAuth, async (req, res) => {
    res.json({ builders: await service.listBuilders(db, currentUser(req).companyId) });
  });
  router.get('/:id', requireAuth, validate({ params: IdParams }), async (req, res) => {
    res.json({ builder: await service.getBuilder(db, currentUser(req).companyId, req.params.id as string) });
  });
  router.post('/', editors, validate({ body: BuilderBody }), async (req, res) => {
    res.status(201).json({ builder: await service.createBuilder(db, currentUser(req).companyId, req.body) });
  });
  router.patch('/:id', editors, validate({ params: IdParams, body: UpdateBuilderBody }), async (req, res) => {
    res.json({ builder: await service.updateBuilder(db, currentUser(req).companyId, req.params.id as string, req.body) });
  });
  router.delete('/:id', editors, validate({ params: IdParams }), async (req, res) => {
    await service.deleteBuilder(db, currentUser(req).companyId, req.params.id as string);
    res.status(204).end();
  });
  return router;
}
