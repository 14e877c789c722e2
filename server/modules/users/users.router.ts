import { Router } from 'express';
import type { Db } from '../../db/client.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { CreateUserBody, UpdateUserBody } from '../../../shared/schemas/users.js';
import { currentUser, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import * as service from './users.service.js';

export function usersRouter(db: Db): Router {
  const router = Router();
  router.use(requireRole('admin'));
  router.get('/', async (req, res) => {
    res.json({ users: await service.listUsers(db, currentUser(req).companyId) });
  });
  router.post('/', validate({ body: CreateUserBody }), async (req, res) => {
    res.status(201).json({ user: await service.createUser(db, currentUser(req).companyId, req.body) });
  });
  router.patch('/:id', validate({ params: IdParams, body: UpdateUserBody }), async (req, res) => {
    const user = currentUser(req);
    res.json({ user: await service.updateUser(db, user.companyId, user.id, req.params.id as string, req.body) });
  });
  return router;
}
