import { Router } from 'express';
import type { Env } from '../../config/env.js';
import type { Database } from '../../db/client.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { SURVEY_EDITOR_ROLES } from '../../../shared/schemas/enums.js';
import { MappingSuggestionBody, StartImportQuery } from '../../../shared/schemas/imports.js';
import { AppError } from '../../lib/errors.js';
import { currentUser, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import { httpBatchGeocoder } from '../geocoding/geocoder.js';
import { ImportJobs } from './import-jobs.js';
import * as service from './imports.service.js';

/** Content types a browser may give a CSV file; the import page always sends text/csv. */
const CSV_TYPES = ['text/csv', 'text/plain', 'application/csv', 'application/vnd.ms-excel', 'text/tab-separated-values'];

export function importsRouter(database: Database, env: Env): Router {
  const deps: service.ImportDeps = {
    pool: database.pool,
    // Public batch services want the reference data set named; the local fake ignores the field.
    geocoder: httpBatchGeocoder({ url: env.GEOCODER_URL, formFields: { benchmark: 'Public_AR_Current' } }),
    jobs: new ImportJobs(),
    limits: { maxBytes: env.IMPORT_MAX_BYTES, maxRows: env.IMPORT_MAX_ROWS },
  };
  const router = Router();
  const importers = requireRole(...SURVEY_EDITOR_ROLES);

  router.post('/mapping-suggestions', importers, validate({ body: MappingSuggestionBody }), async (req, res) => {
    res.json(await service.suggestMapping(deps, currentUser(req), req.body.headers));
  });

  // The body is the file itself, read as a stream; id, file name and mapping travel in the query.
  router.post('/', importers, validate({ query: StartImportQuery }), async (req, res) => {
    const type = (req.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
    if (!CSV_TYPES.includes(type)) throw new AppError('VALIDATION_FAILED', 415, 'Send the file itself as the request body with Content-Type: text/csv');
    const length = req.get('content-length');
    try {
      const { job, repeated } = await service.startImport(deps, currentUser(req), req.query as never, req, length ? Number(length) : null);
      res.status(repeated ? 200 : 202).json({ import: job });
    } finally {
      // Whatever happened, do not leave an unread body behind on a kept-alive connection.
      if (!req.readableEnded) req.resume();
    }
  });

  router.get('/', importers, async (req, res) => {
    res.json({ imports: await service.listImports(deps, currentUser(req)) });
  });
  router.get('/:id', importers, validate({ params: IdParams }), async (req, res) => {
    res.json({ import: await service.getImport(deps, currentUser(req), req.params.id as string) });
  });
  router.get('/:id/errors.csv', importers, validate({ params: IdParams }), async (req, res) => {
    const { fileName, csv } = await service.errorCsv(deps, currentUser(req), req.params.id as string);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${fileName.replace(/[^\w.-]+/g, '_')}"`);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    // A BOM so spreadsheets read the file as UTF-8.
    res.send('\uFEFF' + csv);
  });
  router.post('/:id/undo', importers, validate({ params: IdParams }), async (req, res) => {
    res.json({ import: await service.undoImport(deps, currentUser(req), req.params.id as string) });
  });
  return router;
}
