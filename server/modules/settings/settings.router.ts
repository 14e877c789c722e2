import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { UpdateSettingsBody } from '../../../shared/schemas/settings.js';
import { currentUser, requireAuth, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './settings.service.js';

export function settingsRouter(db: Db): Router {
  const router = Router();
  router.get('/', requireAuth, async (req, res) => {
    res.json({ settings: await service.getSettings(db, currentUser(req).companyId) });
  });
  router.patch('/', requireRole('admin'), validate({ body: UpdateSettingsBody }), async (req, res) => {
    res.json({ settings: await service.updateSettings(db, currentUser(req).companyId, req.body) });
  });
  return router;
}
