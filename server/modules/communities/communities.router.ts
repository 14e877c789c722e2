import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { CommunityBody, UpdateCommunityBody } from '../../../shared/schemas/communities.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { SURVEY_EDITOR_ROLES } from '../../../shared/schemas/enums.js';
import { currentUser, requireAuth, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './communities.service.js';

export function communitiesRouter(db: Db): Router {
  const router = Router();
  const editors = requireRole(...SURVEY_EDITOR_ROLES);
  router.get('/', requireAuth, async (req, res) => {
    res.json({ communities: await service.listCommunities(db, currentUser(req).companyId) });
  });
  router.get('/:id', requireAuth, validate({ params: IdParams }), async (req, res) => {
    res.json({ community: await service.getCommunity(db, currentUser(req).companyId, req.params.id as string) });
  });
  router.post('/', editors, validate({ body: CommunityBody }), async (req, res) => {
    res.status(201).json({ community: await service.createCommunity(db, currentUser(req).companyId, req.body) });
  });
  router.patch('/:id', editors, validate({ params: IdParams, body: UpdateCommunityBody }), async (req, res) => {
    res.json({ community: await service.updateCommunity(db, currentUser(req).companyId, req.params.id as string, req.body) });
  });
  router.delete('/:id', editors, validate({ params: IdParams }), async (req, res) => {
    await service.deleteCommunity(db, currentUser(req).companyId, req.params.id as string);
    res.status(204).end();
  });
  return router;
}
