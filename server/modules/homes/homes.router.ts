import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { SURVEY_EDITOR_ROLES } from '../../../shared/schemas/enums.js';
import { HomeBody, HomeListQuery, HomeRefParams, UpdateHomeBody } from '../../../shared/schemas/homes.js';
import { currentUser, requireAuth, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './homes.service.js';

export function homesRouter(db: Db): Router {
  const router = Router();
  const editors = requireRole(...SURVEY_EDITOR_ROLES);
  router.get('/', requireAuth, validate({ query: HomeListQuery }), async (req, res) => {
    res.json(await service.listHomes(db, currentUser(req), req.query as never));
  });
  router.get('/ref/:ref', requireAuth, validate({ params: HomeRefParams }), async (req, res) => {
    res.json(await service.getHomeDetailByRef(db, currentUser(req), (req.params as unknown as { ref: number }).ref));
  });
  router.get('/:id', requireAuth, validate({ params: IdParams }), async (req, res) => {
    res.json(await service.getHomeDetail(db, currentUser(req), req.params.id as string));
  });
  router.post('/', editors, validate({ body: HomeBody }), async (req, res) => {
    res.status(201).json({ home: await service.createHome(db, currentUser(req), req.body) });
  });
  router.patch('/:id', editors, validate({ params: IdParams, body: UpdateHomeBody }), async (req, res) => {
    res.json({ home: await service.updateHome(db, currentUser(req), req.params.id as string, req.body) });
  });
  router.delete('/:id', editors, validate({ params: IdParams }), async (req, res) => {
    await service.deleteHome(db, currentUser(req), req.params.id as string);
    res.status(204).end();
  });
  return router;
}
