import { Router } from 'express';
import type pg from 'pg';

export function healthRouter(pool: pg.Pool): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const started = Date.now();
    try {
      await pool.query('select 1');
      res.json({ status: 'ok', database: 'reachable', databaseMs: Date.now() - started });
    } catch {
      res.status(503).json({ status: 'degraded', database: 'unreachable' });
    }
  });
  return router;
}
